import { expectClose } from '../helpers/approx';
import { clearingTime } from '../../server/engine/trip/clearingTime';
import { cyclesToSeconds } from '../../server/engine/trip/equations';
import {
  checkIec60898Instantaneous,
  checkUl489Calibration,
  iec60898InstantaneousRange,
  iec60898InstantaneousSetting,
  ul489LimitAt135PctS,
  ul489LimitAt200PctS,
} from '../../server/engine/trip/standardChecks';
import { GENERIC_THERMAL_BAND } from '../../server/engine/trip/exampleDevices';
import type { ElectronicDevice, ThermalMagneticDevice } from '../../shared/schemas/device';

const codes = (r: { warnings: { code: string }[] }) => r.warnings.map((w) => w.code);

/** A 20 A thermal-magnetic breaker, instantaneous 10 × rating ± 20 % (invented band; see GENERIC_THERMAL_BAND). */
const TM: ThermalMagneticDevice = {
  kind: 'thermal-magnetic',
  ratingA: 20,
  thermal: GENERIC_THERMAL_BAND,
  instantaneous: { pickupMultiple: 10, tolerancePct: 20 },
};

describe('worked example: thermal-magnetic breaker', () => {
  it('reads the thermal band in multiples of rating', () => {
    const r = clearingTime(TM, 40); // 2 × rating: published points max 100 s, min 30 s
    expect(r.region).toBe('long-time');
    expect(r.clearingTimeS).toBe(100);
    expect(r.minimumTimeS).toBe(30);
    expect(r.trace.multipleOfRating).toBe(2);
  });

  it('clears in 1.5 cycles above the instantaneous pickup by default (IEEE 1584-2002 Table 1: LV molded case 1.5 cycles, 0.025 s)', () => {
    const r = clearingTime(TM, 300); // 15 × rating
    expect(r.region).toBe('instantaneous');
    expectClose(r.clearingTimeS as number, 0.025, 1e-12);
  });
});

describe('thermal-magnetic instantaneous pickup tolerance (docs/ARCHITECTURE.md, Clearing time from a trip band)', () => {
  // 10 × ± 20 %: low edge 8 ×, high edge 12 × rating
  it('between the low and high edge the maximum curve stays on the thermal band', () => {
    const r = clearingTime(TM, 9 * 20);
    expect(r.region).toBe('long-time');
    // thermal max between (5, 12 s) and (10, 4 s), log-log
    const slope = Math.log(4 / 12) / Math.log(10 / 5);
    expectClose(r.clearingTimeS as number, 12 * Math.pow(9 / 5, slope), 1e-12);
    // the minimum curve already uses the instantaneous element (low edge passed): 0.01 s default (common practice, from memory)
    expectClose(r.minimumTimeS as number, 0.01, 1e-12);
    expect(codes(r)).toContain('WITHIN_PICKUP_TOLERANCE');
  });

  it('just below the low edge neither curve is instantaneous; at the high edge the maximum is', () => {
    const below = clearingTime(TM, 8 * 20 * 0.999);
    expect(below.region).toBe('long-time');
    expect(below.minimumTimeS as number).toBeGreaterThan(0.1);
    const justBelowHigh = clearingTime(TM, 12 * 20 * 0.999);
    expect(justBelowHigh.region).toBe('long-time');
    const atHigh = clearingTime(TM, 12 * 20);
    expect(atHigh.region).toBe('instantaneous');
  });

  it('a user-set instantaneous clearing time, or cycles at a frequency, replaces the default', () => {
    expectClose(clearingTime({ ...TM, instantaneousClearingS: 0.016 }, 400).clearingTimeS as number, 0.016, 1e-12);
    // 1 cycle at 50 Hz = 20 ms
    expectClose(
      clearingTime({ ...TM, instantaneousClearingCycles: 1, frequencyHz: 50 }, 400).clearingTimeS as number,
      0.02,
      1e-12,
    );
    expect(() => clearingTime({ ...TM, instantaneousClearingS: 0.02, instantaneousClearingCycles: 1 }, 400)).toThrow(
      expect.objectContaining({ kind: 'invalid-input' }),
    );
  });

  it('below the thermal band the breaker does not clear', () => {
    const r = clearingTime(TM, 20); // 1.0 × rating, below the 1.2 × first point of the maximum curve
    expect(r.region).toBe('no-trip');
    expect(r.clearingTimeS).toBeNull();
    expect(codes(r)).toContain('NO_TRIP');
  });

  it('beyond the thermal data (but under the instantaneous) clamps and warns', () => {
    const noInst: ThermalMagneticDevice = { ...TM, instantaneous: undefined };
    const r = clearingTime(noInst, 30 * 20);
    expect(r.clearingTimeS).toBe(1.5);
    expect(codes(r)).toContain('BAND_BEYOND_DATA');
  });
});

