import type { TripRegion } from '../../../shared/schemas/device';
import { EngineError, type EngineWarning } from '../errors';
import { fmt, interpolateLogLog, type TimeCurrentPoint } from './interpolate';

/**
 * One element of a device's band read at one current: a relay's inverse-time element, a breaker's
 * long-time element, a fuse's curves, … `maxS` is the maximum (total clearing) curve, `minS` the minimum
 * curve; null where that edge of the band does not trip at this current.
 */
export interface ElementReading {
  element: string;
  region: TripRegion;
  maxS: number | null;
  minS: number | null;
  /** Tracing detail: pickups and tolerance edges, multiples, segments read. Plain JSON. */
  detail: Record<string, unknown>;
  /** Warnings that qualify the maximum-curve time. */
  maxWarnings: EngineWarning[];
  /** Warnings that qualify the minimum-curve time. */
  minWarnings: EngineWarning[];
}

export interface BandReading {
  /** Maximum (total clearing) curve time, seconds; null when the device does not clear at this current. */
  maxS: number | null;
  /** Minimum curve time, seconds (never above maxS); null when even the minimum curve does not trip. */
  minS: number | null;
  region: TripRegion;
  /** Element on the maximum curve (the one that clears first), or null. */
  governingElement: string | null;
  /** Element on the minimum curve, or null. */
  minimumElement: string | null;
  warnings: EngineWarning[];
  elements: ElementReading[];
}

/**
 * Composite band of several elements: the fastest element governs each edge (composite max = min over
 * elements of their maximum curves, composite min = min over elements of their minimum curves).
 * Ties go to the element listed first.
 */
export function combineElements(elements: ElementReading[]): BandReading {
  let maxEl: ElementReading | null = null;
  let minEl: ElementReading | null = null;
  for (const el of elements) {
    if (el.maxS !== null && (maxEl === null || el.maxS < (maxEl.maxS as number))) maxEl = el;
    if (el.minS !== null && (minEl === null || el.minS < (minEl.minS as number))) minEl = el;
  }
  const maxS = maxEl ? (maxEl.maxS as number) : null;
  let minS = minEl ? (minEl.minS as number) : null;
  const warnings: EngineWarning[] = [];
  if (maxEl) {
    warnings.push(...maxEl.maxWarnings);
  } else {
    for (const el of elements) warnings.push(...el.maxWarnings);
  }
  if (minEl) warnings.push(...minEl.minWarnings);
  if (minS !== null && maxS !== null && minS > maxS) {
    warnings.push({
      code: 'BAND_MIN_ABOVE_MAX',
      message: `The minimum curve (${fmt(minS)} s) lies above the maximum curve (${fmt(maxS)} s) here; the minimum time is taken equal to the maximum`,
    });
    minS = maxS;
  }
  return {
    maxS,
    minS,
    region: maxEl ? maxEl.region : 'no-trip',
    governingElement: maxEl ? maxEl.element : null,
    minimumElement: minEl ? minEl.element : null,
    warnings: dedupeWarnings(warnings),
    elements,
  };
}

export function dedupeWarnings(warnings: EngineWarning[]): EngineWarning[] {
  const seen = new Set<string>();
  const out: EngineWarning[] = [];
  for (const w of warnings) {
    const key = `${w.code}\u0000${w.message}`;
    if (!seen.has(key)) {
      seen.add(key);
      out.push(w);
    }
  }
  return out;
}

export interface PointCurveReading {
  timeS: number | null;
  warnings: EngineWarning[];
  /** Segment indices read, or the end point clamped to. */
  segment: number[] | null;
  clamped: 'below-data' | 'above-data' | null;
}

/**
 * Reads a published point list. Below its lowest current the curve shows no trip (null, with a
 * BAND_BELOW_DATA warning when `warnBelow`); above its highest current the last point's time is used with a
 * BAND_BEYOND_DATA warning (clamped, never extrapolated).
 */
export function readPointCurve(
  points: readonly TimeCurrentPoint[],
  current: number,
  field: string,
  options: { warnBelow: boolean; unit: string },
): PointCurveReading {
  if (current < points[0][0]) {
    return {
      timeS: null,
      segment: null,
      clamped: 'below-data',
      warnings: options.warnBelow
        ? [
            {
              code: 'BAND_BELOW_DATA',
              message: `${field}: ${fmt(current)} ${options.unit} is below the curve's lowest current ${fmt(points[0][0])} ${options.unit}; the curve shows no trip there (not extrapolated)`,
            },
          ]
        : [],
    };
  }
  const r = interpolateLogLog(points, current, field);
  return { timeS: r.timeS, segment: r.segment, clamped: r.clamped, warnings: r.warnings };
}

export function requirePositive(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new EngineError(
      'invalid-input',
      'NOT_POSITIVE',
      `${field} must be a positive number, got ${String(value)}`,
      field,
    );
  }
  return value;
}

export function requireNonNegative(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
    throw new EngineError(
      'invalid-input',
      'NOT_NON_NEGATIVE',
      `${field} must be zero or a positive number, got ${String(value)}`,
      field,
    );
  }
  return value;
}

export function requirePercent(value: unknown, field: string, maxPct = 100): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0 || value > maxPct) {
    throw new EngineError(
      'invalid-input',
      'NOT_PERCENT',
      `${field} must be between 0 and ${maxPct} %, got ${String(value)}`,
      field,
    );
  }
  return value;
}

/** A pickup with its tolerance band: the minimum curve starts at the low edge, the maximum curve at the high edge. */
export interface PickupEdges {
  nominalA: number;
  lowA: number;
  highA: number;
}

/** Relative slack so that a current equal to a computed edge (e.g. 800 A × 1.1) counts as at the edge despite rounding. */
const EDGE_SLACK = 1e-12;

/** The current is at or above a pickup edge (the maximum curve trips from here on). */
export function atOrAbove(currentA: number, edgeA: number): boolean {
  return currentA >= edgeA * (1 - EDGE_SLACK);
}

/** The current is strictly above a pickup edge (the minimum curve trips only beyond the low edge). */
export function above(currentA: number, edgeA: number): boolean {
  return currentA > edgeA * (1 + EDGE_SLACK);
}

export function pickupEdges(nominalA: number, tolerancePct: number): PickupEdges {
  return { nominalA, lowA: nominalA * (1 - tolerancePct / 100), highA: nominalA * (1 + tolerancePct / 100) };
}
