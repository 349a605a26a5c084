import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { z } from 'zod';

/** Server configuration, parsed once at start from the environment. Bad config refuses to start. */
const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: z.coerce.number().int().min(1).max(65535).default(8080),
  HOST: z.string().default('0.0.0.0'),
  DATA_DIR: z.string().default(path.resolve(process.cwd(), 'data')),
  DATABASE_URL: z.string().optional(),
  JWT_SECRET: z.string().min(32, 'JWT_SECRET must be at least 32 characters').optional(),
  JWT_TTL_HOURS: z.coerce.number().positive().max(12, 'JWT_TTL_HOURS must be at most 12').default(8),
  JSON_LIMIT: z.string().default('2mb'),
  WEB_DIR: z.string().default(path.resolve(process.cwd(), 'dist/web')),
  PUBLIC_BASE_URL: z.string().url().optional(),
  DEMO_PASSWORD: z.string().min(10).default('ember-demo-2026'),
  LOG_REQUESTS: z.enum(['0', '1']).default('0'),
});

export interface Config {
  env: 'development' | 'production' | 'test';
  port: number;
  host: string;
  dataDir: string;
  databaseUrl: string;
  jwtSecret: string;
  jwtTtlHours: number;
  jsonLimit: string;
  webDir: string;
  publicBaseUrl: string;
  demoPassword: string;
  logRequests: boolean;
}

export class ConfigError extends Error {}

/** Reads a dev secret from data/, generating it once. Never committed (data/ is gitignored). */
function devSecret(dataDir: string): string {
  const file = path.join(dataDir, 'jwt-secret');
  if (fs.existsSync(file)) return fs.readFileSync(file, 'utf8').trim();
  fs.mkdirSync(dataDir, { recursive: true });
  const secret = randomBytes(48).toString('base64url');
  fs.writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}

export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: Partial<Config> = {}): Config {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new ConfigError(`Invalid configuration:\n${lines.join('\n')}`);
  }
  const e = parsed.data;
  if (e.NODE_ENV === 'production' && !e.JWT_SECRET && !overrides.jwtSecret) {
    throw new ConfigError('Invalid configuration:\n  JWT_SECRET: required in production');
  }
  const dataDir = overrides.dataDir ?? e.DATA_DIR;
  const databaseUrl = overrides.databaseUrl ?? e.DATABASE_URL ?? `sqlite:${path.join(dataDir, 'emberline.sqlite')}`;
  return {
    env: e.NODE_ENV,
    port: e.PORT,
    host: e.HOST,
    dataDir,
    databaseUrl,
    jwtSecret: overrides.jwtSecret ?? e.JWT_SECRET ?? devSecret(dataDir),
    jwtTtlHours: e.JWT_TTL_HOURS,
    jsonLimit: e.JSON_LIMIT,
    webDir: e.WEB_DIR,
    publicBaseUrl: e.PUBLIC_BASE_URL ?? `http://localhost:${e.PORT}`,
    demoPassword: e.DEMO_PASSWORD,
    logRequests: e.LOG_REQUESTS === '1',
    ...overrides,
  };
}
