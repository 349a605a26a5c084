import type { ErrorCode } from '../shared/schemas/common';
import { storage } from './storage';

export const TOKEN_KEY = 'emberline.session';

/** An API error as the server sent it: `{ error: { code, message, fields? } }`. */
export class ApiClientError extends Error {
  readonly status: number;
  readonly code: ErrorCode | 'network';
  readonly fields?: Record<string, string>;
  constructor(status: number, code: ErrorCode | 'network', message: string, fields?: Record<string, string>) {
    super(message);
    this.status = status;
    this.code = code;
    this.fields = fields;
  }
}

type Listener = () => void;
const unauthorizedListeners = new Set<Listener>();
/** Called when any request answers 401 with a token: the session has ended. */
export function onUnauthorized(l: Listener): () => void {
  unauthorizedListeners.add(l);
  return () => unauthorizedListeners.delete(l);
}

/** Base URL: same origin on the web (the server serves the app), overridable for development. */
function baseUrl(): string {
  const env = (process.env as Record<string, string | undefined>).EXPO_PUBLIC_API_URL;
  return env ?? '';
}

export async function apiFetch<T>(
  path: string,
  init: { method?: string; body?: unknown; formData?: FormData; raw?: boolean } = {},
): Promise<T> {
  const token = storage.get(TOKEN_KEY);
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (token) headers.Authorization = `Bearer ${token}`;
  let body: BodyInit | undefined;
  if (init.formData) body = init.formData;
  else if (init.body !== undefined) {
    headers['Content-Type'] = 'application/json';
    body = JSON.stringify(init.body);
  }
  let res: Response;
  try {
    res = await fetch(`${baseUrl()}/api${path}`, { method: init.method ?? (body ? 'POST' : 'GET'), headers, body });
  } catch {
    throw new ApiClientError(0, 'network', 'Cannot reach the server. Check the connection and try again.');
  }
  if (res.status === 401 && token) unauthorizedListeners.forEach((l) => l());
  if (!res.ok) {
    let payload: { error?: { code?: ErrorCode; message?: string; fields?: Record<string, string> } } = {};
    try {
      payload = await res.json();
    } catch {
      /* not JSON */
    }
    throw new ApiClientError(
      res.status,
      payload.error?.code ?? 'internal',
      payload.error?.message ?? `The server answered ${res.status}`,
      payload.error?.fields,
    );
  }
  if (init.raw) return (await res.blob()) as unknown as T;
  if (res.status === 204) return undefined as T;
  return (await res.json()) as T;
}
