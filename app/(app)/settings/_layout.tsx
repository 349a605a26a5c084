import { Slot } from 'expo-router';
import React from 'react';
import { RoleGuard } from '../../../components/auth/RoleGuard';

export { ErrorBoundary } from '../../../components/ErrorBoundary';

/** Guard: only the roles with the capability (shared/permissions.ts) see these pages. */
export default function SettingsLayout() {
  return (
    <RoleGuard capability="manageSettings" what="Organization settings">
      <Slot />
    </RoleGuard>
  );
}
