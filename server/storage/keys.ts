import { randomUUID } from 'node:crypto';

/** A key that is not safe to use as a storage path. Callers make keys, so this is a programming error (500). */
export class FileKeyError extends Error {
  readonly key: string;
  constructor(key: string, reason: string) {
    super(`Invalid file key ${JSON.stringify(key.length > 80 ? `${key.slice(0, 80)}…` : key)}: ${reason}`);
    this.name = 'FileKeyError';
    this.key = key;
  }
}

const MAX_KEY_LENGTH = 512;
const MAX_SEGMENT_LENGTH = 128;
/**
 * One path segment: letters, digits, `.`, `_`, `-`, starting with a letter or digit.
 * The leading character rules out `.` and `..`, and keeps names starting with `.` free for the
 * local store's own sidecar and temporary files.
 */
const SEGMENT = /^[A-Za-z0-9][A-Za-z0-9._-]*$/;

/** Why `key` is refused, or null when it is a safe key. */
export function fileKeyProblem(key: unknown): string | null {
  if (typeof key !== 'string' || key.length === 0) return 'empty';
  if (key.length > MAX_KEY_LENGTH) return `longer than ${MAX_KEY_LENGTH} characters`;
  if (key.startsWith('/') || key.startsWith('\\') || /^[A-Za-z]:/.test(key)) return 'absolute paths are not allowed';
  const segments = key.split('/');
  for (const segment of segments) {
    if (segment === '') return 'empty path segment';
    if (segment === '.' || segment === '..') return `"${segment}" segments are not allowed`;
    if (segment.length > MAX_SEGMENT_LENGTH) return `a path segment is longer than ${MAX_SEGMENT_LENGTH} characters`;
    if (!SEGMENT.test(segment))
      return 'only letters, digits, ".", "_", "-" and "/" are allowed, and no segment may start with "." "_" or "-"';
  }
  return null;
}

export function isValidFileKey(key: unknown): key is string {
  return fileKeyProblem(key) === null;
}

/** Throws a FileKeyError unless `key` is safe: relative, no `..`, only `[A-Za-z0-9._-]` segments separated by `/`. */
export function assertValidKey(key: string): void {
  const problem = fileKeyProblem(key);
  if (problem) throw new FileKeyError(String(key), problem);
}

/** A fresh key in the agreed layout: `org/<orgId>/<uuid>.<extension>`. */
export function makeFileKey(orgId: string | number, extension: string): string {
  const key = `org/${orgId}/${randomUUID()}.${extension.replace(/^\./, '').toLowerCase()}`;
  assertValidKey(key);
  return key;
}

/** A content type such as `image/png` or `text/plain; charset=utf-8`: no control characters, `type/subtype` form. */
export function assertValidContentType(contentType: string): void {
  if (
    typeof contentType !== 'string' ||
    contentType.length > 200 ||
    /[\x00-\x1f\x7f]/.test(contentType) ||
    !/^[A-Za-z0-9!#$&^_.+-]+\/[A-Za-z0-9!#$&^_.+-]+(\s*;.*)?$/.test(contentType)
  ) {
    throw new TypeError(`Invalid content type ${JSON.stringify(contentType)}`);
  }
}
