import type { RequestHandler } from 'express';
import multer from 'multer';
import { ApiError } from '../services/errors';
import { PhotoRefused, reencodePhoto } from './imageReencode';

export type ImageType = 'image/jpeg' | 'image/png' | 'image/webp' | 'image/heic' | 'image/heif';
export type ImageExtension = 'jpg' | 'png' | 'webp' | 'heic' | 'heif';

/** Declared types accepted from clients (`image/jpg` and `image/pjpeg` are old spellings of JPEG). */
const DECLARED_TYPES = new Set([
  'image/jpeg',
  'image/jpg',
  'image/pjpeg',
  'image/png',
  'image/webp',
  'image/heic',
  'image/heif',
]);

/** HEIF brands at offset 8 after the `ftyp` box type at offset 4: HEIC images and the generic HEIF brand. */
const HEIF_BRANDS: Record<string, { type: ImageType; extension: ImageExtension }> = {
  heic: { type: 'image/heic', extension: 'heic' },
  heix: { type: 'image/heic', extension: 'heic' },
  mif1: { type: 'image/heif', extension: 'heif' },
};

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

/**
 * The image type from the file's first bytes, or null when it is none of the accepted images:
 * JPEG `FF D8 FF`; PNG `89 50 4E 47 0D 0A 1A 0A`; WebP `RIFF` then `WEBP` at offset 8;
 * HEIC/HEIF `ftyp` at offset 4 followed by the brand `heic`, `heix` or `mif1`.
 */
export function detectImage(buffer: Buffer): { type: ImageType; extension: ImageExtension } | null {
  if (buffer.length >= 3 && buffer[0] === 0xff && buffer[1] === 0xd8 && buffer[2] === 0xff)
    return { type: 'image/jpeg', extension: 'jpg' };
  if (buffer.length >= 8 && buffer.subarray(0, 8).equals(PNG_SIGNATURE)) return { type: 'image/png', extension: 'png' };
  if (
    buffer.length >= 12 &&
    buffer.toString('latin1', 0, 4) === 'RIFF' &&
    buffer.toString('latin1', 8, 12) === 'WEBP'
  ) {
    return { type: 'image/webp', extension: 'webp' };
  }
  if (buffer.length >= 12 && buffer.toString('latin1', 4, 8) === 'ftyp') {
    return HEIF_BRANDS[buffer.toString('latin1', 8, 12)] ?? null;
  }
  return null;
}

/** The file extension for an image buffer (`jpg`, `png`, `webp`, `heic`, `heif`), or null when it is not one. */
export function imageExtension(buffer: Buffer): ImageExtension | null {
  return detectImage(buffer)?.extension ?? null;
}

const DEFAULT_MAX_BYTES = 10 * 1024 * 1024;

function describeSize(bytes: number): string {
  return bytes >= 1024 * 1024 ? `${+(bytes / 1024 / 1024).toFixed(1)} MB` : `${Math.ceil(bytes / 1024)} KB`;
}

/**
 * One photo from the multipart field `field`, held in memory as `req.file`.
 * Accepted: JPEG and PNG, judged by the declared type AND the file's first bytes, then decoded and encoded again
 * (`reencodePhoto`: no metadata kept, EXIF orientation applied, at most 8 000 px a side and 25 MP, reduced to 3 000 px);
 * WebP and HEIC are recognized but refused (no decoder here). On success `req.file` holds the re-encoded photo and its
 * type, so it can be stored as is.
 * Too large → 413 `payload_too_large`; not an accepted image → 415 `unsupported_media_type`;
 * missing while `required` (the default) → 400; other malformed uploads → 400. Errors name the field.
 */
export function imageUpload(field: string, opts: { maxBytes?: number; required?: boolean } = {}): RequestHandler {
  const maxBytes = opts.maxBytes ?? DEFAULT_MAX_BYTES;
  const required = opts.required ?? true;
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1 } }).single(field);
  return (req, res, next) => {
    upload(req, res, (err: unknown) => {
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          return next(
            new ApiError('payload_too_large', `The photo in "${field}" is larger than ${describeSize(maxBytes)}`, {
              [field]: `Larger than ${describeSize(maxBytes)}`,
            }),
          );
        }
        if (err.code === 'LIMIT_UNEXPECTED_FILE' || err.code === 'LIMIT_FILE_COUNT') {
          return next(
            new ApiError('bad_request', `Send one photo, in the "${field}" field`, {
              [err.field ?? field]: 'Unexpected file',
            }),
          );
        }
        return next(
          new ApiError('bad_request', `Upload refused: ${err.message}`, { [err.field ?? field]: err.message }),
        );
      }
      if (err)
        return next(
          new ApiError(
            'bad_request',
            `The upload could not be read: ${err instanceof Error ? err.message : String(err)}`,
            { [field]: 'Unreadable upload' },
          ),
        );
      const file = req.file;
      if (!file) {
        if (!required) return next();
        return next(new ApiError('bad_request', `Attach a photo as the "${field}" field`, { [field]: 'Required' }));
      }
      const detected = detectImage(file.buffer);
      if (!DECLARED_TYPES.has(file.mimetype.toLowerCase()) || !detected) {
        delete req.file;
        return next(
          new ApiError('unsupported_media_type', `The file in "${field}" is not a JPEG, PNG, WebP or HEIC photo`, {
            [field]: 'Not a JPEG, PNG, WebP or HEIC image',
          }),
        );
      }
      if (detected.type !== 'image/jpeg' && detected.type !== 'image/png') {
        // No decoder for WebP or HEIC here: such a file could not be checked nor cleaned of its metadata.
        delete req.file;
        return next(
          new ApiError(
            'unsupported_media_type',
            `The photo in "${field}" is ${detected.extension.toUpperCase()}: send a JPEG or PNG`,
            {
              [field]: 'Send a JPEG or PNG photo',
            },
          ),
        );
      }
      try {
        file.buffer = reencodePhoto(file.buffer, detected.type);
      } catch (e) {
        delete req.file;
        if (!(e instanceof PhotoRefused)) return next(e);
        return next(
          e.reason === 'too-large'
            ? new ApiError('payload_too_large', `${e.message} ("${field}")`, { [field]: e.message })
            : new ApiError(
                'unsupported_media_type',
                `The file in "${field}" is not a readable JPEG or PNG: ${e.message}`,
                {
                  [field]: 'Not a readable JPEG or PNG image',
                },
              ),
        );
      }
      file.size = file.buffer.length;
      file.mimetype = detected.type;
      next();
    });
  };
}
