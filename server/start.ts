import { createServer } from 'node:http';
import { createApp } from './app';
import { buildWeb, webBuildIsStale } from './cli/webBuild';
import { ConfigError, loadConfig } from './config';
import { migrate, openDb } from './db';
import { DEMO_USERS, isEmpty, seedDemo } from './seed/demo';
import { startReminderScheduler } from './services/reminders';
import { failInterruptedRuns } from './services/runs';
import { openFileStore, storageConfigFromEnv } from './storage';

/** `npm start`: migrate, seed the demo when the database is empty, build the web app when stale, serve. */
async function main(): Promise<void> {
  let config;
  try {
    config = loadConfig();
  } catch (e) {
    if (e instanceof ConfigError) {
      console.error(e.message);
      process.exit(2);
    }
    throw e;
  }
  const db = await openDb(config.databaseUrl);
  const applied = await migrate(db);
  if (applied.length) console.log(`Migrations applied: ${applied.join(', ')}`);
  const interrupted = await failInterruptedRuns(new Date());
  if (interrupted) console.log(`${interrupted} interrupted study run(s) marked failed.`);
  const files = await openFileStore(storageConfigFromEnv(process.env, config.dataDir));
  const { app, ctx } = createApp({ config, db, storage: files.store });
  console.log(await ctx.mail.start());
  if (await isEmpty()) {
    await seedDemo(ctx, config.demoPassword);
    console.log('Seeded the invented demo organization, its site and an approved study.');
  }
  if (process.env.SKIP_WEB_BUILD !== '1' && webBuildIsStale(process.cwd(), config.webDir))
    buildWeb(process.cwd(), config.webDir);
  // The daily reminders: checked every 5 minutes; each rule goes out once a day after the organization's hour.
  const reminders = startReminderScheduler(ctx);
  const server = createServer(app);
  server.listen(config.port, config.host, () => {
    console.log(`\nEmberline is serving http://localhost:${config.port}`);
    console.log(`Demo accounts (password: ${config.demoPassword}):`);
    for (const u of DEMO_USERS) console.log(`  ${u.role.padEnd(12)} ${u.email}`);
  });
  const stop = (): void => {
    server.close(
      () =>
        void reminders
          .stop()
          .then(() => ctx.mail.close())
          .then(() => Promise.all([db.close(), files.close()]))
          .then(() => process.exit(0)),
    );
    setTimeout(() => process.exit(0), 3000).unref();
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

void main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
