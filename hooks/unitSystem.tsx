/**
 * The signed-in user's unit system (US customary or SI), stored on the user (`units`, read with `GET /api/auth/me`,
 * set with `PUT /api/auth/me/preferences`), so it follows the user to every device; until one is chosen, the
 * organization's label unit order decides (US first → US customary). Every length field and reading of the editor,
 * the spot check and the results follows it; stored values are SI and never change by a switch.
 * `UnitSystemProvider` (in the signed-in layout) reads it once; `useUnitSystem()` is a context read.
 */
import { useMutation, useQueryClient } from '@tanstack/react-query';
import React, { createContext, useCallback, useContext, useMemo } from 'react';
import { contract } from '../shared/api';
import type { Me } from '../shared/schemas/auth';
import { callApi } from './api';
import { useMe, useOrganization } from './queries';
import { queryKeys } from './queryKeys';
import type { UnitSystem } from './units';

export interface UnitSystemValue {
  system: UnitSystem;
  /** false while the organization's default applies */
  chosen: boolean;
  setSystem: (s: UnitSystem) => void;
  /** the last choice could not be saved */
  error: string | null;
}

const Ctx = createContext<UnitSystemValue>({ system: 'si', chosen: false, setSystem: () => undefined, error: null });

export function UnitSystemProvider({ children }: { children: React.ReactNode }) {
  const qc = useQueryClient();
  const me = useMe();
  const org = useOrganization();
  const save = useMutation({
    mutationFn: (units: UnitSystem) => callApi(contract.auth.setPreferences, { body: { units } }),
    // Shown at once; put back if the server refuses.
    onMutate: (units) => {
      const before = qc.getQueryData<Me>(queryKeys.me());
      if (before) qc.setQueryData<Me>(queryKeys.me(), { ...before, units });
      return { before };
    },
    onError: (_e, _units, context) => {
      if (context?.before) qc.setQueryData<Me>(queryKeys.me(), context.before);
    },
    onSettled: () => qc.invalidateQueries({ queryKey: queryKeys.me() }),
  });
  const stored = me.data?.units ?? null;
  const fallback: UnitSystem = org.data?.settings.labelUnitOrder === 'us-first' ? 'us' : 'si';
  const mutate = save.mutate;
  const setSystem = useCallback((s: UnitSystem) => mutate(s), [mutate]);
  const error = save.error ? save.error.message : null;
  const value = useMemo(
    () => ({ system: stored ?? fallback, chosen: stored !== null, setSystem, error }),
    [stored, fallback, setSystem, error],
  );
  return <Ctx.Provider value={value}>{children}</Ctx.Provider>;
}

/** The unit system in force and a setter (which keeps it on the user). */
export function useUnitSystem(): UnitSystemValue {
  return useContext(Ctx);
}
