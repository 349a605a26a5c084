import { useCallback } from 'react';
import { can, type Capability } from '../shared/permissions';
import { useUser } from './session';

/** `can(capability)` for the signed-in user (shared/permissions.ts); only inside the guarded (app) group. */
export function useCan(): (capability: Capability) => boolean {
  const { role } = useUser();
  return useCallback((capability: Capability) => can(role, capability), [role]);
}
