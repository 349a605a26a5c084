import { Slot } from 'expo-router';
import React from 'react';
import { RoleGuard } from '../../../components/auth/RoleGuard';

export { ErrorBoundary } from '../../../components/ErrorBoundary';

/** Guard: only the roles with the capability (shared/permissions.ts) see these pages. */
export default function AuditLogLayout() {
  return (
    <RoleGuard capability="viewAudit" what="The audit log">
      <Slot />
    </RoleGuard>
  );
}
