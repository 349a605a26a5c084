import { Redirect, Slot, usePathname } from 'expo-router';
import React from 'react';
import { AppShell } from '../../components/AppShell';
import { ScreenBoundary } from '../../components/ErrorBoundary';
import { useSession } from '../../hooks/session';
import { UnitSystemProvider } from '../../hooks/unitSystem';

export { ErrorBoundary } from '../../components/ErrorBoundary';

/** Guard: everything in (app) needs a signed-in user. A screen that fails shows the error page inside the shell. */
export default function AppLayout() {
  const { user, ready } = useSession();
  const pathname = usePathname();
  if (!ready) return null;
  if (!user) return <Redirect href="/sign-in" />;
  return (
    <UnitSystemProvider>
      <AppShell>
        <ScreenBoundary resetKey={pathname}>
          <Slot />
        </ScreenBoundary>
      </AppShell>
    </UnitSystemProvider>
  );
}
