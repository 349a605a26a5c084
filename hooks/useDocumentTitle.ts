import { useEffect } from 'react';
import { Platform } from 'react-native';

const APP = 'Emberline';

/**
 * Names the page in the browser tab and for screen readers ("Sites · Emberline"). The web build is a single-page app
 * (`output: "single"`), so the title is set from the page itself after each render that changes it.
 */
export function useDocumentTitle(title: string | undefined): void {
  useEffect(() => {
    if (Platform.OS !== 'web' || typeof document === 'undefined') return;
    document.title = title ? `${title} · ${APP}` : APP;
  }, [title]);
}
