import { Redirect, Slot } from 'expo-router';
import React from 'react';
import { useUser } from '../../../hooks/session';

/** Guard: the captured mail is for administrators. */
export default function OutboxLayout() {
  const user = useUser();
  if (user.role !== 'admin') return <Redirect href="/" />;
  return <Slot />;
}