describe('UL 489 calibration points as band checks', () => {
  it('limits copied from the reference: 135 % within 1 h (≤ 50 A, read), 200 % within 2 min (≤ 30 A, read)', () => {
    expect(ul489LimitAt135PctS(20)).toEqual({ limitS: 3600, status: 'read' }); // UL 489, 135 %: 1 h for ≤ 50 A (read)
    expect(ul489LimitAt200PctS(20)).toEqual({ limitS: 120, status: 'read' }); // UL 489, 200 %: 2 min for 0–30 A (read)
    // from memory, unverified: 2 h above 50 A at 135 %; 6 min for 51–100 A at 200 %
    expect(ul489LimitAt135PctS(100)).toEqual({ limitS: 7200, status: 'from memory, unverified' });
    expect(ul489LimitAt200PctS(100)).toEqual({ limitS: 360, status: 'from memory, unverified' });
  });

  it('a generic 20 A band built to meet UL 489 trips within the 135 % and 200 % limits and carries 100 %', () => {
    // UL 489 (read for ≤ 30 A): 100 % carry, 135 % ≤ 1 h, 200 % ≤ 2 min
    const result = checkUl489Calibration(TM);
    expect(result.checks.map((c) => [c.test, c.pass])).toEqual([
      ['100 %', true],
      ['135 %', true],
      ['200 %', true],
    ]);
    expect(result.pass).toBe(true);
  });

  it('flags a band that is too slow at 200 %', () => {
    const slow: ThermalMagneticDevice = {
      ...TM,
      thermal: {
        min: GENERIC_THERMAL_BAND.min,
        max: GENERIC_THERMAL_BAND.max.map(([m, t]) => [m, m === 2 ? 200 : t] as [number, number]),
      },
    };
    const result = checkUl489Calibration(slow);
    expect(result.pass).toBe(false);
    expect(result.checks.find((c) => c.test === '200 %')).toMatchObject({ pass: false, timeS: 200, limitS: 120 });
  });

  it('flags a band whose minimum curve trips at rated current', () => {
    const trips: ThermalMagneticDevice = {
      ...TM,
      thermal: { ...GENERIC_THERMAL_BAND, min: [[0.9, 7200], ...GENERIC_THERMAL_BAND.min] },
    };
    const result = checkUl489Calibration(trips);
    expect(result.checks[0]).toMatchObject({ test: '100 %', pass: false });
  });
});

