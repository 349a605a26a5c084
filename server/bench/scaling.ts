/**
 * How the study engine scales: generated radial plants of 1 000, 10 000 and 50 000 buses and a 2 000-bus looped mesh,
 * each run whole as a study worker runs it (short circuit, then every labelled bus with its trace, serialized to the
 * stored JSON text). For each: run time, time per bus, the
 * process's peak resident memory so far, and the same physics in a tight loop (bolted current, arcing currents, the
 * first device on the path to clear, energy of both cases, line side without the main; no time stepping, no trace)
 * for the ratio. Prints the figures; asserts nothing.
 */
import request from 'supertest';
import type { Device } from '../../shared/schemas/device';
import { Label } from '../db/models';
import { parseModel, type Model, type ModelInput } from '../../shared/schemas/model';
import { computeArcingCurrents, computeCaseEnergy, resolveEnclosure } from '../engine/ieee1584/compute';
import { createShortCircuitSolver } from '../engine/shortcircuit';
import { resolveEquipment, runAllBuses } from '../engine/study';
import { clearingTime } from '../engine/trip';
import { benchApp, generatedPlant } from './study';

/** A radial plant of about `buses` buses: substations of 100 buses (the unit substation and 99 panels). */
export function radialPlant(buses: number): ModelInput {
  const subs = Math.max(1, Math.round(buses / 100));
  return generatedPlant(subs, Math.round(buses / subs) - 1);
}

/** The radial plant with every tenth panel tied by cable to the same panel of the next substation: a looped mesh. */
export function loopedMesh(buses: number): ModelInput {
  const m = radialPlant(buses);
  const subs = Math.max(1, Math.round(buses / 100));
  const per = Math.round(buses / subs) - 1;
  for (let s = 0; s + 1 < subs; s++) {
    for (let i = 0; i < per; i += 10) {
      m.cables!.push({
        id: `TIE-${s}-${i}`,
        fromBus: `MCC-${s}-${i}`,
        toBus: `MCC-${s + 1}-${i}`,
        lengthM: 60,
        sets: 1,
        size: '4/0',
        material: 'Cu',
        conduit: 'steel',
      });
    }
  }
  return m;
}

const parsed = (input: ModelInput): Model => {
  const p = parseModel(input);
  if (!p.success) throw new Error(JSON.stringify(p.issues.slice(0, 3)));
  return p.model;
};

/**
 * The engine's run as a study worker computes it (`runAllBuses`: short circuit, every labelled bus, the results
 * serialized to the JSON text that is stored): seconds.
 */
function engineRun(model: Model): { seconds: number; buses: number } {
  const t0 = performance.now();
  const outcome = runAllBuses(model, {}, () => undefined);
  return { seconds: (performance.now() - t0) / 1000, buses: outcome.buses };
}

/** The same physics without time stepping or trace: the floor the engine is compared with. */
function tightLoop(model: Model): number {
  const t0 = performance.now();
  const solver = createShortCircuitSolver(model);
  const devicesOn = new Map<string, Device[]>();
  for (const d of model.devices) {
    const key = d.branch ?? d.source;
    if (key) devicesOn.set(key, [...(devicesOn.get(key) ?? []), d.device as Device]);
  }
  const byId = new Map(model.buses.map((b) => [b.id, b]));
  let sink = 0;
  for (const busId of solver.busIds) {
    const bus = byId.get(busId)!;
    if (!bus.equipment) continue;
    const fault = solver.faultPath(busId);
    const eq = resolveEquipment(bus);
    const arcing = computeArcingCurrents({
      voltageV: bus.nominalKv * 1000,
      boltedFaultKa: fault.boltedFaultKa,
      electrodeConfig: eq.electrodeConfig,
      gapMm: eq.gapMm,
    });
    const cf = resolveEnclosure(arcing, eq.enclosureMm ?? undefined).enclosureCorrectionFactor;
    for (const arcCase of ['full', 'reduced'] as const) {
      const scale = arcing.arcingCurrentKa[arcCase] / fault.boltedFaultKa;
      const times: number[] = [];
      for (const b of fault.branches) {
        if (b.direction === 'none') continue;
        for (const device of devicesOn.get(b.id) ?? []) {
          const t = clearingTime(device, b.toCurrentA * scale).clearingTimeS;
          if (t !== null) times.push(t);
        }
      }
      times.sort((a, b) => a - b);
      // Load side: the first to clear; line side: the next one up (the main excluded).
      for (const t of [times[0] ?? 2, times[1] ?? 2]) {
        sink += computeCaseEnergy(
          arcing,
          arcCase,
          cf,
          Math.min(t, 2) * 1000,
          eq.workingDistanceMm,
        ).incidentEnergyJPerCm2;
      }
    }
  }
  if (!Number.isFinite(sink)) throw new Error('non-finite energy');
  return (performance.now() - t0) / 1000;
}

