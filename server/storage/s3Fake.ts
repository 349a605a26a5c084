import { promises as fs } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { S3StoreOptions } from './s3Store';

/** The part of s3rver's API used here (the package ships no typings). */
interface S3rverInstance {
  run(): Promise<{ address: string; port: number }>;
  close(): Promise<void>;
}
type S3rverConstructor = new (options: {
  address: string;
  port: number;
  silent: boolean;
  directory: string;
  configureBuckets: { name: string }[];
}) => S3rverInstance;

/** s3rver accepts signed requests with these credentials. */
const FAKE_ACCESS_KEY = 'S3RVER';

export interface LocalS3Fake {
  /** `http://127.0.0.1:<port>` */
  endpoint: string;
  /** Everything an `S3FileStore` needs to talk to the fake. */
  config: S3StoreOptions & { endpoint: string };
  stop(): Promise<void>;
}

/**
 * Starts a local S3 fake (s3rver, a dev dependency) on 127.0.0.1, on a free port unless `port` is given, with
 * `bucket` created. Without `directory` its data goes to a fresh temporary directory that `stop()` removes.
 * For tests and for development (`STORAGE=s3-fake`); never for production.
 */
export async function startLocalS3Fake(opts: {
  port?: number;
  directory?: string;
  bucket: string;
}): Promise<LocalS3Fake> {
  // Loaded here, not at the top, so production installs without dev dependencies still load the storage module.
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  const S3rver = require('s3rver') as S3rverConstructor;
  const ownDirectory = opts.directory === undefined;
  const directory = opts.directory ?? (await fs.mkdtemp(path.join(os.tmpdir(), 'emberline-s3-')));
  if (!ownDirectory) await fs.mkdir(directory, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port: opts.port ?? 0,
    silent: true,
    directory,
    configureBuckets: [{ name: opts.bucket }],
  });
  let address: { port: number };
  try {
    address = await server.run();
  } catch (err) {
    if (ownDirectory) await fs.rm(directory, { recursive: true, force: true });
    throw err;
  }
  const endpoint = `http://127.0.0.1:${address.port}`;
  let stopped = false;
  return {
    endpoint,
    config: {
      endpoint,
      region: 'us-east-1',
      bucket: opts.bucket,
      accessKeyId: FAKE_ACCESS_KEY,
      secretAccessKey: FAKE_ACCESS_KEY,
      forcePathStyle: true,
    },
    async stop() {
      if (stopped) return;
      stopped = true;
      await server.close();
      if (ownDirectory) await fs.rm(directory, { recursive: true, force: true });
    },
  };
}
