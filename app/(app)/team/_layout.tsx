import { Redirect, Slot } from 'expo-router';
import React from 'react';
import { useUser } from '../../../hooks/session';

export { ErrorBoundary } from '../../../components/ErrorBoundary';

/** Guard: team management is for admins. */
export default function TeamLayout() {
  const user = useUser();
  if (user.role !== 'admin') return <Redirect href="/" />;
  return <Slot />;
}
