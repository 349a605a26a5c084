import { useEffect, useState } from 'react';
import { Platform } from 'react-native';
import { apiFetch, ApiClientError } from './api';

/**
 * An image the API serves only with the session's token (e.g. a field report's photo): fetched as a blob and shown
 * through an object URL, released when the screen leaves.
 */
export function useAuthedImage(path: string | null): { uri: string | null; error: string | null; loading: boolean } {
  const [state, setState] = useState<{ uri: string | null; error: string | null; loading: boolean }>({
    uri: null,
    error: null,
    loading: !!path,
  });
  useEffect(() => {
    if (!path || Platform.OS !== 'web') {
      setState({ uri: null, error: null, loading: false });
      return;
    }
    let url: string | null = null;
    let live = true;
    setState({ uri: null, error: null, loading: true });
    apiFetch<Blob>(path, { raw: true })
      .then((blob) => {
        if (!live) return;
        url = URL.createObjectURL(blob);
        setState({ uri: url, error: null, loading: false });
      })
      .catch((e: unknown) => {
        if (live)
          setState({
            uri: null,
            error: e instanceof ApiClientError ? e.message : 'The photo could not be loaded',
            loading: false,
          });
      });
    return () => {
      live = false;
      if (url) URL.revokeObjectURL(url);
    };
  }, [path]);
  return state;
}
