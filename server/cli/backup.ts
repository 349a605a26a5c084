/**
 * `npm run backup`: an online backup of the configured SQLite database with `VACUUM INTO`, written to
 * DATA_DIR/backups/emberline-<timestamp>.sqlite. Safe while the server runs (SQLite copies one consistent snapshot).
 * PostgreSQL is refused: back it up with pg_dump.
 */
import fs from 'node:fs';
import path from 'node:path';
import { ConfigError, loadConfig } from '../config';
import { openDb } from '../db';

/** 2026-12-02T03:04:05.678Z → 20261202-030405Z (sortable, no characters a file system dislikes). */
export function backupTimestamp(d: Date): string {
  return d
    .toISOString()
    .replace(/\.\d+Z$/, 'Z')
    .replace(/[-:]/g, '')
    .replace('T', '-');
}

function fail(message: string, code = 1): never {
  console.error(message);
  process.exit(code);
}

async function main(): Promise<void> {
  let config;
  try {
    config = loadConfig();
  } catch (e) {
    if (e instanceof ConfigError) fail(e.message, 2);
    throw e;
  }
  const url = config.databaseUrl;
  if (!url.startsWith('sqlite:')) {
    fail(
      'The configured database is not SQLite (DATABASE_URL is set to a PostgreSQL URL). This command backs up SQLite only;\n' +
        'back up PostgreSQL with its own tools, for example:\n  pg_dump --format=custom --file=emberline.dump "$DATABASE_URL"',
    );
  }
  const storage = url.slice('sqlite:'.length);
  if (!storage || storage === ':memory:')
    fail('The configured database is in memory; there is nothing on disk to back up.');
  const source = path.resolve(storage);
  // Opening a missing file would create an empty database: refuse instead.
  if (!fs.existsSync(source)) fail(`No database at ${source} (check DATA_DIR / DATABASE_URL).`);

  const dir = path.join(config.dataDir, 'backups');
  fs.mkdirSync(dir, { recursive: true });
  const target = path.resolve(dir, `emberline-${backupTimestamp(new Date())}.sqlite`);
  if (fs.existsSync(target)) fail(`${target} already exists; try again in a second.`);

  const db = await openDb(url);
  try {
    // VACUUM INTO takes a string literal, not a bound parameter: quote it as SQL does (' → '').
    await db.sequelize.query(`VACUUM INTO '${target.replace(/'/g, "''")}'`);
  } finally {
    await db.close();
  }
  const bytes = fs.statSync(target).size;
  console.log(`Backup written: ${target}`);
  console.log(`Size: ${bytes} bytes (${(bytes / 1024 / 1024).toFixed(2)} MiB)`);
}

void main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
