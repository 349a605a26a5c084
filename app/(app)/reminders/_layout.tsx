import { Redirect, Slot } from 'expo-router';
import React from 'react';
import { useUser } from '../../../hooks/session';

export { ErrorBoundary } from '../../../components/ErrorBoundary';

/** Guard: reminder rules are for administrators and safety officers. */
export default function RemindersLayout() {
  const user = useUser();
  if (user.role !== 'admin' && user.role !== 'safety') return <Redirect href="/" />;
  return <Slot />;
}
