import fs from 'node:fs';
import path from 'node:path';
import { Sequelize, Transaction } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';
import * as m001 from './migrations/001-initial';
import * as m002 from './migrations/002-device-types';
import * as m003 from './migrations/003-studies';
import * as m004 from './migrations/004-labels';
import * as m005 from './migrations/005-attention-mail';
import * as m006 from './migrations/006-audit-append-only';
import * as m007 from './migrations/007-reminder-approvals';
import * as m008 from './migrations/008-label-settings';
import * as m009 from './migrations/009-study-run-dto-index';
import * as m010 from './migrations/010-generic-library';
import * as m011 from './migrations/011-user-units';
import { initModels } from './models';
import { serializeSqliteWrites, type WriteQueue } from './writeQueue';

/** Migrations in order. Add new ones at the end; never edit one that has shipped. */
const MIGRATIONS = [
  { name: '001-initial', ...m001 },
  { name: '002-device-types', ...m002 },
  { name: '003-studies', ...m003 },
  { name: '004-labels', ...m004 },
  { name: '005-attention-mail', ...m005 },
  { name: '006-audit-append-only', ...m006 },
  { name: '007-reminder-approvals', ...m007 },
  { name: '008-label-settings', ...m008 },
  { name: '009-study-run-dto-index', ...m009 },
  { name: '010-generic-library', ...m010 },
  { name: '011-user-units', ...m011 },
];

export interface Db {
  sequelize: Sequelize;
  dialect: 'sqlite' | 'postgres';
  /** SQLite only: the queue every write waits in (PostgreSQL handles concurrent writers itself). */
  writeQueue?: WriteQueue;
  close(): Promise<void>;
}

/** Opens the database (SQLite by default, PostgreSQL through a postgres:// URL), applies pragmas and models. */
export async function openDb(databaseUrl: string): Promise<Db> {
  const isSqlite = databaseUrl.startsWith('sqlite:');
  let sequelize: Sequelize;
  let writeQueue: WriteQueue | undefined;
  if (isSqlite) {
    const storage = databaseUrl.slice('sqlite:'.length) || ':memory:';
    if (storage !== ':memory:') fs.mkdirSync(path.dirname(path.resolve(storage)), { recursive: true });
    // IMMEDIATE: a transaction takes the write lock when it begins, so two overlapping read-then-write transactions
    // wait for each other (busy timeout) instead of one failing when it tries to upgrade its lock.
    sequelize = new Sequelize({
      dialect: 'sqlite',
      storage,
      logging: false,
      pool: { max: 1, min: 0 },
      transactionType: Transaction.TYPES.IMMEDIATE,
    });
    configureEachSqliteConnection(sequelize);
    // One writer at a time: overlapping writers wait in order in the process instead of spinning on the lock.
    writeQueue = serializeSqliteWrites(sequelize);
    await sequelize.query('PRAGMA foreign_keys = ON');
    if (storage !== ':memory:') await sequelize.query('PRAGMA journal_mode = WAL');
    await sequelize.query('PRAGMA busy_timeout = 5000');
    await sequelize.query('PRAGMA synchronous = NORMAL');
  } else {
    sequelize = new Sequelize(databaseUrl, { logging: false, pool: { max: 10 } });
  }
  initModels(sequelize);
  return {
    sequelize,
    dialect: isSqlite ? 'sqlite' : 'postgres',
    writeQueue,
    close: () => sequelize.close(),
  };
}

/** The busy timeout is per connection, and the SQLite dialect opens one connection per transaction on a file. */
function configureEachSqliteConnection(sequelize: Sequelize): void {
  type SqliteConnection = { configure(option: 'busyTimeout', ms: number): void };
  const cm = sequelize.connectionManager as unknown as { getConnection(options?: unknown): Promise<SqliteConnection> };
  const getConnection = cm.getConnection.bind(cm);
  const configured = new WeakSet<SqliteConnection>();
  cm.getConnection = async (options?: unknown) => {
    const connection = await getConnection(options);
    if (!configured.has(connection)) {
      connection.configure('busyTimeout', 5000);
      configured.add(connection);
    }
    return connection;
  };
}

export function migrator(sequelize: Sequelize): Umzug<ReturnType<Sequelize['getQueryInterface']>> {
  return new Umzug({
    migrations: MIGRATIONS.map((mig) => ({
      name: mig.name,
      up: ({ context }) => mig.up({ context }),
      down: ({ context }) => mig.down({ context }),
    })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}

export async function migrate(db: Db): Promise<string[]> {
  const done = await migrator(db.sequelize).up();
  return done.map((d) => d.name);
}
