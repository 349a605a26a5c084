import type { IncomingMessage } from 'node:http';
import type { RequestHandler } from 'express';
import { ApiError } from '../services/errors';

/** Deepest nesting of objects and arrays accepted in a JSON body (no legitimate body comes near it). */
export const MAX_JSON_DEPTH = 64;

/**
 * `verify` for `express.json`: refuses, before parsing, a body whose objects and arrays nest deeper than `maxDepth`
 * (a linear scan of the bytes that skips strings). Code that walks a parsed body recursively then never meets a
 * depth that overflows its stack.
 */
export function jsonDepthGuard(maxDepth = MAX_JSON_DEPTH) {
  return (_req: IncomingMessage, _res: unknown, buf: Buffer): void => {
    let depth = 0;
    let inString = false;
    for (let i = 0; i < buf.length; i++) {
      const c = buf[i];
      if (inString) {
        if (c === 0x5c)
          i++; // backslash: skip the escaped character
        else if (c === 0x22) inString = false;
      } else if (c === 0x22) inString = true;
      else if (c === 0x7b || c === 0x5b) {
        if (++depth > maxDepth)
          throw Object.assign(new Error(`nested deeper than ${maxDepth} levels`), {
            status: 400,
            type: 'entity.too.deep',
          });
      } else if (c === 0x7d || c === 0x5d) depth--;
    }
  };
}

/**
 * The body parser's own refusals (they carry `type` and a 4xx `status`) as API errors naming the body: a compressed
 * body that does not decompress, an unknown content encoding or charset.
 */
export function bodyParserError(err: unknown): ApiError | null {
  if (!err || typeof err !== 'object') return null;
  const e = err as { type?: unknown; status?: unknown; message?: unknown; expose?: unknown };
  // http-errors marks every 4xx it makes `expose`; a decompression error (zlib, brotli) arrives wrapped in one.
  if (typeof e.status !== 'number' || e.status < 400 || e.status >= 500 || e.expose !== true) return null;
  const detail = typeof e.message === 'string' ? e.message.slice(0, 200) : '';
  switch (e.type) {
    case 'entity.too.deep':
      return new ApiError('bad_request', `The request body's objects and arrays are ${detail}`, {
        body: `Objects and arrays ${detail}`,
      });
    case 'encoding.unsupported':
      return new ApiError('unsupported_media_type', `The request body's Content-Encoding is not supported: ${detail}`, {
        body: 'Send it uncompressed, or as gzip, deflate or br',
      });
    case 'charset.unsupported':
      return new ApiError('unsupported_media_type', `The request body's charset is not supported: ${detail}`, {
        body: 'Send it as UTF-8',
      });
  }
  if (e.status === 413) return new ApiError('payload_too_large', 'The request body is too large');
  if (e.status === 415) return new ApiError('unsupported_media_type', detail || 'Unsupported body', { body: detail });
  if (e.status === 403) return ApiError.forbidden(detail || undefined);
  if (e.status === 404) return ApiError.notFound(detail || undefined);
  // Most often a body labelled gzip, deflate or br that does not decompress, or a body cut short.
  return new ApiError(
    'bad_request',
    `The request body could not be read (${detail || 'unreadable'}); check its Content-Encoding`,
    {
      body: detail || 'Unreadable',
    },
  );
}

/**
 * A request body must be JSON or multipart/form-data, the only kinds the API reads: anything else (a form-encoded
 * body, text, no Content-Type) is a 415 naming the body, instead of reaching the route as an empty object and being
 * refused for a missing field it did send.
 */
export const requireJsonOrMultipart: RequestHandler = (req, _res, next) => {
  const length = Number(req.headers['content-length'] ?? 0);
  const hasBody = req.headers['transfer-encoding'] !== undefined || (Number.isFinite(length) && length > 0);
  if (!hasBody) return next();
  const media = String(req.headers['content-type'] ?? '')
    .split(';')[0]
    .trim()
    .toLowerCase();
  if (
    media === 'application/json' ||
    /^application\/[a-z0-9.+-]+\+json$/.test(media) ||
    media === 'multipart/form-data'
  )
    return next();
  next(
    new ApiError(
      'unsupported_media_type',
      `Send the request body as JSON (Content-Type: application/json) or as multipart/form-data, not ${media || 'without a Content-Type'}`,
      { body: `Must be JSON or multipart/form-data, not ${media || 'untyped'}` },
    ),
  );
};
