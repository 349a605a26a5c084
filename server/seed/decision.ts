import type { Config } from '../config';

/**
 * Whether `npm start` seeds the invented demo organization. Never into a database that has an organization. Into an
 * empty one: when SEED_DEMO=1 asks for it (even in production), never when SEED_DEMO=0, and otherwise only outside
 * production — a production server must not start with accounts whose password is published.
 */
export function shouldSeedDemo(config: Pick<Config, 'env' | 'seedDemo'>, databaseIsEmpty: boolean): boolean {
  if (!databaseIsEmpty) return false;
  if (config.seedDemo === '1') return true;
  if (config.seedDemo === '0') return false;
  return config.env !== 'production';
}
