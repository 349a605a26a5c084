import type { BandDevice, ElectronicDevice, ThermalMagneticDevice } from '../../../shared/schemas/device';
import { EngineError } from '../errors';
import facts from '../data/trip-facts.json';
import { readBand } from './clearingTime';
import { requirePositive } from './elements';
import { fmt } from './interpolate';

/** Breaker devices a calibration check applies to. */
export type BreakerDevice = ThermalMagneticDevice | ElectronicDevice | BandDevice;

export interface CalibrationCheck {
  test: string;
  currentA: number;
  requirement: string;
  /** Band time read at the test current (maximum curve for "trips within", minimum curve for "carries"). */
  timeS: number | null;
  limitS: number | null;
  pass: boolean;
  /** Status of the published limit as copied from the reference: 'read' or 'from memory, unverified'. */
  status: string;
}

export interface CalibrationResult {
  pass: boolean;
  checks: CalibrationCheck[];
}

/** Rating a calibration test refers to: ratingA, or for an electronic unit its Ir (long-time pickup × In). */
function breakerRatingA(device: BreakerDevice): number {
  return device.kind === 'electronic' ? device.longTime.pickup * device.sensorA : device.ratingA;
}

/** UL 489 maximum trip time at 135 % of rating: 1 h for ratings ≤ 50 A (read), 2 h above (from memory). */
export function ul489LimitAt135PctS(ratingA: number): { limitS: number; status: string } {
  requirePositive(ratingA, 'ratingA');
  const row = facts.ul489Calibration.at135Pct.rows.find((r) => r.maxRatingA === null || ratingA <= r.maxRatingA);
  if (!row)
    throw new EngineError('out-of-range', 'RATING_OUT_OF_RANGE', `No UL 489 135 % limit for ${ratingA} A`, 'ratingA');
  return { limitS: row.maxTripTimeS, status: row.status };
}

/** UL 489 maximum trip time at 200 % of rating by rating (≤ 30 A: 2 min, read; larger ratings from memory). */
export function ul489LimitAt200PctS(ratingA: number): { limitS: number; status: string } {
  requirePositive(ratingA, 'ratingA');
  const row = facts.ul489Calibration.at200Pct.rows.find((r) => ratingA <= r.maxRatingA);
  if (!row) {
    throw new EngineError(
      'out-of-range',
      'RATING_OUT_OF_RANGE',
      `No UL 489 200 % limit above 6000 A (got ${ratingA} A)`,
      'ratingA',
    );
  }
  return { limitS: row.maxTripTimeS, status: row.status };
}

/**
 * Checks a breaker band against the UL 489 calibration points:
 * - 100 %: carries without tripping — the minimum curve shows no trip at rated current;
 * - 135 %: the maximum curve trips within 1 h (≤ 50 A) / 2 h (> 50 A);
 * - 200 %: the maximum curve trips within the limit for the rating (2 min at ≤ 30 A …).
 * Each check carries the status of its published limit.
 */
export function checkUl489Calibration(device: BreakerDevice): CalibrationResult {
  const ratingA = breakerRatingA(device);
  const checks: CalibrationCheck[] = [];
  const carry = readBand(device, ratingA);
  checks.push({
    test: '100 %',
    currentA: ratingA,
    requirement: facts.ul489Calibration.carryPct.requirement,
    timeS: carry.minS,
    limitS: null,
    pass: carry.minS === null,
    status: facts.ul489Calibration.carryPct.status,
  });
  for (const [pct, limit] of [
    [135, ul489LimitAt135PctS(ratingA)],
    [200, ul489LimitAt200PctS(ratingA)],
  ] as const) {
    const currentA = (ratingA * pct) / 100;
    const band = readBand(device, currentA);
    checks.push({
      test: `${pct} %`,
      currentA,
      requirement: `trip within ${fmt(limit.limitS)} s`,
      timeS: band.maxS,
      limitS: limit.limitS,
      pass: band.maxS !== null && band.maxS <= limit.limitS,
      status: limit.status,
    });
  }
  return { pass: checks.every((c) => c.pass), checks };
}

export type Iec60898Type = 'B' | 'C' | 'D';

/** IEC 60898-1 instantaneous tripping range of a type, multiples of In (B 3–5, C 5–10, D 10–20). */
export function iec60898InstantaneousRange(type: Iec60898Type): { lowMultiple: number; highMultiple: number } {
  const r = facts.iec60898Instantaneous.types[type];
  if (!r)
    throw new EngineError(
      'invalid-input',
      'UNKNOWN_TYPE',
      `IEC 60898-1 type must be B, C or D, got ${String(type)}`,
      'type',
    );
  return { lowMultiple: r.lowMultiple, highMultiple: r.highMultiple };
}

/**
 * Instantaneous element of a thermal-magnetic device whose pickup range is the IEC 60898-1 range of a type
 * (e.g. C: lowMultiple 5, highMultiple 10).
 */
export function iec60898InstantaneousSetting(type: Iec60898Type): {
  lowMultiple: number;
  highMultiple: number;
  setting: string;
} {
  return { ...iec60898InstantaneousRange(type), setting: type };
}

/**
 * Checks a breaker band against the IEC 60898-1 instantaneous tests of a type:
 * at the lower limit (3/5/10 × In) no trip within 0.1 s (minimum curve null or ≥ 0.1 s);
 * at the upper limit (5/10/20 × In) trip in less than 0.1 s (maximum curve < 0.1 s).
 */
export function checkIec60898Instantaneous(device: BreakerDevice, type: Iec60898Type): CalibrationResult {
  const ratingA = breakerRatingA(device);
  const { lowMultiple, highMultiple } = iec60898InstantaneousRange(type);
  const testS = facts.iec60898Instantaneous.testTimeS;
  const status = facts.iec60898Instantaneous.status;
  const low = readBand(device, lowMultiple * ratingA);
  const high = readBand(device, highMultiple * ratingA);
  const checks: CalibrationCheck[] = [
    {
      test: `${lowMultiple} × In`,
      currentA: lowMultiple * ratingA,
      requirement: `no trip within ${testS} s`,
      timeS: low.minS,
      limitS: testS,
      pass: low.minS === null || low.minS >= testS,
      status,
    },
    {
      test: `${highMultiple} × In`,
      currentA: highMultiple * ratingA,
      requirement: `trip in less than ${testS} s`,
      timeS: high.maxS,
      limitS: testS,
      pass: high.maxS !== null && high.maxS < testS,
      status,
    },
  ];
  return { pass: checks.every((c) => c.pass), checks };
}
