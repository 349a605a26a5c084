import { Redirect, Slot } from 'expo-router';
import React from 'react';
import { useUser } from '../../../hooks/session';

export { ErrorBoundary } from '../../../components/ErrorBoundary';

/** Guard: the audit log is for administrators, engineers and safety officers. */
export default function AuditLogLayout() {
  const user = useUser();
  if (user.role === 'electrician') return <Redirect href="/" />;
  return <Slot />;
}
