import type { RequestHandler } from 'express';
import multer from 'multer';
import { ApiError } from '../services/errors';

/**
 * One-file multipart upload into memory, with a size limit and an accepted-type check.
 * Too large → 413; wrong type → 415; missing → 400 naming the field.
 */
export function singleFileUpload(opts: {
  field: string;
  maxBytes: number;
  accept: (mime: string, name: string) => boolean;
  what: string;
}): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: opts.maxBytes, files: 1 } }).single(
    opts.field,
  );
  return (req, res, next) => {
    upload(req, res, (err: unknown) => {
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          return next(
            new ApiError('payload_too_large', `The file is larger than ${Math.round(opts.maxBytes / 1024)} KB`, {
              [opts.field]: 'Too large',
            }),
          );
        }
        return next(
          new ApiError('bad_request', `Upload refused: ${err.message}`, { [err.field ?? opts.field]: err.message }),
        );
      }
      if (err) return next(err);
      if (!req.file)
        return next(
          new ApiError('bad_request', `Attach ${opts.what} as the "${opts.field}" field`, { [opts.field]: 'Required' }),
        );
      if (!opts.accept(req.file.mimetype, req.file.originalname)) {
        return next(
          new ApiError('unsupported_media_type', `Expected ${opts.what}; got ${req.file.mimetype}`, {
            [opts.field]: 'Wrong file type',
          }),
        );
      }
      next();
    });
  };
}

/** Several files in one multipart field (e.g. one CSV per element type), with the same limits and checks. */
export function multiFileUpload(opts: {
  field: string;
  maxFiles: number;
  maxBytes: number;
  accept: (mime: string, name: string) => boolean;
  what: string;
}): RequestHandler {
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: opts.maxBytes, files: opts.maxFiles },
  }).array(opts.field, opts.maxFiles);
  return (req, res, next) => {
    upload(req, res, (err: unknown) => {
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          return next(
            new ApiError('payload_too_large', `A file is larger than ${Math.round(opts.maxBytes / 1024 / 1024)} MB`, {
              [opts.field]: 'Too large',
            }),
          );
        }
        if (err.code === 'LIMIT_FILE_COUNT' || err.code === 'LIMIT_UNEXPECTED_FILE') {
          return next(
            new ApiError('bad_request', `Send at most ${opts.maxFiles} files in the "${opts.field}" field`, {
              [opts.field]: err.message,
            }),
          );
        }
        return next(new ApiError('bad_request', `Upload refused: ${err.message}`, { [opts.field]: err.message }));
      }
      if (err) return next(err);
      const files = (req.files as Express.Multer.File[] | undefined) ?? [];
      if (!files.length)
        return next(
          new ApiError('bad_request', `Attach ${opts.what} as the "${opts.field}" field`, { [opts.field]: 'Required' }),
        );
      const wrong = files.find((f) => !opts.accept(f.mimetype, f.originalname));
      if (wrong)
        return next(
          new ApiError('unsupported_media_type', `Expected ${opts.what}; ${wrong.originalname} is ${wrong.mimetype}`, {
            [opts.field]: 'Wrong file type',
          }),
        );
      next();
    });
  };
}
