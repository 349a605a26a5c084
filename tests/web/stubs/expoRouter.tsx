/** expo-router for rendering components outside the app (no navigation container): links render their child. */
import React from 'react';

export function Link({ children }: { children?: React.ReactNode }) {
  return <>{children}</>;
}
export const useRouter = () => ({ push: () => undefined, replace: () => undefined, back: () => undefined });
export const useLocalSearchParams = () => ({});
export const usePathname = () => '/';
export const router = { push: () => undefined, replace: () => undefined, back: () => undefined };
/** A layout's nested page: a marker, so a test sees whether a layout let its pages through. */
export function Slot() {
  return <>{'[page]'}</>;
}
