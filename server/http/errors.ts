import type { ErrorRequestHandler } from 'express';
import { z } from 'zod';
import { fieldPath } from '../../shared/fieldPath';
import type { ErrorCode } from '../../shared/schemas/common';
import { EngineError } from '../engine/errors';
import { log } from '../log';
import { bodyParserError } from './bodyParsing';

const STATUS: Record<ErrorCode, number> = {
  bad_request: 400,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  unsupported_media_type: 415,
  unprocessable: 422,
  rate_limited: 429,
  internal: 500,
};

/** The one API error type. The error middleware turns it into `{ error: { code, message, fields? } }`. */
export class ApiError extends Error {
  readonly code: ErrorCode;
  readonly fields?: Record<string, string>;
  constructor(code: ErrorCode, message: string, fields?: Record<string, string>) {
    super(message);
    this.code = code;
    this.fields = fields;
  }
  get status(): number {
    return STATUS[this.code];
  }
  static notFound(what = 'Not found'): ApiError {
    return new ApiError('not_found', what);
  }
  static forbidden(message = 'Your role may not do this'): ApiError {
    return new ApiError('forbidden', message);
  }
  static unauthorized(message = 'Sign in to continue'): ApiError {
    return new ApiError('unauthorized', message);
  }
  static conflict(message: string): ApiError {
    return new ApiError('conflict', message);
  }
}

/** zod issues → `{ "a.b[2]": "message" }`, first message per field. */
export function fieldsFromZod(error: z.ZodError, prefix = ''): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = fieldPath(issue.path, prefix);
    if (!(key in fields)) fields[key] = issue.message;
  }
  return fields;
}

export function validationError(error: z.ZodError, prefix = ''): ApiError {
  const fields = fieldsFromZod(error, prefix);
  const names = Object.keys(fields);
  const message =
    names.length === 1
      ? `Invalid ${names[0]}: ${fields[names[0]]}`
      : `Invalid input in ${names.length} fields: ${names.slice(0, 5).join(', ')}`;
  return new ApiError('bad_request', message, fields);
}

/** A model with several problems: 400 naming every element and field (`prefix` places them in the request body). */
export function modelIssuesError(
  issues: { path: string; message: string; elementId?: string }[],
  prefix = '',
): ApiError {
  const fields: Record<string, string> = {};
  for (const i of issues) fields[`${prefix}${i.path}`] ??= i.elementId ? `${i.elementId}: ${i.message}` : i.message;
  const first = issues[0];
  const more = issues.length > 1 ? ` (and ${issues.length - 1} more)` : '';
  return new ApiError(
    'bad_request',
    `${first.elementId ? `${first.elementId} ` : ''}${prefix}${first.path}: ${first.message}${more}`,
    fields,
  );
}

export function fromEngineError(e: EngineError): ApiError {
  const code: ErrorCode = e.kind === 'out-of-range' ? 'unprocessable' : 'bad_request';
  return new ApiError(code, e.message, e.field ? { [e.field]: e.message } : undefined);
}

export const errorMiddleware: ErrorRequestHandler = (err, req, res, _next) => {
  let apiError: ApiError;
  if (err instanceof ApiError) apiError = err;
  else if (err instanceof EngineError) apiError = fromEngineError(err);
  else if (err instanceof z.ZodError) apiError = validationError(err);
  else if (err && typeof err === 'object' && 'type' in err && (err as { type: string }).type === 'entity.too.large') {
    apiError = new ApiError('payload_too_large', 'The request body is too large');
  } else if (
    err &&
    typeof err === 'object' &&
    'type' in err &&
    (err as { type: string }).type === 'entity.parse.failed'
  ) {
    // Names the body as the field, like every other 400 from input (the parser's own message says where it stopped).
    const detail = err instanceof Error && err.message ? `: ${err.message.slice(0, 200)}` : '';
    apiError = new ApiError('bad_request', 'The request body is not valid JSON', { body: `Not valid JSON${detail}` });
  } else if (bodyParserError(err)) {
    apiError = bodyParserError(err)!;
  } else if (err && typeof err === 'object' && (err as { name?: string }).name === 'SequelizeUniqueConstraintError') {
    apiError = new ApiError('conflict', 'That record already exists');
  } else {
    apiError = new ApiError('internal', 'Something went wrong on the server; nothing was changed');
  }
  const body: { error: { code: ErrorCode; message: string; fields?: Record<string, string>; requestId?: string } } = {
    error: { code: apiError.code, message: apiError.message },
  };
  if (apiError.fields) body.error.fields = apiError.fields;
  if (apiError.status >= 500) {
    // Every 5xx: the error and its stack go to the log under the request id; the client gets the id, never the stack.
    const requestId = req.id === undefined ? undefined : String(req.id);
    (req.log ?? log).error({ err, reqId: requestId }, `${req.method} ${req.originalUrl} failed`);
    if (requestId) body.error.requestId = requestId;
  }
  res.status(apiError.status).json(body);
};
