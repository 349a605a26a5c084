import { useEffect, useState } from 'react';
import { Platform } from 'react-native';
import { apiFile, ApiClientError } from './api';

interface Loaded {
  path: string;
  uri: string | null;
  error: string | null;
}

/**
 * An image the API serves only with the session's token (e.g. a field report's photo): fetched as a blob and shown
 * through an object URL, released when the screen leaves or the path changes.
 */
export function useAuthedImage(path: string | null): { uri: string | null; error: string | null; loading: boolean } {
  const enabled = !!path && Platform.OS === 'web';
  const [loaded, setLoaded] = useState<Loaded | null>(null);
  useEffect(() => {
    if (!path || !enabled) return;
    let url: string | null = null;
    let live = true;
    apiFile(path)
      .then(({ blob }) => {
        if (!live) return;
        url = URL.createObjectURL(blob);
        setLoaded({ path, uri: url, error: null });
      })
      .catch((e: unknown) => {
        if (live)
          setLoaded({
            path,
            uri: null,
            error: e instanceof ApiClientError ? e.message : 'The photo could not be loaded',
          });
      });
    return () => {
      live = false;
      if (url) URL.revokeObjectURL(url);
    };
  }, [path, enabled]);
  if (!enabled) return { uri: null, error: null, loading: false };
  // A result for another path is stale: the new one is still loading.
  if (!loaded || loaded.path !== path) return { uri: null, error: null, loading: true };
  return { uri: loaded.uri, error: loaded.error, loading: false };
}
