import path from 'node:path';
import { z } from 'zod';
import { ConfigError } from '../config';
import { LocalFileStore } from './localStore';
import { startLocalS3Fake } from './s3Fake';
import { S3FileStore } from './s3Store';
import type { FileStore } from './types';

export type { FileStore, StoredFile } from './types';
export { FileKeyError, assertValidKey, isValidFileKey, fileKeyProblem, makeFileKey } from './keys';
export { LocalFileStore } from './localStore';
export { S3FileStore, type S3StoreOptions } from './s3Store';
export { startLocalS3Fake, type LocalS3Fake } from './s3Fake';

export interface LocalStorageConfig {
  kind: 'local';
  root: string;
}
export interface S3StorageConfig {
  kind: 's3';
  endpoint?: string;
  region: string;
  bucket: string;
  accessKeyId: string;
  secretAccessKey: string;
  forcePathStyle?: boolean;
}
export type StorageConfig = LocalStorageConfig | S3StorageConfig;

/** Development only: an S3 fake started in-process, its data under `directory`. */
export interface S3FakeStorageConfig {
  kind: 's3-fake';
  directory: string;
  bucket: string;
}
/** What `storageConfigFromEnv` gives: a store config, or (development) the S3 fake; open it with `openFileStore`. */
export type StorageSetting = StorageConfig | S3FakeStorageConfig;

export function createFileStore(config: StorageConfig): FileStore {
  switch (config.kind) {
    case 'local':
      return new LocalFileStore(config.root);
    case 's3':
      return new S3FileStore(config);
  }
}

/** Opens any setting, starting the S3 fake for `s3-fake`; `close()` stops what was started. */
export async function openFileStore(setting: StorageSetting): Promise<{ store: FileStore; close(): Promise<void> }> {
  if (setting.kind !== 's3-fake') {
    const store = createFileStore(setting);
    return { store, close: async () => (store instanceof S3FileStore ? store.destroy() : undefined) };
  }
  const fake = await startLocalS3Fake({ directory: setting.directory, bucket: setting.bucket });
  const store = new S3FileStore(fake.config);
  return {
    store,
    async close() {
      store.destroy();
      await fake.stop();
    },
  };
}

/** Unset and empty are the same (`S3_ENDPOINT=` in an env file means "not set"). */
const optional = (schema: z.ZodString) => z.preprocess((v) => (v === '' ? undefined : v), schema.optional());
const required = z.preprocess((v) => (v === '' ? undefined : v), z.string({ error: 'required when STORAGE=s3' }));

const baseSchema = z.object({
  NODE_ENV: z.string().optional(),
  STORAGE: z.preprocess(
    (v) => (v === '' ? undefined : v),
    z.enum(['local', 's3', 's3-fake'], { error: 'must be local, s3 or s3-fake' }).default('local'),
  ),
});

const s3Schema = z.object({
  S3_ENDPOINT: optional(z.string().url('must be a URL such as https://s3.example.net')),
  S3_REGION: z.preprocess((v) => (v === '' ? undefined : v), z.string().min(1).default('us-east-1')),
  S3_BUCKET: required,
  S3_ACCESS_KEY_ID: required,
  S3_SECRET_ACCESS_KEY: required,
  S3_FORCE_PATH_STYLE: z.preprocess(
    (v) => (v === '' ? undefined : typeof v === 'string' ? v.toLowerCase() : v),
    z.enum(['1', '0', 'true', 'false'], { error: 'must be 1, 0, true or false' }).optional(),
  ),
});

function fail(issues: z.core.$ZodIssue[]): never {
  const lines = issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
  throw new ConfigError(`Invalid configuration:\n${lines.join('\n')}`);
}

/**
 * Storage settings from the environment (values are never echoed in errors):
 * - `STORAGE=local` (default): files under `<dataDir>/uploads`.
 * - `STORAGE=s3`: `S3_BUCKET`, `S3_ACCESS_KEY_ID`, `S3_SECRET_ACCESS_KEY` required; `S3_REGION` (default us-east-1);
 *   `S3_ENDPOINT` for S3-compatible services; `S3_FORCE_PATH_STYLE` (1/0, default 1 when S3_ENDPOINT is set).
 * - `STORAGE=s3-fake` (not in production): a local S3 fake with its data under `<dataDir>/s3-fake`,
 *   bucket `S3_BUCKET` or `emberline-dev`.
 * Throws a ConfigError naming each bad variable.
 */
export function storageConfigFromEnv(env: NodeJS.ProcessEnv, dataDir: string): StorageSetting {
  const base = baseSchema.safeParse(env);
  if (!base.success) fail(base.error.issues);
  const { STORAGE: kind, NODE_ENV } = base.data;
  if (kind === 'local') return { kind: 'local', root: path.join(dataDir, 'uploads') };
  if (kind === 's3-fake') {
    if (NODE_ENV === 'production')
      throw new ConfigError('Invalid configuration:\n  STORAGE: s3-fake is for development; use s3 in production');
    return { kind: 's3-fake', directory: path.join(dataDir, 's3-fake'), bucket: env.S3_BUCKET || 'emberline-dev' };
  }
  const parsed = s3Schema.safeParse(env);
  if (!parsed.success) fail(parsed.error.issues);
  const e = parsed.data;
  const config: S3StorageConfig = {
    kind: 's3',
    region: e.S3_REGION,
    bucket: e.S3_BUCKET,
    accessKeyId: e.S3_ACCESS_KEY_ID,
    secretAccessKey: e.S3_SECRET_ACCESS_KEY,
  };
  if (e.S3_ENDPOINT) config.endpoint = e.S3_ENDPOINT;
  if (e.S3_FORCE_PATH_STYLE) config.forcePathStyle = e.S3_FORCE_PATH_STYLE === '1' || e.S3_FORCE_PATH_STYLE === 'true';
  return config;
}
