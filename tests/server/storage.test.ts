import { randomBytes } from 'node:crypto';
import { promises as fs } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ConfigError } from '../../server/config';
import {
  createFileStore,
  FileKeyError,
  LocalFileStore,
  makeFileKey,
  openFileStore,
  S3FileStore,
  startLocalS3Fake,
  storageConfigFromEnv,
  type FileStore,
  type LocalS3Fake,
} from '../../server/storage';

/** Every byte value, twice, plus random bytes: a text-mode or encoding slip would change them. */
const BINARY = Buffer.concat([
  Buffer.from(Array.from({ length: 256 }, (_, i) => i)),
  Buffer.from(Array.from({ length: 256 }, (_, i) => 255 - i)),
  randomBytes(4096),
]);

const BAD_KEYS = [
  '',
  '/etc/passwd',
  '\\server\\share',
  'C:/Windows/x.png',
  '../outside.png',
  'org/1/../../outside.png',
  'org/1/./a.png',
  'org//1/a.png',
  'org/1/',
  'org/1/.hidden.png',
  'org/1/a b.png',
  'org/1/a?.png',
  'org\\1\\a.png',
  'org/1/ä.png',
  'org/1/a.png\u0000.txt',
];
const LONG_KEY = `org/1/${'a'.repeat(600)}.png`;

/** The same behaviour, whichever store holds the files. */
function describeStore(name: string, setup: () => Promise<{ store: FileStore; teardown(): Promise<void> }>): void {
  describe(name, () => {
    let store: FileStore;
    let teardown: () => Promise<void>;
    beforeAll(async () => {
      ({ store, teardown } = await setup());
    });
    afterAll(async () => teardown?.());

    it('round-trips binary data and keeps the content type', async () => {
      const key = makeFileKey('org-a', 'png');
      await store.put(key, BINARY, 'image/png');
      const got = await store.get(key);
      expect(got).not.toBeNull();
      expect(got!.body.equals(BINARY)).toBe(true);
      expect(got!.contentType).toBe('image/png');
    });

    it('keeps a content type that does not match the extension', async () => {
      const key = makeFileKey('org-a', 'bin');
      await store.put(key, Buffer.from('{"a":1}'), 'application/json');
      expect((await store.get(key))!.contentType).toBe('application/json');
    });

    it('stores an empty file', async () => {
      const key = makeFileKey('org-a', 'txt');
      await store.put(key, Buffer.alloc(0), 'text/plain');
      const got = await store.get(key);
      expect(got!.body.length).toBe(0);
      expect(await store.exists(key)).toBe(true);
    });

    it('overwrites a key with new data and type', async () => {
      const key = makeFileKey('org-a', 'jpg');
      await store.put(key, Buffer.from('first'), 'image/jpeg');
      await store.put(key, Buffer.from('second version'), 'image/webp');
      const got = await store.get(key);
      expect(got!.body.toString()).toBe('second version');
      expect(got!.contentType).toBe('image/webp');
    });

    it('gives null and false for a missing key', async () => {
      const key = makeFileKey('org-missing', 'png');
      expect(await store.get(key)).toBeNull();
      expect(await store.exists(key)).toBe(false);
    });

    it('reports existence and deletes; deleting twice is fine', async () => {
      const key = makeFileKey('org-b', 'webp');
      const other = makeFileKey('org-b', 'webp');
      await store.put(key, Buffer.from('to be removed'), 'image/webp');
      await store.put(other, Buffer.from('stays'), 'image/webp');
      expect(await store.exists(key)).toBe(true);
      await store.delete(key);
      expect(await store.exists(key)).toBe(false);
      expect(await store.get(key)).toBeNull();
      await expect(store.delete(key)).resolves.toBeUndefined();
      expect((await store.get(other))!.body.toString()).toBe('stays');
    });

    it('keeps keys of different organisations apart', async () => {
      await store.put('org/1/same.png', Buffer.from('one'), 'image/png');
      await store.put('org/2/same.png', Buffer.from('two'), 'image/png');
      expect((await store.get('org/1/same.png'))!.body.toString()).toBe('one');
      expect((await store.get('org/2/same.png'))!.body.toString()).toBe('two');
    });

    it.each([...BAD_KEYS.map((k) => [JSON.stringify(k), k]), ['a 600-character segment', LONG_KEY]])(
      'refuses the bad key %s in every method',
      async (_label, key) => {
        await expect(store.put(key, Buffer.from('x'), 'image/png')).rejects.toThrow(FileKeyError);
        await expect(store.get(key)).rejects.toThrow(FileKeyError);
        await expect(store.exists(key)).rejects.toThrow(FileKeyError);
        await expect(store.delete(key)).rejects.toThrow(FileKeyError);
      },
    );

    it('refuses a content type with a line break', async () => {
      await expect(store.put(makeFileKey('org-a', 'png'), Buffer.from('x'), 'image/png\r\nX-Evil: 1')).rejects.toThrow(
        TypeError,
      );
    });
  });
}

