import { Redirect, Slot } from 'expo-router';
import React from 'react';
import { useUser } from '../../../hooks/session';

export { ErrorBoundary } from '../../../components/ErrorBoundary';

/** Guard: the dashboard is for administrators, engineers and safety officers. */
export default function AttentionLayout() {
  const user = useUser();
  if (user.role === 'electrician') return <Redirect href="/" />;
  return <Slot />;
}
