import * as fc from 'fast-check';
import { clearingTime } from '../../server/engine/trip/clearingTime';
import { bandCurves } from '../../server/engine/trip/curvePoints';
import { EXAMPLE_DEVICES } from '../../server/engine/trip/exampleDevices';
import type { Device, ElectronicDevice, RelayDevice, ThermalMagneticDevice } from '../../shared/schemas/device';
import { RELAY_CURVES } from '../../shared/schemas/device';

// Properties of every trip band (docs/ARCHITECTURE.md, Clearing time from a trip band): the maximum (total clearing)
// curve does not rise with current, and it never lies below the minimum curve. Checked on the example devices and on
// generated settings.

/** Random point list: currents increasing, times not increasing. */
const curveArb = fc
  .array(fc.tuple(fc.double({ min: 0.01, max: 1, noNaN: true }), fc.double({ min: 0.3, max: 1, noNaN: true })), {
    minLength: 1,
    maxLength: 8,
  })
  .map((steps) => {
    let x = 1;
    let t = 10000;
    return steps.map(([dx, ft]) => {
      x *= 1 + dx * 3;
      t *= ft;
      return [x, t] as [number, number];
    });
  });

const relayArb: fc.Arbitrary<Device> = fc
  .record({
    curve: fc.constantFrom(...RELAY_CURVES),
    pickupA: fc.double({ min: 10, max: 2000, noNaN: true }),
    timeDial: fc.double({ min: 0.05, max: 15, noNaN: true }),
    instMultiple: fc.option(fc.double({ min: 1.5, max: 40, noNaN: true }), { nil: undefined }),
    dt: fc.option(
      fc.record({ m: fc.double({ min: 1, max: 20, noNaN: true }), delayS: fc.double({ min: 0, max: 2, noNaN: true }) }),
      { nil: undefined },
    ),
    breakerCycles: fc.constantFrom(1.5, 3, 5, 8),
    frequencyHz: fc.constantFrom(50, 60),
  })
  .map((r): RelayDevice => ({
    kind: 'relay',
    curve: r.curve,
    pickupA: r.pickupA,
    timeDial: r.timeDial,
    instantaneousA: r.instMultiple === undefined ? undefined : r.instMultiple * r.pickupA,
    definiteTime: r.dt === undefined ? undefined : { pickupA: r.dt.m * r.pickupA, delayS: r.dt.delayS },
    breakerCycles: r.breakerCycles,
    frequencyHz: r.frequencyHz,
  }));

const thermalMagneticArb: fc.Arbitrary<Device> = fc
  .record({
    ratingA: fc.double({ min: 10, max: 800, noNaN: true }),
    max: curveArb,
    shrink: fc.double({ min: 0.2, max: 1, noNaN: true }),
    inst: fc.option(
      fc.record({ m: fc.double({ min: 3, max: 20, noNaN: true }), tol: fc.double({ min: 0, max: 30, noNaN: true }) }),
      { nil: undefined },
    ),
    clearingS: fc.double({ min: 0.008, max: 0.05, noNaN: true }),
  })
  .map((r): ThermalMagneticDevice => ({
    kind: 'thermal-magnetic',
    ratingA: r.ratingA,
    thermal: { max: r.max, min: r.max.map(([x, t]) => [x, t * r.shrink] as [number, number]) },
    instantaneous: r.inst === undefined ? undefined : { pickupMultiple: r.inst.m, tolerancePct: r.inst.tol },
    instantaneousClearingS: r.clearingS,
  }));

const electronicArb: fc.Arbitrary<Device> = fc
  .record({
    sensorA: fc.constantFrom(100, 400, 800, 1600, 3200),
    ltPickup: fc.double({ min: 0.4, max: 1, noNaN: true }),
    ltDelay: fc.double({ min: 2, max: 30, noNaN: true }),
    st: fc.option(
      fc.record({
        pickup: fc.double({ min: 1.5, max: 10, noNaN: true }),
        delayS: fc.double({ min: 0.05, max: 0.5, noNaN: true }),
        i2t: fc.boolean(),
      }),
      { nil: undefined },
    ),
    inst: fc.option(fc.double({ min: 2, max: 15, noNaN: true }), { nil: undefined }),
    tol: fc.double({ min: 0, max: 20, noNaN: true }),
    timeTol: fc.double({ min: 0, max: 30, noNaN: true }),
    clearingS: fc.double({ min: 0.02, max: 0.08, noNaN: true }),
  })
  .map((r): ElectronicDevice => ({
    kind: 'electronic',
    sensorA: r.sensorA,
    longTime: { pickup: r.ltPickup, delayS: r.ltDelay },
    shortTime: r.st,
    instantaneous: r.inst === undefined ? undefined : { pickup: r.inst },
    pickupTolerancePct: r.tol,
    timeTolerancePct: r.timeTol,
    clearingS: r.clearingS,
  }));