describe('IEC 60898-1 instantaneous ranges (B 3–5, C 5–10, D 10–20 × In)', () => {
  it.each([
    ['B', 3, 5],
    ['C', 5, 10],
    ['D', 10, 20],
  ] as const)('type %s: %d–%d × In', (type, low, high) => {
    // IEC 60898-1 instantaneous tripping ranges (project reference)
    expect(iec60898InstantaneousRange(type)).toEqual({ lowMultiple: low, highMultiple: high });
    const device: ThermalMagneticDevice = { ...TM, instantaneous: iec60898InstantaneousSetting(type) };
    // just below the low limit: no instantaneous on either curve; at the upper limit: the maximum curve is instantaneous
    const below = clearingTime(device, low * 20 * 0.999);
    expect(below.region).toBe('long-time');
    expect(below.minimumTimeS as number).toBeGreaterThanOrEqual(0.1);
    expect(clearingTime(device, high * 20).region).toBe('instantaneous');
    expect(clearingTime(device, high * 20 * 0.999).region).toBe('long-time');
    // IEC 60898-1 instantaneous tests: lower limit no trip within 0.1 s, upper limit trip in < 0.1 s
    expect(checkIec60898Instantaneous(device, type).pass).toBe(true);
  });

  it('flags a breaker whose instantaneous range is not the type’s', () => {
    const typeC: ThermalMagneticDevice = { ...TM, instantaneous: iec60898InstantaneousSetting('C') };
    const asB = checkIec60898Instantaneous(typeC, 'B');
    expect(asB.pass).toBe(false);
    expect(asB.checks[1]).toMatchObject({ test: '5 × In', pass: false }); // type B must trip at 5 × In in < 0.1 s
    // 10 × ± 20 % reaches 12 ×: not a type C (must trip at 10 × In)
    expect(checkIec60898Instantaneous(TM, 'C').pass).toBe(false);
  });
});

/**
 * Electronic trip unit: In 1000 A, Ir = 0.8 × In = 800 A, long-time delay 10 s at 6 × Ir (I²t),
 * pickups ± 10 %, time band ± 20 %, breaker clearing 0.05 s. Shapes: common practice (reference notes, from memory).
 */
const LT_ONLY: ElectronicDevice = {
  kind: 'electronic',
  sensorA: 1000,
  longTime: { pickup: 0.8, delayS: 10, delayMultiple: 6 },
  pickupTolerancePct: 10,
  timeTolerancePct: 20,
  clearingS: 0.05,
};
const LSI: ElectronicDevice = {
  ...LT_ONLY,
  shortTime: { pickup: 3, delayS: 0.2, i2t: false },
  instantaneous: { pickup: 10 },
};

describe('worked example: electronic trip unit, long-time I²t through the stated point', () => {
  it('at 6 × Ir the nominal time is the delay: maximum 10 s × 1.2 + 0.05 s, minimum 10 s × 0.8', () => {
    const r = clearingTime(LT_ONLY, 6 * 800);
    expect(r.region).toBe('long-time');
    expectClose(r.clearingTimeS as number, 12.05, 1e-12);
    expectClose(r.minimumTimeS as number, 8, 1e-12);
  });

  it('follows t = delay · (6 / M)²: at 3 × Ir four times the delay, at 12 × a quarter', () => {
    expectClose(clearingTime(LT_ONLY, 3 * 800).clearingTimeS as number, 40 * 1.2 + 0.05, 1e-12);
    expectClose(clearingTime(LT_ONLY, 12 * 800).clearingTimeS as number, 2.5 * 1.2 + 0.05, 1e-12);
  });
});

describe('electronic trip unit: pickup tolerance edges', () => {
  // Ir 800 A ± 10 %: low edge 720 A, high edge 880 A
  it('the maximum curve picks up at the HIGH edge, the minimum just above the LOW edge', () => {
    const justBelowLow = clearingTime(LT_ONLY, 719);
    expect([justBelowLow.clearingTimeS, justBelowLow.minimumTimeS]).toEqual([null, null]);
    const aboveLow = clearingTime(LT_ONLY, 721);
    expect(aboveLow.clearingTimeS).toBeNull();
    expect(aboveLow.minimumTimeS).not.toBeNull();
    expect(aboveLow.region).toBe('no-trip');
    expect(codes(aboveLow)).toEqual(expect.arrayContaining(['WITHIN_PICKUP_TOLERANCE', 'NO_TRIP']));
    const justBelowHigh = clearingTime(LT_ONLY, 879);
    expect(justBelowHigh.clearingTimeS).toBeNull();
    const atHigh = clearingTime(LT_ONLY, 880);
    expect(atHigh.region).toBe('long-time');
    // nominal time uses M = I / Ir (800 A): 10 · (6 / 1.1)² · 1.2 + 0.05
    expectClose(atHigh.clearingTimeS as number, 10 * Math.pow(6 / 1.1, 2) * 1.2 + 0.05, 1e-12);
  });
});

