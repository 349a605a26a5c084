/**
 * The errors services throw: an ApiError carries an error code (the HTTP layer maps it to a status and the JSON
 * error body, server/http/errors.ts) and the fields it names. Nothing here knows of HTTP requests or responses.
 */
import { z } from 'zod';
import { fieldPath } from '../../shared/fieldPath';
import type { ErrorCode } from '../../shared/schemas/common';
import { EngineError } from '../engine/errors';

export const STATUS: Record<ErrorCode, number> = {
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
