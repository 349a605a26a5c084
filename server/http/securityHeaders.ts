import type { RequestHandler } from 'express';
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

/**
 * Helmet's headers with a content security policy that asks for `upgrade-insecure-requests` only when the app is
 * served over TLS: the request arrived over HTTPS (directly, or `X-Forwarded-Proto: https` from a trusted proxy, see
 * `trust proxy`) or the public origin is https. A LAN install reached over plain HTTP by its IP address would
 * otherwise have its scripts upgraded to an https origin that does not answer, and show a blank page.
 */
export function securityHeaders(publicBaseUrl: string): RequestHandler {
  const common = { crossOriginEmbedderPolicy: false } as const;
  const overTls = helmet({ ...common, contentSecurityPolicy: { directives } });
  const plain = helmet({
    ...common,
    contentSecurityPolicy: { directives: { ...directives, upgradeInsecureRequests: null } },
  });
  const alwaysTls = publicBaseUrl.toLowerCase().startsWith('https:');
  return (req, res, next) => (alwaysTls || req.secure ? overTls : plain)(req, res, next);
}
