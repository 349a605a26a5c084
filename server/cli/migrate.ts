import { loadConfig } from '../config';
import { migrate, openDb } from '../db';

void (async () => {
  const config = loadConfig();
  const db = await openDb(config.databaseUrl);
  const applied = await migrate(db);
  console.log(applied.length ? `Applied: ${applied.join(', ')}` : 'Database is up to date.');
  await db.close();
})();
