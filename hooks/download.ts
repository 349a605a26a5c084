import { Platform } from 'react-native';
import { ApiClientError, apiBaseUrl, TOKEN_KEY } from './api';
import { storage } from './storage';

/** Downloads an API file with the session's token (web: a blob link the browser saves). */
export async function downloadFile(path: string, fallbackName: string): Promise<void> {
  if (Platform.OS !== 'web') throw new ApiClientError(0, 'bad_request', 'Downloads are available in the web app');
  const token = storage.get(TOKEN_KEY);
  const res = await fetch(`${apiBaseUrl()}/api${path}`, { headers: token ? { Authorization: `Bearer ${token}` } : {} });
  if (!res.ok) {
    let message = `The server answered ${res.status}`;
    try {
      message = ((await res.json()) as { error: { message: string } }).error.message;
    } catch {
      /* not JSON */
    }
    throw new ApiClientError(res.status, 'bad_request', message);
  }
  const disposition = res.headers.get('Content-Disposition') ?? '';
  const name = /filename="([^"]+)"/.exec(disposition)?.[1] ?? fallbackName;
  const url = URL.createObjectURL(await res.blob());
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
