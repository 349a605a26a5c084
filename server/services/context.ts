import type { Config } from '../config';
import type { Db } from '../db';
import type { Role } from '../../shared/schemas/common';
import type { Mailer } from '../mail/types';
import type { Jobs } from './jobs';
import type { FileStore } from '../storage';

/** Everything a service needs, created once by createApp and passed down (no globals). */
export interface AppContext {
  config: Config;
  db: Db;
  /** Injected clock, so tests can move time. */
  now: () => Date;
  /** Background jobs (study runs, label batches). */
  jobs: Jobs;
  /** Uploaded photos and generated files: local disk or S3-compatible. */
  storage: FileStore;
  /** Outgoing mail: SMTP (SMTP_URL) or the local sink that files messages in the outbox. */
  mail: Mailer;
}

export interface AuthUser {
  id: string;
  organizationId: string;
  role: Role;
  email: string;
  name: string;
  jti: string;
  tokenExpiresAt: Date;
}
