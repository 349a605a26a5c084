import type { z } from 'zod';
import type { Role } from '../schemas/common';

/** Who may call a route: nobody signed in, any signed-in user, or the listed roles. */
export type Access = 'public' | 'signed-in' | readonly Role[];

export type HttpMethod = 'get' | 'post' | 'put' | 'patch' | 'delete';

/**
 * What server and client agree on for one route: method, path (relative to /api, `:name` for a path parameter), who
 * may call it, the zod schemas of its query, body and JSON response, and its success status. No handler, no
 * middleware: those are the server's (server/routes/), and this file is read by the web client too.
 */
export interface EndpointDef {
  method: HttpMethod;
  path: string;
  summary: string;
  tag: string;
  access: Access;
  /** The JSON (or multipart text fields) body, parsed before the handler runs. */
  body?: z.ZodType;
  /** The query string, parsed before the handler runs. */
  query?: z.ZodType;
  /** The JSON success body. Absent with `produces` (a file) or for a 204. */
  response?: z.ZodType;
  /** Success status when not 200 (or 204 for a route without a response). */
  status?: number;
  /** Content type of a non-JSON success response (e.g. application/pdf). */
  produces?: string;
}

/** The names of the `:name` parameters of a path, as a union of string literals. */
export type PathParams<P extends string> = string extends P
  ? string
  : P extends `${string}:${infer Name}/${infer Rest}`
    ? Name | PathParams<`/${Rest}`>
    : P extends `${string}:${infer Name}`
      ? Name
      : never;

/** One route of the contract: its definition plus the names of its path parameters. */
export type Endpoint<D extends EndpointDef = EndpointDef> = D & { readonly params: readonly PathParams<D['path']>[] };

/** The path parameters of a route, by name. */
export type ParamsOf<E extends EndpointDef> = { [K in PathParams<E['path']>]: string };
/** The query a handler reads (after parsing: defaults applied). */
export type QueryOf<E extends EndpointDef> = E extends { query: infer Q extends z.ZodType } ? z.output<Q> : undefined;
/** The query a caller sends (before parsing). */
export type QueryInputOf<E extends EndpointDef> = E extends { query: infer Q extends z.ZodType }
  ? z.input<Q>
  : undefined;
/** The body a handler reads (after parsing). */
export type BodyOf<E extends EndpointDef> = E extends { body: infer B extends z.ZodType } ? z.output<B> : undefined;
/** The body a caller sends (before parsing). */
export type BodyInputOf<E extends EndpointDef> = E extends { body: infer B extends z.ZodType } ? z.input<B> : undefined;
/** What a handler returns for a JSON route (what the response schema accepts); void for a file or a 204. */
export type ResponseInputOf<E extends EndpointDef> = E extends { produces: string }
  ? void
  : E extends { response: infer R extends z.ZodType }
    ? z.input<R>
    : void;
/** What a caller reads from a JSON route (the response schema's output). */
export type ResponseOf<E extends EndpointDef> = E extends { produces: string }
  ? never
  : E extends { response: infer R extends z.ZodType }
    ? z.output<R>
    : void;

const PARAM = /:([A-Za-z0-9_]+)/g;

/** The parameter names of a path, in order. */
export function pathParams(path: string): string[] {
  return [...path.matchAll(PARAM)].map((m) => m[1]);
}

/** Declares one route of the contract (shared/api/index.ts lists them all). */
export function endpoint<const D extends EndpointDef>(def: D): Endpoint<D> {
  return { ...def, params: pathParams(def.path) as PathParams<D['path']>[] };
}

/** A path with its parameters filled in (each encoded). A missing parameter is an error, not the text "undefined". */
export function fillPath(path: string, params: Record<string, string>): string {
  return path.replace(PARAM, (_m, name: string) => {
    const value = params[name];
    if (value === undefined) throw new Error(`Missing path parameter ${name} of ${path}`);
    return encodeURIComponent(value);
  });
}
