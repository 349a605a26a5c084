import express, { type Request, type RequestHandler, type Response, type Router } from 'express';
import type { z } from 'zod';
import type { Role } from '../../shared/schemas/common';
import type { AppContext, AuthUser } from './context';
import { jsonDepthGuard } from './bodyParsing';
import { ApiError, validationError } from './errors';

/** Who may call a route: nobody signed in, any signed-in user, or the listed roles. */
export type Access = 'public' | 'signed-in' | readonly Role[];

export interface HandlerArgs<B, Q> {
  req: Request;
  res: Response;
  ctx: AppContext;
  body: B;
  query: Q;
  params: Record<string, string>;
  user: AuthUser;
}

type HttpMethod = 'get' | 'post' | 'put' | 'patch' | 'delete';

/**
 * One route: method, path, who may call it, its zod schemas and its handler.
 * The router, the OpenAPI document and the access-control test are all generated from these definitions.
 */
export interface RouteDef<B = unknown, Q = unknown> {
  method: HttpMethod;
  path: string;
  summary: string;
  tag: string;
  access: Access;
  body?: z.ZodType<B>;
  query?: z.ZodType<Q>;
  response?: z.ZodType;
  /** Content type of a non-JSON success response (e.g. application/pdf). */
  produces?: string;
  /** Multipart or other pre-handler middleware (runs after auth). */
  middleware?: RequestHandler[];
  /**
   * A larger JSON body limit than the API's (e.g. '25mb' for a whole model). The body of such a route is read after
   * authentication and the role check, with the same depth guard; every other route keeps the small global limit.
   */
  jsonLimit?: string;
  /** Extra middleware that runs before auth (e.g. rate limiting). */
  before?: RequestHandler[];
  status?: number;
  handler: (args: HandlerArgs<B, Q>) => unknown | Promise<unknown>;
}

/**
 * A route with its body and query types erased, so routes of different shapes fit in one table. The erasure is sound
 * because `mountRoutes` parses the body and query with the route's own schemas before its handler runs.
 */
export type AnyRoute = RouteDef<unknown, unknown>;

export function defineRoute<B = undefined, Q = undefined>(def: RouteDef<B, Q>): AnyRoute {
  return def as unknown as AnyRoute;
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

export function mountRoutes(router: Router, ctx: AppContext, routes: AnyRoute[], authenticate: RequestHandler): void {
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
