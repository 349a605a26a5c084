import { randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import pino, { type DestinationStream, type Logger } from 'pino';
import type { RequestHandler } from 'express';
import { pinoHttp } from 'pino-http';

export type { Logger };

const LEVELS = ['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'] as const;
type Level = (typeof LEVELS)[number];

/**
 * The server's logger: JSON lines on stdout in production (one object per event, for a log collector), readable lines
 * (pino-pretty) in development, silent in tests. LOG_LEVEL overrides the level (fatal … trace, silent).
 */
export function createLogger(env: NodeJS.ProcessEnv = process.env, destination?: DestinationStream): Logger {
  const mode = env.NODE_ENV === 'production' ? 'production' : env.NODE_ENV === 'test' ? 'test' : 'development';
  const asked = env.LOG_LEVEL as Level | undefined;
  const level: Level = asked && LEVELS.includes(asked) ? asked : mode === 'test' ? 'silent' : 'info';
  const options = { level, base: { service: 'emberline' } };
  if (destination) return pino(options, destination);
  if (mode === 'development') {
    const pretty = prettyStream();
    if (pretty) return pino(options, pretty);
  }
  return pino(options);
}

/** pino-pretty, a development dependency: absent from a production install, where JSON is wanted anyway. */
function prettyStream(): DestinationStream | null {
  try {
    // eslint-disable-next-line @typescript-eslint/no-require-imports
    const pretty = require('pino-pretty') as typeof import('pino-pretty');
    return pretty.build({
      sync: true,
      colorize: !!process.stdout.isTTY,
      translateTime: 'SYS:HH:MM:ss.l',
      ignore: 'pid,hostname,service',
    });
  } catch {
    return null;
  }
}

/** The process-wide logger (services, jobs, the mail sink). */
export const log: Logger = createLogger();

/** An incoming X-Request-Id is kept when it is short and plain (letters, digits, `.`, `_`, `:`, `-`). */
const SANE_REQUEST_ID = /^[A-Za-z0-9._:-]{1,128}$/;

export function requestIdOf(header: string | string[] | undefined): string {
  const v = Array.isArray(header) ? header[0] : header;
  return v && SANE_REQUEST_ID.test(v) ? v : randomUUID();
}

/**
 * Every request gets an id (the caller's X-Request-Id when sane, else a new UUID), echoed as the X-Request-Id
 * response header and carried by `req.log` / `req.id`. `logRequests`: pino-http writes one line per finished request
 * (5xx at error, 4xx at warn). Without it only the errors the error handler logs are written, and `req.log` (a child
 * logger bound to the request) is made only when something logs through it, not for every request.
 */
export function httpLogger(logger: Logger, logRequests: boolean): RequestHandler {
  if (!logRequests) {
    return (req, res, next) => {
      const id = requestIdOf(req.headers['x-request-id']);
      res.setHeader('X-Request-Id', id);
      req.id = id;
      let child: Logger | undefined;
      Object.defineProperty(req, 'log', {
        configurable: true,
        enumerable: false,
        get: () => (child ??= logger.child({ req: { id, method: req.method, url: req.url } })),
        set: (value: Logger) => {
          child = value;
        },
      });
      next();
    };
  }
  return pinoHttp({
    logger,
    genReqId: (req: IncomingMessage, res: ServerResponse) => {
      const id = requestIdOf(req.headers['x-request-id']);
      res.setHeader('X-Request-Id', id);
      return id;
    },
    autoLogging: logRequests,
    customLogLevel: (_req, res, err) =>
      err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info',
    // No request headers in the log: they carry bearer tokens.
    serializers: {
      req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
  });
}
