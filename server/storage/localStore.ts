import { randomBytes } from 'node:crypto';
import { promises as fs } from 'node:fs';
import path from 'node:path';
import { assertValidContentType, assertValidKey } from './keys';
import type { FileStore, StoredFile } from './types';

/** Content types by extension, used only when a file's sidecar is missing (e.g. a file copied in by hand). */
const TYPE_BY_EXTENSION: Record<string, string> = {
  jpg: 'image/jpeg',
  jpeg: 'image/jpeg',
  png: 'image/png',
  webp: 'image/webp',
  heic: 'image/heic',
  heif: 'image/heif',
  pdf: 'application/pdf',
  csv: 'text/csv',
  json: 'application/json',
  txt: 'text/plain',
};
const FALLBACK_TYPE = 'application/octet-stream';

interface Sidecar {
  contentType: string;
}

function isMissing(err: unknown): boolean {
  const code = (err as NodeJS.ErrnoException | null)?.code;
  return code === 'ENOENT' || code === 'ENOTDIR';
}

/**
 * Files on the local disk under `root`: key `org/7/ab.png` is `<root>/org/7/ab.png`, its content type in the
 * sidecar `<root>/org/7/.ab.png.meta.json`. Keys never have a segment starting with `.`, so sidecars and
 * temporary files cannot collide with stored files.
 *
 * Writes are atomic: data goes to a temporary file in the same directory, is flushed, then renamed over the
 * target, so a reader sees the old file or the new one, never half of one. The sidecar is written first, so
 * a visible file always has its content type.
 */
export class LocalFileStore implements FileStore {
  readonly kind = 'local' as const;
  readonly root: string;

  constructor(root: string) {
    this.root = path.resolve(root);
  }

  /** The absolute path of a key's file and of its sidecar; refuses keys that would leave the root. */
  private paths(key: string): { file: string; sidecar: string } {
    assertValidKey(key);
    const file = path.resolve(this.root, ...key.split('/'));
    if (!file.startsWith(this.root + path.sep)) throw new Error(`File key resolves outside the storage root: ${key}`);
    return { file, sidecar: path.join(path.dirname(file), `.${path.basename(file)}.meta.json`) };
  }

  async put(key: string, body: Buffer, contentType: string): Promise<void> {
    const { file, sidecar } = this.paths(key);
    assertValidContentType(contentType);
    await fs.mkdir(path.dirname(file), { recursive: true });
    const meta: Sidecar = { contentType };
    await writeAtomic(sidecar, Buffer.from(JSON.stringify(meta)));
    await writeAtomic(file, body);
  }

  async get(key: string): Promise<StoredFile | null> {
    const { file, sidecar } = this.paths(key);
    let body: Buffer;
    try {
      body = await fs.readFile(file);
    } catch (err) {
      if (isMissing(err)) return null;
      throw err;
    }
    return { body, contentType: await readContentType(sidecar, file) };
  }

  async delete(key: string): Promise<void> {
    const { file, sidecar } = this.paths(key);
    await fs.rm(file, { force: true });
    await fs.rm(sidecar, { force: true });
  }

  async exists(key: string): Promise<boolean> {
    const { file } = this.paths(key);
    try {
      return (await fs.stat(file)).isFile();
    } catch (err) {
      if (isMissing(err)) return false;
      throw err;
    }
  }
}

async function readContentType(sidecar: string, file: string): Promise<string> {
  try {
    const meta = JSON.parse(await fs.readFile(sidecar, 'utf8')) as Partial<Sidecar>;
    if (typeof meta.contentType === 'string' && meta.contentType) return meta.contentType;
  } catch (err) {
    if (!isMissing(err) && !(err instanceof SyntaxError)) throw err;
  }
  const extension = path.extname(file).slice(1).toLowerCase();
  return TYPE_BY_EXTENSION[extension] ?? FALLBACK_TYPE;
}

/** Writes `data` to a temporary sibling of `target`, flushes it to disk and renames it over `target`. */
async function writeAtomic(target: string, data: Buffer): Promise<void> {
  const temp = path.join(path.dirname(target), `.${path.basename(target)}.${randomBytes(6).toString('hex')}.tmp`);
  const handle = await fs.open(temp, 'wx', 0o640);
  try {
    try {
      await handle.writeFile(data);
      await handle.sync();
    } finally {
      await handle.close();
    }
    await fs.rename(temp, target);
  } catch (err) {
    await fs.rm(temp, { force: true });
    throw err;
  }
}
