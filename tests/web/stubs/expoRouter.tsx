/** expo-router for rendering components outside the app (no navigation container): links render their child. */
import React from 'react';

export function Link({ children }: { children?: React.ReactNode }) {
  return <>{children}</>;
}
export const useRouter = () => ({ push: () => undefined, replace: () => undefined, back: () => undefined });
export const useLocalSearchParams = () => ({});
export const usePathname = () => '/';
export const router = { push: () => undefined, replace: () => undefined, back: () => undefined };
