import type { Config } from '../config';
import type { Db } from '../db';
import type { Role } from '../../shared/schemas/common';
import type { Jobs } from '../services/jobs';

/** Everything a service needs, created once by createApp and passed down (no globals). */
export interface AppContext {
  config: Config;
  db: Db;
  /** Injected clock, so tests can move time. */
  now: () => Date;
  /** Background jobs (study runs). */
  jobs: Jobs;
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
