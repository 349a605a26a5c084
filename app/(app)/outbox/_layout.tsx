import { Redirect, Slot } from 'expo-router';
import React from 'react';
import { useUser } from '../../../hooks/session';

export { ErrorBoundary } from '../../../components/ErrorBoundary';

/** Guard: the captured mail is for administrators. */
export default function OutboxLayout() {
  const user = useUser();
  if (user.role !== 'admin') return <Redirect href="/" />;
  return <Slot />;
}