const fuseArb: fc.Arbitrary<Device> = fc
  .record({
    tc: curveArb,
    scale: fc.double({ min: 10, max: 1000, noNaN: true }),
    meltOnly: fc.boolean(),
    shrink: fc.double({ min: 0.2, max: 1, noNaN: true }),
  })
  .map(({ tc, scale, meltOnly, shrink }) => {
    const points = tc.map(([x, t]) => [x * scale, t / 1e4] as [number, number]); // times 1 s … far below 0.01 s
    return meltOnly
      ? { kind: 'fuse' as const, ratingA: scale, averageMelt: points }
      : {
          kind: 'fuse' as const,
          ratingA: scale,
          totalClearing: points,
          minimumMelt: points.map(([x, t]) => [x, t * shrink] as [number, number]),
        };
  });

const bandArb: fc.Arbitrary<Device> = fc
  .record({
    max: curveArb,
    shrink: fc.double({ min: 0.1, max: 1, noNaN: true }),
    unit: fc.constantFrom('multiple' as const, 'ampere' as const),
  })
  .map(({ max, shrink, unit }) => ({
    kind: 'band' as const,
    ratingA: 100,
    currentUnit: unit,
    max: unit === 'ampere' ? max.map(([x, t]) => [x * 100, t] as [number, number]) : max,
    min: (unit === 'ampere' ? max.map(([x, t]) => [x * 100, t] as [number, number]) : max).map(
      ([x, t]) => [x, t * shrink] as [number, number],
    ),
  }));

const deviceArb = fc.oneof(
  relayArb,
  thermalMagneticArb,
  electronicArb,
  fuseArb,
  bandArb,
  fc.constantFrom(...EXAMPLE_DEVICES),
);
const currentPairArb = fc.tuple(
  fc.double({ min: 1, max: 2e5, noNaN: true }),
  fc.double({ min: 1, max: 2e5, noNaN: true }),
);

describe('trip band properties (fast-check)', () => {
  it('the maximum curve is non-increasing in current, for every kind', () => {
    fc.assert(
      fc.property(deviceArb, currentPairArb, (device, [a, b]) => {
        const lo = Math.min(a, b);
        const hi = Math.max(a, b);
        const tLo = clearingTime(device, lo).clearingTimeS;
        const tHi = clearingTime(device, hi).clearingTimeS;
        // once a device clears, it clears at every higher current, no slower
        if (tLo === null) return true;
        return tHi !== null && tHi <= tLo;
      }),
      { numRuns: 2000 },
    );
  });

  it('clearingTimeS ≥ minimumTimeS wherever both exist; clearing time positive, minimum time not negative', () => {
    fc.assert(
      fc.property(deviceArb, fc.double({ min: 1, max: 2e5, noNaN: true }), (device, currentA) => {
        const r = clearingTime(device, currentA);
        if (r.clearingTimeS !== null && !(r.clearingTimeS > 0)) return false;
        // a definite-time element may be set to 0 s delay: its relay (minimum) time is then 0
        if (r.minimumTimeS !== null && !(r.minimumTimeS >= 0)) return false;
        if (r.clearingTimeS === null) return r.region === 'no-trip' && r.warnings.some((w) => w.code === 'NO_TRIP');
        return r.minimumTimeS === null || r.clearingTimeS >= r.minimumTimeS;
      }),
      { numRuns: 2000 },
    );
  });

  it('the plotted curves (bandCurves) are non-increasing and the maximum never below the minimum', () => {
    fc.assert(
      fc.property(deviceArb, (device) => {
        const { min, max } = bandCurves(device, { pointsPerDecade: 20 });
        for (let i = 1; i < max.length; i += 1)
          if (!(max[i][0] > max[i - 1][0]) || max[i][1] > max[i - 1][1]) return false;
        const minAt = new Map(min);
        for (const [x, t] of max) {
          const m = minAt.get(x);
          if (m !== undefined && m > t) return false;
        }
        return max.length > 0;
      }),
      { numRuns: 300 },
    );
  });
});

describe('bandCurves', () => {
  it('draws the instantaneous step of a breaker vertically (samples at both sides of the pickup edge)', () => {
    const tm = EXAMPLE_DEVICES.find((d) => d.kind === 'thermal-magnetic') as ThermalMagneticDevice;
    const { max, featuresA } = bandCurves(tm);
    const highEdgeA = 10 * 1.2 * tm.ratingA; // 10 × ± 20 %
    expect(featuresA.some((f) => Math.abs(f - highEdgeA) < 1e-9)).toBe(true);
    const before = max.filter(([x]) => x < highEdgeA).pop() as [number, number];
    const after = max.find(([x]) => x >= highEdgeA) as [number, number];
    expect(after[0] / before[0]).toBeLessThan(1.00001);
    expect(before[1]).toBeGreaterThan(1); // thermal band
    expect(after[1]).toBeLessThan(0.03); // instantaneous clearing
  });

  it('rejects an empty range', () => {
    expect(() => bandCurves(EXAMPLE_DEVICES[0], { fromA: 100, toA: 50 })).toThrow(
      expect.objectContaining({ kind: 'invalid-input' }),
    );
  });
});
