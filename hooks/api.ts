import {
  fillPath,
  type BodyInputOf,
  type Endpoint,
  type EndpointDef,
  type ParamsOf,
  type PathParams,
  type QueryInputOf,
  type ResponseOf,
} from '../shared/api';
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

/**
 * Origin of the API: the page's own by default (the server serves the exported app; `npm run dev:web` proxies /api),
 * or EXPO_PUBLIC_API_URL when set at build time. Written out as `process.env.EXPO_PUBLIC_API_URL` so that Expo inlines
 * it into the bundle (a computed access to process.env is not replaced and reads nothing in the browser).
 */
export function apiBaseUrl(): string {
  return (process.env.EXPO_PUBLIC_API_URL ?? '').replace(/\/+$/, '');
}

/**
 * One request to the API with the session's token: a network failure, a 401 (the session has ended) and an error
 * answer become an ApiClientError; anything else is the Response.
 */
async function apiRequest(
  path: string,
  init: { method?: string; body?: unknown; formData?: FormData; accept?: string } = {},
): Promise<Response> {
  const token = storage.get(TOKEN_KEY);
  const headers: Record<string, string> = { Accept: init.accept ?? 'application/json' };
  if (token) headers.Authorization = `Bearer ${token}`;
  let body: BodyInit | undefined;
  if (init.formData) body = init.formData;
  else if (init.body !== undefined) {
    headers['Content-Type'] = 'application/json';
    body = JSON.stringify(init.body);
  }
  let res: Response;
  try {
    res = await fetch(`${apiBaseUrl()}/api${path}`, { method: init.method ?? (body ? 'POST' : 'GET'), headers, body });
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
  return res;
}

type ParamsArg<E extends EndpointDef> = [PathParams<E['path']>] extends [never]
  ? { params?: undefined }
  : { params: ParamsOf<E> };
type QueryArg<E extends EndpointDef> = E extends { query: object }
  ? { query?: QueryInputOf<E> }
  : { query?: undefined };
type BodyArg<E extends EndpointDef> =
  | (E extends { body: object } ? { body: BodyInputOf<E> } : { body?: undefined })
  // A multipart upload (a file, with any text fields of the body schema as form fields) instead of a JSON body.
  | { formData: FormData; body?: undefined };
/** What a call of an endpoint needs: its path parameters, its query and its body, each typed by the contract. */
export type CallArgs<E extends EndpointDef> = ParamsArg<E> & QueryArg<E> & BodyArg<E>;

/**
 * A query string from a query object: absent values and empty strings left out (an empty filter field means no
 * filter), arrays as repeated keys.
 */
function encodeQuery(query: Record<string, unknown> | undefined): string {
  const parts: string[] = [];
  for (const [k, v] of Object.entries(query ?? {})) {
    for (const item of Array.isArray(v) ? v : [v]) {
      if (item === undefined || item === null || item === '') continue;
      parts.push(`${encodeURIComponent(k)}=${encodeURIComponent(String(item))}`);
    }
  }
  return parts.length ? `?${parts.join('&')}` : '';
}

/**
 * The path (under /api) of one endpoint of the contract with its parameters and query filled in, for a file the
 * client fetches itself (`downloadFile`, `useAuthedImage`): `apiPath(contract.attention.exportList, { params: { list } })`.
 */
export function apiPath<E extends Endpoint>(
  endpoint: E,
  ...[args]: object extends CallArgs<E> ? [CallArgs<E>?] : [CallArgs<E>]
): string {
  const { params, query } = (args ?? {}) as { params?: Record<string, string>; query?: Record<string, unknown> };
  return fillPath(endpoint.path, params ?? {}) + encodeQuery(query);
}

/**
 * Calls one endpoint of the contract (shared/api): the path filled from `params`, the query and the JSON body typed by
 * the endpoint's schemas, and the answer parsed with its response schema, so the caller gets the type the server is
 * tested against. An answer that does not match is an ApiClientError, never a silently wrong value.
 * `callApi(contract.sites.get, { params: { siteId } })`.
 */
export async function callApi<E extends Endpoint>(
  endpoint: E,
  ...[args]: object extends CallArgs<E> ? [CallArgs<E>?] : [CallArgs<E>]
): Promise<ResponseOf<E>> {
  const { params, query, body, formData } = (args ?? {}) as {
    params?: Record<string, string>;
    query?: Record<string, unknown>;
    body?: unknown;
    formData?: FormData;
  };
  const res = await apiRequest(fillPath(endpoint.path, params ?? {}) + encodeQuery(query), {
    method: endpoint.method.toUpperCase(),
    body,
    formData,
  });
  // A route without a JSON response (204) answers nothing: its ResponseOf is void.
  if (!endpoint.response || res.status === 204) return undefined as ResponseOf<E>;
  const parsed = endpoint.response.safeParse(await res.json());
  if (!parsed.success) {
    const where = `${endpoint.method.toUpperCase()} ${endpoint.path}`;
    throw new ApiClientError(res.status, 'internal', `The server's answer to ${where} was not understood`);
  }
  return parsed.data as ResponseOf<E>;
}

/** A file the API serves (PDF, CSV, workbook): its bytes and the name from Content-Disposition, if any. */
export async function apiFile(path: string): Promise<{ blob: Blob; name: string | null }> {
  const res = await apiRequest(path, { accept: '*/*' });
  const disposition = res.headers.get('Content-Disposition') ?? '';
  return { blob: await res.blob(), name: /filename="([^"]+)"/.exec(disposition)?.[1] ?? null };
}
