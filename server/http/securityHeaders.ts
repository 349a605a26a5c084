import type { Request, RequestHandler, Response } from 'express';
import helmet from 'helmet';

const directives = {
  defaultSrc: ["'self'"],
  scriptSrc: ["'self'"],
  styleSrc: ["'self'", "'unsafe-inline'"],
  imgSrc: ["'self'", 'data:', 'blob:'],
  fontSrc: ["'self'", 'data:'],
  connectSrc: ["'self'"],
  mediaSrc: ["'self'", 'blob:'],
  objectSrc: ["'none'"],
  frameAncestors: ["'none'"],
};

/** Helmet with this app's options, over TLS (`upgrade-insecure-requests`) or plain HTTP. */
export function helmetFor(overTls: boolean): RequestHandler {
  return helmet({
    crossOriginEmbedderPolicy: false,
    contentSecurityPolicy: {
      directives: overTls ? directives : { ...directives, upgradeInsecureRequests: null },
    },
  });
}

/**
 * Helmet's headers with a content security policy that asks for `upgrade-insecure-requests` only when the app is
 * served over TLS: the request arrived over HTTPS (directly, or `X-Forwarded-Proto: https` from a trusted proxy, see
 * `trust proxy`) or the public origin is https. A LAN install reached over plain HTTP by its IP address would
 * otherwise have its scripts upgraded to an https origin that does not answer, and show a blank page.
 */
export function securityHeaders(publicBaseUrl: string): RequestHandler {
  const overTls = fixedHeaders(helmetFor(true));
  const plain = fixedHeaders(helmetFor(false));
  const alwaysTls = publicBaseUrl.toLowerCase().startsWith('https:');
  return (req, res, next) => {
    for (const [name, value] of alwaysTls || req.secure ? overTls : plain) res.setHeader(name, value);
    res.removeHeader('X-Powered-By');
    next();
  };
}

/**
 * The headers a helmet middleware sets, read once: with fixed options (no per-request nonce or function directive)
 * it sets the same headers on every response, so setting the list is the same and spares its dozen middlewares per
 * request. Throws at start if it ever stops being synchronous and fixed.
 */
function fixedHeaders(middleware: RequestHandler): [string, string][] {
  const headers: [string, string][] = [];
  const res = {
    setHeader: (name: string, value: unknown) => headers.push([name, String(value)]),
    removeHeader: () => undefined,
    getHeader: () => undefined,
  };
  let done = false;
  middleware({} as Request, res as unknown as Response, (err?: unknown) => {
    if (err) throw err instanceof Error ? err : new Error(String(err));
    done = true;
  });
  if (!done) throw new Error('The security headers middleware did not finish synchronously');
  return headers;
}
