import { Redirect, Slot } from 'expo-router';
import React from 'react';
import { AppShell } from '../../components/AppShell';
import { useSession } from '../../hooks/session';

/** Guard: everything in (app) needs a signed-in user. */
export default function AppLayout() {
  const { user, ready } = useSession();
  if (!ready) return null;
  if (!user) return <Redirect href="/sign-in" />;
  return (
    <AppShell>
      <Slot />
    </AppShell>
  );
}
