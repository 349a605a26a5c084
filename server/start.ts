import { createServer } from 'node:http';
import { createApp } from './app';
import { buildWeb, webBuildIsStale } from './cli/webBuild';
import { ConfigError, loadConfig } from './config';
import { migrate, openDb } from './db';
import { User } from './db/models';
import { log } from './log';
import { shouldSeedDemo } from './seed/decision';
import { DEMO_USERS, isEmpty, seedDemo } from './seed/demo';
import { addMissingGenericTypesEverywhere } from './services/deviceTypes';
import { failInterruptedJobs, failOwnJobs } from './services/jobs';
import { startReminderScheduler } from './services/reminders';
import { openFileStore, storageConfigFromEnv } from './storage';
import { closeStudyWorkers, warmStudyWorker } from './services/studyWorker';

/**
 * `npm start`: migrate, fail the jobs a stopped server left behind, seed the demo into an empty database (outside
 * production, or with SEED_DEMO=1), build the web app when stale, serve; stop gracefully on SIGTERM/SIGINT.
 */
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
  if (applied.length) log.info(`Migrations applied: ${applied.join(', ')}`);
  const interrupted = await failInterruptedJobs(new Date());
  if (interrupted.runs) log.warn(`${interrupted.runs} interrupted study run(s) marked failed.`);
  if (interrupted.batches) log.warn(`${interrupted.batches} interrupted label print batch(es) marked failed.`);
  const files = await openFileStore(storageConfigFromEnv(process.env, config.dataDir));
  const { app, ctx } = createApp({ config, db, storage: files.store });
  log.info(await ctx.mail.start());
  const empty = await isEmpty();
  if (shouldSeedDemo(config, empty)) {
    await seedDemo(ctx, config.demoPassword);
    log.info('Seeded the invented demo organization, its site and an approved study.');
  }
  const genericAdded = await addMissingGenericTypesEverywhere(ctx);
  if (genericAdded)
    log.info(`${genericAdded} generic device type(s) of the starter set added to the device libraries.`);
  const demoPresent = (await User.count({ where: { email: DEMO_USERS.map((u) => u.email) } })) > 0;
  const noUsers = (await User.count()) === 0;
  if (process.env.SKIP_WEB_BUILD !== '1' && webBuildIsStale(process.cwd(), config.webDir))
    buildWeb(process.cwd(), config.webDir);
  // The daily reminders: checked every 5 minutes; each rule goes out once a day after the organization's hour.
  const reminders = startReminderScheduler(ctx);
  const server = createServer(app);
  // The study worker's engine is loaded and compiled now, off the request thread, rather than by the first run.
  void warmStudyWorker();
  server.listen(config.port, config.host, () => {
    console.log(`\nEmberline is serving http://localhost:${config.port}`);
    if (demoPresent) {
      console.log(`Demo accounts (password: ${config.demoPassword}):`);
      for (const u of DEMO_USERS) console.log(`  ${u.role.padEnd(12)} ${u.email}`);
    } else if (noUsers) {
      console.log('No accounts yet. Create the organization and its first admin:');
      console.log('  npm run create-admin -- --org "Organization name" --email admin@example.net --name "Full Name"');
    }
  });

  /**
   * Graceful stop: no new connections; running jobs are asked to stop (a study run fails at its next step, a print
   * batch not yet started fails) and waited for; requests in flight finish; idle keep-alive sockets are closed. Exit 0
   * when everything drained within SHUTDOWN_TIMEOUT_MS; else the unfinished jobs are marked failed, the remaining
   * sockets cut, and the exit code is 1. A second signal exits at once.
   */
  let stopping = false;
  const stop = (signal: NodeJS.Signals): void => {
    if (stopping) {
      log.warn(`${signal} again: exiting without waiting`);
      process.exit(1);
    }
    stopping = true;
    const started = Date.now();
    const deadline = started + config.shutdownTimeoutMs;
    log.info({ signal, timeoutMs: config.shutdownTimeoutMs }, `${signal}: stopping`);
    const closed = new Promise<void>((resolve) => server.close(() => resolve()));
    server.closeIdleConnections();
    // Sockets of finished requests become idle while the others drain: close them as they do.
    const sweep = setInterval(() => server.closeIdleConnections(), 100);
    const remaining = () => Math.max(0, deadline - Date.now());
    // Whatever hangs while closing (a database, the mailer), the process does not outlive its deadline by much.
    setTimeout(() => process.exit(1), config.shutdownTimeoutMs + 5_000).unref();
    void (async () => {
      let drained = true;
      const timedOut = new Promise<false>((resolve) => setTimeout(() => resolve(false), remaining()).unref());
      drained = (await Promise.race([closed.then(() => true as const), timedOut])) && drained;
      drained = (await ctx.jobs.drain(remaining())) && drained;
      drained = (await Promise.race([reminders.stop().then(() => true as const), timedOut])) && drained;
      clearInterval(sweep);
      if (!drained) {
        const failed = await failOwnJobs(ctx.jobs, new Date()).catch((err: unknown) => {
          log.error({ err }, 'could not mark the unfinished jobs failed');
          return 0;
        });
        log.error(
          { failedJobs: failed, openJobs: ctx.jobs.size },
          `Shutdown timed out after ${config.shutdownTimeoutMs} ms; ${failed} unfinished job(s) marked failed`,
        );
      }
      server.closeAllConnections();
      await closeStudyWorkers();
      await ctx.mail.close().catch((err: unknown) => log.error({ err }, 'closing the mailer failed'));
      await Promise.all([db.close(), files.close()]).catch((err: unknown) => log.error({ err }, 'closing failed'));
      log.info(`Stopped in ${Date.now() - started} ms${drained ? '' : ' (timed out)'}`);
      process.exit(drained ? 0 : 1);
    })();
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

void main().catch((e: unknown) => {
  log.fatal({ err: e }, 'the server could not start');
  console.error(e);
  process.exit(1);
});