describeStore('local store', async () => {
  const root = await fs.mkdtemp(path.join(os.tmpdir(), 'emberline-local-'));
  return {
    store: createFileStore({ kind: 'local', root }),
    teardown: () => fs.rm(root, { recursive: true, force: true }),
  };
});

describeStore('s3 store (local fake)', async () => {
  const fake = await startLocalS3Fake({ bucket: 'emberline-test' });
  const store = createFileStore({ kind: 's3', ...fake.config });
  return {
    store,
    async teardown() {
      (store as S3FileStore).destroy();
      await fake.stop();
    },
  };
});

describe('local store on disk', () => {
  let root: string;
  beforeAll(async () => {
    root = await fs.mkdtemp(path.join(os.tmpdir(), 'emberline-local-'));
  });
  afterAll(() => fs.rm(root, { recursive: true, force: true }));

  it('writes the file under the root, leaves no temporary files, and never writes outside the root', async () => {
    const store = new LocalFileStore(path.join(root, 'uploads'));
    await store.put('org/9/a.png', Buffer.from('png bytes'), 'image/png');
    expect(await fs.readFile(path.join(root, 'uploads/org/9/a.png'), 'utf8')).toBe('png bytes');
    const names = await fs.readdir(path.join(root, 'uploads/org/9'));
    expect(names.sort()).toEqual(['.a.png.meta.json', 'a.png']);
    await expect(store.put('../escape.png', Buffer.from('x'), 'image/png')).rejects.toThrow(FileKeyError);
    expect(await fs.readdir(root)).toEqual(['uploads']);
  });

  it('falls back to the extension when a sidecar is missing', async () => {
    const store = new LocalFileStore(root);
    await fs.mkdir(path.join(root, 'org/3'), { recursive: true });
    await fs.writeFile(path.join(root, 'org/3/copied.jpg'), 'jpeg bytes');
    await fs.writeFile(path.join(root, 'org/3/copied.xyz'), 'other bytes');
    expect((await store.get('org/3/copied.jpg'))!.contentType).toBe('image/jpeg');
    expect((await store.get('org/3/copied.xyz'))!.contentType).toBe('application/octet-stream');
  });

  it('a reader sees the old or the new file, never a partial one, during concurrent overwrites', async () => {
    const store = new LocalFileStore(root);
    const a = Buffer.alloc(512 * 1024, 0x61);
    const b = Buffer.alloc(512 * 1024, 0x62);
    await store.put('org/4/race.bin', a, 'application/octet-stream');
    const writes = Promise.all(
      [1, 2, 3, 4].map((i) => store.put('org/4/race.bin', i % 2 ? b : a, 'application/octet-stream')),
    );
    const reads = Promise.all([1, 2, 3, 4, 5, 6].map(() => store.get('org/4/race.bin')));
    const [, seen] = await Promise.all([writes, reads]);
    for (const got of seen) expect(got!.body.equals(a) || got!.body.equals(b)).toBe(true);
    expect((await fs.readdir(path.join(root, 'org/4'))).filter((n) => n.endsWith('.tmp'))).toEqual([]);
  });
});

describe('makeFileKey', () => {
  it('makes org/<orgId>/<uuid>.<ext> keys, different each time', () => {
    const key = makeFileKey(42, '.PNG');
    expect(key).toMatch(/^org\/42\/[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}\.png$/);
    expect(makeFileKey(42, 'png')).not.toBe(key);
  });
  it('refuses an org id or extension that would make a bad key', () => {
    expect(() => makeFileKey('../x', 'png')).toThrow(FileKeyError);
    expect(() => makeFileKey('1', 'png/../../x')).toThrow(FileKeyError);
  });
});

