/**
 * Short-circuit benchmark: all-bus bolted fault currents of a generated 10 000-bus radial model and a
 * 1 000-bus looped (meshed) model, plus the cost of one fault in detail (branch currents).
 * Reports milliseconds; asserts nothing about time.
 */
import { performance } from 'node:perf_hooks';
import type { Model } from '../../shared/schemas/model';
import { createShortCircuitSolver } from '../engine/shortcircuit';

function emptyModel(): Model {
  return {
    format: 'emberline-model',
    version: 1,
    frequencyHz: 60,
    buses: [],
    sources: [],
    transformers: [],
    cables: [],
    motors: [],
    ties: [],
    devices: [],
  };
}

/**
 * Radial model: a ternary tree. Buses 0–3 at 12.47 kV (utility at bus 0, medium-voltage cables), buses 4–12
 * fed by 12.47/0.48 kV transformers, every other bus at 0.48 kV fed by a cable; a motor on every 7th
 * low-voltage bus.
 */
export function generateRadialModel(busCount: number): Model {
  const model = emptyModel();
  const sizes = ['500', '250', '4/0', '2/0', '1/0', '2'];
  for (let i = 0; i < busCount; i += 1) {
    const kv = i <= 3 ? 12.47 : 0.48;
    model.buses.push({ id: `B${i}`, nominalKv: kv });
    if (i === 0) continue;
    const parent = Math.floor((i - 1) / 3);
    if (i <= 3) {
      model.cables.push({
        id: `C${i}`,
        fromBus: `B${parent}`,
        toBus: `B${i}`,
        lengthM: 300 + 50 * i,
        sets: 1,
        rOhmPerKm: 0.2,
        xOhmPerKm: 0.12,
      });
    } else if (i <= 12) {
      model.transformers.push({
        id: `T${i}`,
        fromBus: `B${parent}`,
        toBus: `B${i}`,
        kva: 1500 + 250 * (i % 3),
        primaryKv: 12.47,
        secondaryKv: 0.48,
        impedancePct: 5.75,
        xr: 6,
      });
    } else {
      model.cables.push({
        id: `C${i}`,
        fromBus: `B${parent}`,
        toBus: `B${i}`,
        lengthM: 5 + (i % 11),
        sets: 1 + (i % 2),
        size: sizes[i % sizes.length],
        material: i % 5 === 0 ? 'Al' : 'Cu',
        conduit: i % 3 === 0 ? 'pvc' : 'steel',
      });
      if (i % 7 === 0) model.motors.push({ id: `M${i}`, bus: `B${i}`, hp: 25 + (i % 9) * 25, kv: 0.46, xr: 6 });
    }
  }
  model.sources.push({ id: 'UTIL', kind: 'utility', bus: 'B0', shortCircuitMva: 500, xr: 15 });
  return model;
}

/**
 * Looped model: a 13.8 kV grid of `width` × (busCount / width) buses joined by cables along rows and columns,
 * utilities at the four corners and a generator in the middle.
 */
export function generateLoopedModel(busCount: number, width = 25): Model {
  const model = emptyModel();
  const rows = Math.ceil(busCount / width);
  const id = (r: number, c: number) => `G${r}-${c}`;
  const cable = (cableId: string, fromBus: string, toBus: string, lengthM: number) =>
    model.cables.push({ id: cableId, fromBus, toBus, lengthM, sets: 1, rOhmPerKm: 0.15, xOhmPerKm: 0.11 });
  let count = 0;
  for (let r = 0; r < rows; r += 1) {
    for (let c = 0; c < width && count < busCount; c += 1, count += 1) {
      model.buses.push({ id: id(r, c), nominalKv: 13.8 });
      if (c > 0) {
        cable(`H${r}-${c}`, id(r, c - 1), id(r, c), 100 + ((r * 7 + c) % 13) * 10);
      }
      if (r > 0) {
        cable(`V${r}-${c}`, id(r - 1, c), id(r, c), 150 + ((r + c * 3) % 11) * 10);
      }
    }
  }
  const last = model.buses[model.buses.length - 1].id;
  const corners = [id(0, 0), id(0, width - 1), id(rows - 1, 0), last];
  corners.forEach((bus, i) =>
    model.sources.push({ id: `U${i}`, kind: 'utility', bus, shortCircuitMva: 400 + 100 * i, xr: 12 }),
  );
  const middle = model.buses[Math.floor(busCount / 2)].id;
  model.sources.push({ id: 'GEN', kind: 'generator', bus: middle, kva: 5000, kv: 13.8, subtransientPct: 15, xr: 30 });
  return model;
}

function timeMs(run: () => void, repeats: number): number {
  const times: number[] = [];
  for (let i = 0; i < repeats; i += 1) {
    const start = performance.now();
    run();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

export async function benchShortCircuit(): Promise<{ name: string; opsPerSecond: number; detail: string }> {
  const radial = generateRadialModel(10_000);
  const looped = generateLoopedModel(1_000);

  createShortCircuitSolver(radial); // warm-up
  const radialMs = timeMs(() => createShortCircuitSolver(radial), 5);
  createShortCircuitSolver(looped);
  const loopedMs = timeMs(() => createShortCircuitSolver(looped), 5);

  const radialSolver = createShortCircuitSolver(radial);
  const faultBuses = ['B0', 'B5', 'B100', 'B9999'];
  const perFaultRadialMs = timeMs(() => faultBuses.forEach((b) => radialSolver.faultAt(b)), 5) / faultBuses.length;
  const loopedSolver = createShortCircuitSolver(looped);
  const perFaultLoopedMs = timeMs(() => loopedSolver.faultAt('G20-12'), 5);

  return {
    name: 'short-circuit (all buses, 10 000-bus radial model)',
    opsPerSecond: 1000 / radialMs,
    detail:
      `all-bus bolted fault currents: 10 000-bus radial ${radialMs.toFixed(1)} ms, ` +
      `1 000-bus looped ${loopedMs.toFixed(1)} ms (median of 5, model checks and factorization included); ` +
      `one fault with every branch current: radial ${perFaultRadialMs.toFixed(2)} ms, looped ${perFaultLoopedMs.toFixed(2)} ms`,
  };
}
