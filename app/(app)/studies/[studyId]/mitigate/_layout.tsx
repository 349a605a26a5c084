import { Slot } from 'expo-router';
import React from 'react';
import { RoleGuard } from '../../../../../components/auth/RoleGuard';

export { ErrorBoundary } from '../../../../../components/ErrorBoundary';

/** Guard: only the roles with the capability (shared/permissions.ts) see these pages. */
export default function MitigateLayout() {
  return (
    <RoleGuard capability="mitigate" what="Bringing a bus's incident energy down">
      <Slot />
    </RoleGuard>
  );
}
