import type { Config } from '../config';
import type { Db } from '../db';
import type { Role } from '../../shared/schemas/common';

/** Everything a service needs, created once by createApp and passed down (no globals). */
export interface AppContext {
  config: Config;
  db: Db;
  /** Injected clock, so tests can move time. */
  now: () => Date;
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
