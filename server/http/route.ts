import express, { type Request, type RequestHandler, type Response, type Router } from 'express';
import type { z } from 'zod';
import type { BodyOf, Endpoint, EndpointDef, ParamsOf, QueryOf, ResponseInputOf } from '../../shared/api';
import type { AppContext, AuthUser } from '../services/context';
import { jsonDepthGuard } from './bodyParsing';
import { log } from '../log';
import { ApiError, validationError } from '../services/errors';

export type { Access } from '../../shared/api';

export interface HandlerArgs<E extends EndpointDef> {
  req: Request;
  res: Response;
  ctx: AppContext;
  body: BodyOf<E>;
  query: QueryOf<E>;
  params: ParamsOf<E>;
  user: AuthUser;
}

/** Middleware around a handler. */
export interface BindingOptions {
  /** Multipart or other pre-handler middleware (runs after auth). */
  middleware?: RequestHandler[];
  /**
   * A larger JSON body limit than the API's (e.g. '25mb' for a whole model). The body of such a route is read after
   * authentication and the role check, with the same depth guard; every other route keeps the small global limit.
   */
  jsonLimit?: string;
  /** Extra middleware that runs before auth (e.g. rate limiting). */
  before?: RequestHandler[];
}

/**
 * What the server adds to a contract endpoint: either a `handler` that returns the JSON body (typed against the
 * endpoint's response schema; nothing for a 204 or a file sent through `res`), or a `respond` that writes a JSON body
 * itself (pre-serialized, with an ETag): the test-time response check reads what it sends.
 */
export type Binding<E extends EndpointDef> = BindingOptions &
  (
    | { handler: (args: HandlerArgs<E>) => ResponseInputOf<E> | Promise<ResponseInputOf<E>>; respond?: never }
    | { respond: (args: HandlerArgs<E>) => Promise<void>; handler?: never }
  );

/**
 * One route of the table: a contract endpoint (shared/api) with its handler bound. The router, the OpenAPI document
 * and the access-control test are all generated from these. Body, query and response types are erased so routes of
 * different shapes fit in one table; the erasure is sound because `mountRoutes` parses the body and query with the
 * endpoint's own schemas before its handler runs, and the handler was type-checked against the endpoint in `bind`.
 */
export type AnyRoute = Endpoint &
  BindingOptions & {
    handler: (args: ErasedArgs) => unknown;
  };

/** Handler arguments with the body, query and params types erased (see `AnyRoute`). */
type ErasedArgs = Omit<HandlerArgs<EndpointDef>, 'body' | 'query' | 'params'> & {
  body: unknown;
  query: unknown;
  params: Record<string, string>;
};

/**
 * Binds a handler (and its middleware) to an endpoint of the contract: `bind(contract.sites.create, { handler })`.
 * The handler's params, body and query are typed from the endpoint, and its result must be what the response schema
 * accepts.
 */
export function bind<E extends EndpointDef>(endpoint: E, binding: Binding<E>): AnyRoute {
  const { handler, respond, ...options } = binding;
  return { ...endpoint, ...options, handler: handler ?? respond } as unknown as AnyRoute;
}

export interface MountOptions {
  /**
   * Check every JSON success body against the endpoint's response schema; a body that does not match (or that has
   * fields the schema does not declare) is logged and answered 500 instead. On in tests (every API test then checks
   * every response), off in production.
   */
  checkResponses?: boolean;
}

/**
 * Middleware that checks the JSON success body of this request against the route's response schema, whether the
 * handler returned it or sent it itself (pre-serialized JSON through `res.send`). A body that does not match is logged
 * with the route and the first issues, and answered 500 instead.
 */
