import type { RequestHandler } from 'express';
import multer from 'multer';
import { ApiError } from './errors';

/**
 * One-file multipart upload into memory, with a size limit and an accepted-type check.
 * Too large → 413; wrong type → 415; missing → 400 naming the field.
 */
export function singleFileUpload(opts: { field: string; maxBytes: number; accept: (mime: string, name: string) => boolean; what: string }): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: opts.maxBytes, files: 1 } }).single(opts.field);
  return (req, res, next) => {
    upload(req, res, (err: unknown) => {
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          return next(new ApiError('payload_too_large', `The file is larger than ${Math.round(opts.maxBytes / 1024)} KB`, { [opts.field]: 'Too large' }));
        }
        return next(new ApiError('bad_request', `Upload refused: ${err.message}`, { [err.field ?? opts.field]: err.message }));
      }
      if (err) return next(err);
      if (!req.file) return next(new ApiError('bad_request', `Attach ${opts.what} as the "${opts.field}" field`, { [opts.field]: 'Required' }));
      if (!opts.accept(req.file.mimetype, req.file.originalname)) {
        return next(new ApiError('unsupported_media_type', `Expected ${opts.what}; got ${req.file.mimetype}`, { [opts.field]: 'Wrong file type' }));
      }
      next();
    });
  };
}
