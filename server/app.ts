import fs from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import { authenticate } from './auth/middleware';
import type { Config } from './config';
import type { Db } from './db';
import type { AppContext } from './services/context';
import { jsonDepthGuard, requireJsonOrMultipart } from './http/bodyParsing';
import { errorMiddleware } from './http/errors';
import { ApiError } from './services/errors';
import { buildOpenApi } from './http/openapi';
import { httpLogger, log, type Logger } from './log';
import { createMailer, type Mailer } from './mail';
import { largeBodyMarker, mountRoutes, type AnyRoute } from './http/route';
import { securityHeaders } from './http/securityHeaders';
import { allRoutes } from './routes';
import { Jobs } from './services/jobs';
import { LocalFileStore, type FileStore } from './storage';

export const API_VERSION = '0.1.0';

export interface CreateAppOptions {
  config: Config;
  db: Db;
  now?: () => Date;
  signInLimitPerMinute?: number;
  publicCheckPerMinute?: number;
  /** Defaults to a local-disk store under DATA_DIR/uploads. */
  storage?: FileStore;
  /** Defaults to the mailer the config asks for (SMTP_URL, or the local sink, started on first use). */
  mail?: Mailer;
  /** Defaults to the process logger (server/log.ts). */
  logger?: Logger;
  /** Check every JSON success body against its response schema (500 when it does not match). Default: in tests. */
  checkResponses?: boolean;
}

/** Builds the Express app (no listening): /api plus the exported web build on the same origin. */
export function createApp(opts: CreateAppOptions): { app: Express; ctx: AppContext; routes: AnyRoute[] } {
  const ctx: AppContext = {
    config: opts.config,
    db: opts.db,
    now: opts.now ?? (() => new Date()),
    jobs: new Jobs(),
    storage: opts.storage ?? new LocalFileStore(path.join(opts.config.dataDir, 'uploads')),
    mail: opts.mail ?? createMailer(opts.config),
  };
  const routes = allRoutes({
    signInLimitPerMinute: opts.signInLimitPerMinute ?? opts.config.signInLimitPerMinute,
    publicCheckPerMinute: opts.publicCheckPerMinute ?? 120,
  });
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  // First: every request gets its id (X-Request-Id) and `req.log` before anything can fail.
  app.use(httpLogger(opts.logger ?? log, opts.config.logRequests));
  app.use(securityHeaders(opts.config.publicBaseUrl));

  const api = express.Router();
  api.use(requireJsonOrMultipart);
  // Routes with their own JSON limit (a whole model) read their body after authentication; the rest share this one.
  api.use(largeBodyMarker(routes));
  const json = express.json({ limit: opts.config.jsonLimit, verify: jsonDepthGuard() });
  api.use((req, res, next) => (req.routeJsonLimit ? next() : json(req, res, next)));
  api.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  const openapi = buildOpenApi(routes, API_VERSION);
  api.get('/openapi.json', (_req, res) => res.json(openapi));
  mountRoutes(api, ctx, routes, authenticate(ctx), {
    checkResponses: opts.checkResponses ?? opts.config.env === 'test',
  });
  api.use((req, _res, next) => next(ApiError.notFound(`No API route ${req.method} ${req.path}`)));
  api.use(errorMiddleware);
  app.use('/api', api);

  // The exported web app: static files, then the single-page fallback for client routes.
  const webDir = opts.config.webDir;
  app.use(express.static(webDir, { index: false, maxAge: '1h' }));
  app.get('/{*splat}', (_req, res) => {
    const index = path.join(webDir, 'index.html');
    if (fs.existsSync(index)) res.sendFile(index);
    else
      res
        .status(503)
        .type('text')
        .send('The web app is not built yet: run `npm run build:web` (npm start does it for you).');
  });
  app.use(errorMiddleware);
  return { app, ctx, routes };
}
