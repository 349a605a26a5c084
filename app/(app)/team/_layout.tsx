import { Slot } from 'expo-router';
import React from 'react';
import { RoleGuard } from '../../../components/auth/RoleGuard';

export { ErrorBoundary } from '../../../components/ErrorBoundary';

/** Guard: only the roles with the capability (shared/permissions.ts) see these pages. */
export default function TeamLayout() {
  return (
    <RoleGuard capability="manageUsers" what="Team management">
      <Slot />
    </RoleGuard>
  );
}
