/**
 * Import + run + store of a generated 2 000-bus model through the API (in-process server, SQLite in a temp folder).
 * Target (issue): under 10 s. Prints the figures; asserts nothing.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import type { ModelInput } from '../../shared/schemas/model';
import { createApp } from '../app';
import { loadConfig } from '../config';
import { migrate, openDb } from '../db';
import { seedDemo } from '../seed/demo';
import { warmStudyWorker } from '../services/studyWorker';

/** Utility → 12.47 kV bus → 20 unit substations (480 V) → each feeds 99 MCC buses by cable; every 480 V bus labelled. */
export function generatedPlant(substations = 20, perSubstation = 99): ModelInput {
  const buses: NonNullable<ModelInput['buses']> = [{ id: 'HV', name: 'Service', nominalKv: 12.47 }];
  const transformers: NonNullable<ModelInput['transformers']> = [];
  const cables: NonNullable<ModelInput['cables']> = [];
  const devices: NonNullable<ModelInput['devices']> = [];
  const tm = {
    kind: 'thermal-magnetic' as const,
    ratingA: 225,
    thermal: {
      min: [
        [1.35, 250],
        [3, 9],
        [8, 0.9],
      ] as [number, number][],
      max: [
        [1.35, 1400],
        [3, 38],
        [8, 4],
      ] as [number, number][],
    },
    instantaneous: { pickupMultiple: 10, tolerancePct: 20 },
    instantaneousClearingCycles: 1.5,
  };
  for (let s = 0; s < substations; s++) {
    const sub = `SUB-${s}`;
    buses.push({ id: sub, name: `Substation ${s}`, nominalKv: 0.48, equipment: { class: 'switchgear-lv' } });
    transformers.push({
      id: `TX-${s}`,
      fromBus: 'HV',
      toBus: sub,
      kva: 1500,
      primaryKv: 12.47,
      secondaryKv: 0.48,
      impedancePct: 5.75,
      xr: 6,
    });
    devices.push({
      id: `M-${s}`,
      branch: `TX-${s}`,
      end: 'to',
      device: {
        kind: 'electronic',
        sensorA: 2000,
        longTime: { pickup: 1, delayS: 10 },
        shortTime: { pickup: 4, delayS: 0.3, i2t: false },
        pickupTolerancePct: 10,
        clearingS: 0.05,
      },
    });
    for (let i = 0; i < perSubstation; i++) {
      const id = `MCC-${s}-${i}`;
      buses.push({ id, name: `MCC ${s}.${i}`, nominalKv: 0.48, equipment: { class: 'mcc-panelboard-lv-deep' } });
      cables.push({
        id: `F-${s}-${i}`,
        fromBus: sub,
        toBus: id,
        lengthM: 20 + (i % 40) * 3,
        sets: 1,
        size: '4/0',
        material: 'Cu',
        conduit: 'steel',
      });
      devices.push({ id: `CB-${s}-${i}`, branch: `F-${s}-${i}`, end: 'from', device: tm });
    }
  }
  return {
    format: 'emberline-model',
    version: 1,
    name: 'Generated plant',
    frequencyHz: 60,
    buses,
    sources: [{ id: 'UTIL', kind: 'utility', bus: 'HV', shortCircuitMva: 500, xr: 15 }],
    transformers,
    cables,
    devices,
  } as ModelInput;
}

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
  const { app, ctx } = createApp({ config, db, signInLimitPerMinute: 1000, ...appOptions });
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
