import { performance } from 'node:perf_hooks';
import { clearingTime } from '../engine/trip/clearingTime';
import { bandFeatureCurrentsA } from '../engine/trip/curvePoints';
import { EXAMPLE_DEVICES } from '../engine/trip/exampleDevices';

/**
 * Band reads per second: clearingTime() over the example devices (every kind) at log-spaced currents from
 * below the lowest pickup to well above the highest, for about 1.5 s. Reports the rate; asserts nothing.
 */
export async function benchTrip(): Promise<{ name: string; opsPerSecond: number; detail: string }> {
  const cases: { device: (typeof EXAMPLE_DEVICES)[number]; currentA: number }[] = [];
  for (const device of EXAMPLE_DEVICES) {
    const features = bandFeatureCurrentsA(device);
    const fromA = features[0] * 0.5;
    const toA = features[features.length - 1] * 5;
    const n = 64;
    for (let i = 0; i < n; i += 1) cases.push({ device, currentA: fromA * Math.pow(toA / fromA, i / (n - 1)) });
  }
  // Warm-up so the JIT settles before timing.
  for (let i = 0; i < 2000; i += 1) {
    const c = cases[i % cases.length];
    clearingTime(c.device, c.currentA);
  }
  const budgetMs = 1500;
  let ops = 0;
  let checksum = 0;
  const start = performance.now();
  let elapsedMs = 0;
  while (elapsedMs < budgetMs) {
    for (const c of cases) {
      const r = clearingTime(c.device, c.currentA);
      if (r.clearingTimeS !== null) checksum += r.clearingTimeS;
    }
    ops += cases.length;
    elapsedMs = performance.now() - start;
  }
  await Promise.resolve();
  const opsPerSecond = Math.round((ops / elapsedMs) * 1000);
  return {
    name: 'trip band reads',
    opsPerSecond,
    detail: `${ops} clearingTime() calls over ${EXAMPLE_DEVICES.length} devices × 64 currents in ${elapsedMs.toFixed(0)} ms (checksum ${checksum.toFixed(1)})`,
  };
}