describe('storageConfigFromEnv', () => {
  const dataDir = path.join(os.tmpdir(), 'emberline-data');
  const s3Env = {
    STORAGE: 's3',
    S3_BUCKET: 'photos',
    S3_ACCESS_KEY_ID: 'AKID',
    S3_SECRET_ACCESS_KEY: 'secret-value-123',
  };

  it('defaults to the local store under <dataDir>/uploads', () => {
    expect(storageConfigFromEnv({}, dataDir)).toEqual({ kind: 'local', root: path.join(dataDir, 'uploads') });
    expect(storageConfigFromEnv({ STORAGE: '' }, dataDir)).toEqual({
      kind: 'local',
      root: path.join(dataDir, 'uploads'),
    });
  });

  it('reads an S3 configuration', () => {
    expect(storageConfigFromEnv(s3Env, dataDir)).toEqual({
      kind: 's3',
      region: 'us-east-1',
      bucket: 'photos',
      accessKeyId: 'AKID',
      secretAccessKey: 'secret-value-123',
    });
    expect(
      storageConfigFromEnv(
        { ...s3Env, S3_ENDPOINT: 'http://127.0.0.1:9000', S3_REGION: 'eu-west-3', S3_FORCE_PATH_STYLE: 'false' },
        dataDir,
      ),
    ).toEqual({
      kind: 's3',
      endpoint: 'http://127.0.0.1:9000',
      region: 'eu-west-3',
      bucket: 'photos',
      accessKeyId: 'AKID',
      secretAccessKey: 'secret-value-123',
      forcePathStyle: false,
    });
    expect(storageConfigFromEnv({ ...s3Env, S3_ENDPOINT: '', S3_FORCE_PATH_STYLE: '1' }, dataDir)).toMatchObject({
      forcePathStyle: true,
    });
  });

  it('names every missing or bad variable, and never echoes the secret', () => {
    const error = (env: NodeJS.ProcessEnv) => {
      try {
        storageConfigFromEnv(env, dataDir);
      } catch (e) {
        return e as Error;
      }
      throw new Error('expected a ConfigError');
    };
    const missing = error({ STORAGE: 's3', S3_SECRET_ACCESS_KEY: 'secret-value-123' });
    expect(missing).toBeInstanceOf(ConfigError);
    expect(missing.message).toMatch(/S3_BUCKET: required when STORAGE=s3/);
    expect(missing.message).toMatch(/S3_ACCESS_KEY_ID: required when STORAGE=s3/);
    expect(missing.message).not.toMatch(/S3_SECRET_ACCESS_KEY/);
    expect(error({ ...s3Env, S3_BUCKET: '' }).message).toMatch(/S3_BUCKET: required/);
    const bad = error({ ...s3Env, S3_ENDPOINT: 'not a url', S3_FORCE_PATH_STYLE: 'yes' });
    expect(bad.message).toMatch(/S3_ENDPOINT: must be a URL/);
    expect(bad.message).toMatch(/S3_FORCE_PATH_STYLE: must be 1, 0, true or false/);
    expect(bad.message).not.toContain('secret-value-123');
    expect(error({ STORAGE: 'ftp' }).message).toMatch(/STORAGE: must be local, s3 or s3-fake/);
  });

  it('allows the S3 fake in development only', () => {
    expect(storageConfigFromEnv({ STORAGE: 's3-fake' }, dataDir)).toEqual({
      kind: 's3-fake',
      directory: path.join(dataDir, 's3-fake'),
      bucket: 'emberline-dev',
    });
    expect(() => storageConfigFromEnv({ STORAGE: 's3-fake', NODE_ENV: 'production' }, dataDir)).toThrow(
      /STORAGE: s3-fake is for development/,
    );
  });
});

describe('the local S3 fake', () => {
  let fake: LocalS3Fake | undefined;
  afterEach(async () => fake?.stop());

  it('listens on 127.0.0.1 on a free port and keeps data in the directory given', async () => {
    const directory = await fs.mkdtemp(path.join(os.tmpdir(), 'emberline-s3dir-'));
    try {
      fake = await startLocalS3Fake({ bucket: 'kept', directory });
      expect(fake.endpoint).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/);
      const store = new S3FileStore(fake.config);
      await store.put('org/1/a.png', Buffer.from('kept bytes'), 'image/png');
      store.destroy();
      await fake.stop();
      fake = await startLocalS3Fake({ bucket: 'kept', directory });
      const again = new S3FileStore(fake.config);
      expect((await again.get('org/1/a.png'))!.body.toString()).toBe('kept bytes');
      again.destroy();
    } finally {
      await fake?.stop();
      await fs.rm(directory, { recursive: true, force: true });
    }
  });

  it('is what STORAGE=s3-fake opens, and close() stops it', async () => {
    const dataDir = await fs.mkdtemp(path.join(os.tmpdir(), 'emberline-data-'));
    try {
      const opened = await openFileStore(storageConfigFromEnv({ STORAGE: 's3-fake' }, dataDir));
      expect(opened.store.kind).toBe('s3');
      await opened.store.put('org/1/b.png', Buffer.from('b'), 'image/png');
      expect(await opened.store.exists('org/1/b.png')).toBe(true);
      await opened.close();
      await expect(opened.store.exists('org/1/b.png')).rejects.toThrow();
    } finally {
      await fs.rm(dataDir, { recursive: true, force: true });
    }
  });

  it('a store pointed at a missing bucket fails loudly instead of reporting "missing"', async () => {
    fake = await startLocalS3Fake({ bucket: 'present' });
    const store = new S3FileStore({ ...fake.config, bucket: 'absent' });
    try {
      await expect(store.get('org/1/a.png')).rejects.toThrow();
      await expect(store.put('org/1/a.png', Buffer.from('x'), 'image/png')).rejects.toThrow();
    } finally {
      store.destroy();
    }
  });
});
