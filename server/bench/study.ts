/**
 * Import + run + store of a generated 2 000-bus model through the API (in-process server, SQLite in a temp folder).
 * Target (issue): under 10 s. Prints the figures; asserts nothing.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { createApp } from '../app';
import { loadConfig } from '../config';
import { migrate, openDb } from '../db';
import { seedDemo } from '../seed/demo';
import { warmStudyWorker } from '../services/studyWorker';
import { generatedPlant } from '../seed/generatedPlant';

export { generatedPlant } from '../seed/generatedPlant';

/**
 * An in-process server on SQLite in a temporary folder with the demo seeded and the study worker warmed up (as at
 * `npm start`), and the demo engineer's authorization header; `close` waits for its jobs and removes the folder.
 */
export async function benchApp(appOptions: { publicCheckPerMinute?: number } = {}) {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'emberline-bench-'));
  const databaseUrl = `sqlite:${path.join(dir, 'bench.sqlite')}`;
  const config = loadConfig(
    { NODE_ENV: 'test' },
    { databaseUrl, dataDir: dir, jwtSecret: 'bench-secret-bench-secret-bench-secret-1234' },
  );
  const db = await openDb(databaseUrl);
  await migrate(db);
  // As in production: responses are not checked against their schemas (on in tests, where every response is parsed
  // and checked again: for a 5 MB model envelope that alone is about half a second).
  const { app, ctx } = createApp({ config, db, signInLimitPerMinute: 1000, checkResponses: false, ...appOptions });
  const seeded = await seedDemo(ctx, 'bench-password-1');
  await ctx.jobs.idle();
  // As `npm start` does at start: the study worker is started and warmed up before the first run.
  await warmStudyWorker();
  const token = (
    await request(app)
      .post('/api/auth/sign-in')
      .send({ email: 'engineer@larkspur.example', password: 'bench-password-1' })
  ).body.token as string;
  const close = async () => {
    await ctx.jobs.idle();
    await db.close();
    fs.rmSync(dir, { recursive: true, force: true });
  };
  return { app, ctx, seeded, auth: { Authorization: `Bearer ${token}` }, close };
}

export async function benchStudyThroughApi(): Promise<{ name: string; opsPerSecond: number; detail: string }> {
  const { app, seeded, auth, close } = await benchApp();
  const model = generatedPlant();
  const busCount = model.buses!.length;
  const study = await request(app).post(`/api/sites/${seeded.siteId}/studies`).set(auth).send({ title: 'Bench' });
  const t0 = performance.now();
  const imported = await request(app)
    .post(`/api/studies/${study.body.id}/import`)
    .set(auth)
    .attach('files', Buffer.from(JSON.stringify(model)), 'plant.json');
  if (imported.status !== 200) throw new Error(JSON.stringify(imported.body).slice(0, 500));
  const t1 = performance.now();
  await request(app).post(`/api/studies/${study.body.id}/run`).set(auth);
  for (;;) {
    const run = await request(app).get(`/api/studies/${study.body.id}/run`).set(auth);
    if (run.body.status === 'done' || run.body.status === 'failed') {
      if (run.body.status === 'failed') throw new Error(run.body.message);
      break;
    }
    await new Promise((r) => setTimeout(r, 50));
  }
  const t2 = performance.now();
  const results = await request(app).get(`/api/studies/${study.body.id}/results`).set(auth);
  const t3 = performance.now();
  await close();
  const total = (t3 - t0) / 1000;
  return {
    name: `study through the API (${busCount} buses, ${results.body.summary.buses} labelled)`,
    opsPerSecond: busCount / total,
    detail: `import ${((t1 - t0) / 1000).toFixed(2)} s · run and store ${((t2 - t1) / 1000).toFixed(2)} s · read results ${((t3 - t2) / 1000).toFixed(2)} s · total ${total.toFixed(2)} s (target under 10 s)`,
  };
}
