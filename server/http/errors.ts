import type { ErrorRequestHandler } from 'express';
import { z } from 'zod';
import type { ErrorCode } from '../../shared/schemas/common';
import { EngineError } from '../engine/errors';
import { log } from '../log';
import { bodyParserError } from './bodyParsing';
import { ApiError, fromEngineError, validationError } from '../services/errors';

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