function responseChecker(def: AnyRoute, response: z.ZodType): RequestHandler {
  return (req, res, next) => {
    const send = res.send.bind(res);
    res.send = (payload?: unknown) => {
      const isJson = /json/.test(String(res.getHeader('Content-Type') ?? ''));
      const text = typeof payload === 'string' ? payload : Buffer.isBuffer(payload) ? payload.toString('utf8') : null;
      // An object goes through res.json, which comes back here with its text.
      if (res.statusCode >= 300 || !isJson || text === null) return send(payload);
      const sent: unknown = JSON.parse(text);
      const checked = response.safeParse(sent);
      const extra = checked.success ? undeclaredFields(sent, checked.data) : [];
      if (checked.success && extra.length === 0) return send(payload);
      const detail = checked.success
        ? `fields the schema does not declare (a client would drop them): ${extra.slice(0, 5).join(', ')}`
        : describeIssues(checked.error);
      const message = `The response of ${def.method.toUpperCase()} ${def.path} does not match its schema: ${detail}`;
      (req.log ?? log).error(message);
      res.status(500);
      return send(JSON.stringify({ error: { code: 'internal', message } }));
    };
    next();
  };
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Paths of the fields a body has that its parsed form lost: fields its schema does not declare (zod strips them). */
function undeclaredFields(sent: unknown, parsed: unknown, path = '', out: string[] = []): string[] {
  if (Array.isArray(sent) && Array.isArray(parsed)) {
    sent.forEach((v, i) => undeclaredFields(v, parsed[i], `${path}${i}.`, out));
  } else if (isRecord(sent) && isRecord(parsed)) {
    for (const [k, v] of Object.entries(sent)) {
      if (!(k in parsed)) out.push(`${path}${k}`);
      else undeclaredFields(v, parsed[k], `${path}${k}.`, out);
    }
  }
  return out;
}

/** The first few zod issues of a response that does not match its schema, as one line. */
function describeIssues(error: z.ZodError): string {
  return error.issues
    .slice(0, 5)
    .map((i) => `${i.path.join('.') || '(root)'}: ${i.message}`)
    .join('; ');
}

/**
 * A router that marks the requests of routes with their own `jsonLimit` (Express's own path matching), so the global
 * JSON parser leaves their body to the route. Mount it before the global parser.
 */
export function largeBodyMarker(routes: AnyRoute[]): Router {
  const marker = express.Router();
  for (const def of routes) {
    if (!def.jsonLimit) continue;
    marker[def.method](def.path, (req, _res, next) => {
      req.routeJsonLimit = def.jsonLimit;
      next();
    });
  }
  return marker;
}

export function mountRoutes(
  router: Router,
  ctx: AppContext,
  routes: AnyRoute[],
  authenticate: RequestHandler,
  opts: MountOptions = {},
): void {
  for (const def of routes) {
    const chain: RequestHandler[] = [...(def.before ?? [])];
    if (def.access !== 'public') {
      chain.push(authenticate);
      if (def.access !== 'signed-in') {
        const roles = def.access;
        chain.push((req, _res, next) => {
          const user = req.user as AuthUser;
          if (!roles.includes(user.role)) return next(ApiError.forbidden());
          next();
        });
      }
    }
    if (def.jsonLimit) chain.push(express.json({ limit: def.jsonLimit, verify: jsonDepthGuard() }));
    chain.push(...(def.middleware ?? []));
    const response = def.response;
    if (opts.checkResponses && response && !def.produces) chain.push(responseChecker(def, response));
    chain.push(async (req, res) => {
      let body: unknown = undefined;
      let query: unknown = undefined;
      if (def.body) {
        const parsed = def.body.safeParse(req.body ?? {});
        if (!parsed.success) throw validationError(parsed.error);
        body = parsed.data;
      }
      if (def.query) {
        const parsed = def.query.safeParse(req.query ?? {});
        if (!parsed.success) throw validationError(parsed.error);
        query = parsed.data;
      }
      const result = await def.handler({
        req,
        res,
        ctx,
        body,
        query,
        params: req.params as Record<string, string>,
        user: req.user as AuthUser,
      });
      if (res.headersSent) return;
      if (result === undefined) res.status(def.status ?? 204).end();
      else res.status(def.status ?? 200).json(result);
    });
    router[def.method](def.path, ...chain);
  }
}

declare module 'express-serve-static-core' {
  interface Request {
    user?: AuthUser;
    /** Set by `largeBodyMarker`: the route reads its JSON body itself, with this limit. */
    routeJsonLimit?: string;
  }
}