describe('electronic trip unit: regions and elements', () => {
  // LSI: ST 3 × Ir = 2400 A (edges 2160 / 2640), flat 0.2 s; INST 10 × In = 10 000 A (edges 9000 / 11 000)
  it('short-time: just below its high edge the long-time governs, at it the flat short-time delay', () => {
    expect(clearingTime(LSI, 2639).region).toBe('long-time');
    const st = clearingTime(LSI, 2640);
    expect(st.region).toBe('short-time');
    expectClose(st.clearingTimeS as number, 0.2 * 1.2 + 0.05, 1e-12);
    // the minimum curve is already on the short-time element just above its low edge
    expectClose(clearingTime(LSI, 2161).minimumTimeS as number, 0.2 * 0.8, 1e-12);
    expect(clearingTime(LSI, 2159).minimumTimeS as number).toBeGreaterThan(1);
  });

  it('short-time I²t out is flat; I²t in ramps t = tsd · (10 / M)² down to the flat delay at 10 × Ir (convention, common practice)', () => {
    const out = clearingTime(LSI, 5 * 800); // M = 5
    expectClose(out.clearingTimeS as number, 0.2 * 1.2 + 0.05, 1e-12);
    const inDevice: ElectronicDevice = { ...LSI, shortTime: { pickup: 3, delayS: 0.2, i2t: true } };
    const ramp = clearingTime(inDevice, 5 * 800);
    expect(ramp.region).toBe('short-time');
    expectClose(ramp.clearingTimeS as number, 0.2 * Math.pow(10 / 5, 2) * 1.2 + 0.05, 1e-12);
    // above 10 × Ir the I²t-in band is flat again
    expectClose(clearingTime(inDevice, 10.5 * 800).clearingTimeS as number, 0.2 * 1.2 + 0.05, 1e-12);
    expect(ramp.trace.elements.find((e) => e.element === 'short-time')?.shape).toBe('i2t-ramp');
  });

  it('instantaneous: just below its high edge the short-time governs, at it the breaker clearing time', () => {
    expect(clearingTime(LSI, 10999).region).toBe('short-time');
    const inst = clearingTime(LSI, 11000);
    expect(inst.region).toBe('instantaneous');
    expectClose(inst.clearingTimeS as number, 0.05, 1e-12);
    // minimum curve: instantaneous just above the low edge (9000 A), 0.01 s default (common practice, from memory)
    expectClose(clearingTime(LSI, 9001).minimumTimeS as number, 0.01, 1e-12);
    expectClose(clearingTime(LSI, 8999).minimumTimeS as number, 0.2 * 0.8, 1e-12);
  });

  it('the ground-fault element is listed in the trace but not applied to the three-phase current', () => {
    const withGf: ElectronicDevice = { ...LT_ONLY, groundFault: { pickupA: 200, delayS: 0.1 } };
    const r = clearingTime(withGf, 1000);
    expect(r.region).toBe('long-time');
    expect(r.trace.elements.map((e) => e.element)).toContain('ground-fault');
  });

  it('an unknown tolerance or a zero sensor rating is rejected naming the field', () => {
    expect(() => clearingTime({ ...LT_ONLY, pickupTolerancePct: 150 }, 1000)).toThrow(
      expect.objectContaining({ kind: 'invalid-input', field: 'device.pickupTolerancePct' }),
    );
    expect(() => clearingTime({ ...LT_ONLY, sensorA: 0 }, 1000)).toThrow(
      expect.objectContaining({ field: 'device.sensorA' }),
    );
  });
});

describe('cycles for breaker clearing (IEEE 1584-2002 Table 1)', () => {
  it('1.5 cycles at 60 Hz is the molded-case 0.025 s', () => {
    expectClose(cyclesToSeconds(1.5, 60), 0.025, 1e-12);
  });
});
