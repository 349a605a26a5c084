import { Platform } from 'react-native';
import { ApiClientError, apiFile } from './api';

/**
 * Downloads an API file through the API client (the session's token, its errors): on the web a blob link the browser
 * saves. Callers show the error it throws.
 */
export async function downloadFile(path: string, fallbackName: string): Promise<void> {
  if (Platform.OS !== 'web') throw new ApiClientError(0, 'bad_request', 'Downloads are available in the web app');
  const { blob, name } = await apiFile(path);
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name ?? fallbackName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