export async function benchScaling(): Promise<{ name: string; opsPerSecond: number; detail: string }> {
  const rows: string[] = [];
  let totalBuses = 0;
  let totalSeconds = 0;
  const cases: [string, () => ModelInput][] = [
    ['radial 1 000', () => radialPlant(1000)],
    ['radial 10 000', () => radialPlant(10000)],
    ['radial 50 000', () => radialPlant(50000)],
    // Last: its traces are large (every feeder carries some current for every fault), so its peak does not hide the others'.
    ['looped mesh 2 000', () => loopedMesh(2000)],
  ];
  rows.push('plant              | buses  | run (s) | per bus (µs) | peak RSS (MB) | tight loop (s) | ratio');
  for (const [name, make] of cases) {
    const model = parsed(make());
    const run = engineRun(model);
    const peakMb = process.resourceUsage().maxRSS / 1024;
    const tight = tightLoop(model);
    totalBuses += model.buses.length;
    totalSeconds += run.seconds;
    rows.push(
      `${name.padEnd(18)} | ${String(model.buses.length).padStart(6)} | ${run.seconds.toFixed(2).padStart(7)} | ` +
        `${((run.seconds * 1e6) / model.buses.length).toFixed(0).padStart(12)} | ${peakMb.toFixed(0).padStart(13)} | ` +
        `${tight.toFixed(3).padStart(14)} | ${(run.seconds / tight).toFixed(1)}`,
    );
  }
  return {
    name: 'study engine scaling (generated plants, every 480 V bus labelled)',
    opsPerSecond: totalBuses / totalSeconds,
    detail: rows.join('\n'),
  };
}

/**
 * A 10 000-bus radial plant through the API (in-process server, SQLite in a temp folder): import, run and store, and
 * while the run is in progress the health check and the public label check are timed every 50 ms (slowest answer).
 */
export async function benchStudyApi10k(): Promise<{ name: string; opsPerSecond: number; detail: string }> {
  const { app, seeded, auth, close } = await benchApp({ publicCheckPerMinute: 100000 });
  const labelCode = (await Label.findOne())?.code ?? 'NO-LABEL';
  // A listening server, so the probes are real requests on the same event loop as the run's bookkeeping.
  const server = app.listen(0);
  const base = `http://127.0.0.1:${(server.address() as { port: number }).port}`;
  const model = radialPlant(10000);
  const study = await request(app).post(`/api/sites/${seeded.siteId}/studies`).set(auth).send({ title: 'Bench 10k' });
  const t0 = performance.now();
  // CPU time of the whole process (every thread: the server, the study worker, the probes): steadier than the wall
  // time on a machine shared with other work.
  const c0 = process.cpuUsage();
  const imported = await request(app)
    .post(`/api/studies/${study.body.id}/import`)
    .set(auth)
    .attach('files', Buffer.from(JSON.stringify(model)), 'plant.json');
  if (imported.status !== 200) throw new Error(JSON.stringify(imported.body).slice(0, 500));
  const t1 = performance.now();
  const c1 = process.cpuUsage();
  await request(app).post(`/api/studies/${study.body.id}/run`).set(auth);
  let health = 0;
  let check = 0;
  let probes = 0;
  const timed = async (url: string) => {
    const s = performance.now();
    await fetch(url);
    return performance.now() - s;
  };
  for (;;) {
    const run = await request(app).get(`/api/studies/${study.body.id}/run`).set(auth);
    if (run.body.status === 'done' || run.body.status === 'failed') {
      if (run.body.status === 'failed') throw new Error(run.body.message);
      break;
    }
    if (run.body.status === 'running') {
      health = Math.max(health, await timed(`${base}/api/health`));
      check = Math.max(check, await timed(`${base}/api/labels/${encodeURIComponent(labelCode)}`));
      probes += 1;
    }
    await new Promise((r) => setTimeout(r, 50));
  }
  const t2 = performance.now();
  const c2 = process.cpuUsage();
  const cpu = (a: NodeJS.CpuUsage, b: NodeJS.CpuUsage) => ((b.user - a.user + b.system - a.system) / 1e6).toFixed(2);
  server.close();
  await close();
  const total = (t2 - t0) / 1000;
  return {
    name: `study through the API (${model.buses!.length} buses, radial)`,
    opsPerSecond: model.buses!.length / total,
    detail:
      `import ${((t1 - t0) / 1000).toFixed(2)} s · run and store ${((t2 - t1) / 1000).toFixed(2)} s · total ${total.toFixed(2)} s (target under 3 s)\n` +
      `CPU time of the process (all threads): import ${cpu(c0, c1)} s · run and store ${cpu(c1, c2)} s\n` +
      `while it ran (${probes} probes): slowest /api/health ${health.toFixed(0)} ms, slowest public label check ${check.toFixed(0)} ms (target under 100 ms)`,
  };
}
