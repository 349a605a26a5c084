import type { Device } from '../../../shared/schemas/device';
import { EngineError } from '../errors';
import { readBand } from './clearingTime';
import { electronicSettings } from './electronic';
import { relaySettings } from './relay';
import { thermalMagneticSettings } from './thermalMagnetic';

/** Most decades of current one plot may span (sampling is at most MAX_PLOT_DECADES × pointsPerDecade points). */
export const MAX_PLOT_DECADES = 12;
/** Bounds of the default plot range, amperes. */
const PLOT_MIN_A = 1e-3;
const PLOT_MAX_A = 1e9;

export interface BandCurvesOptions {
  /** Lowest current of the plot, amperes (default: a little below the lowest pickup or published point). */
  fromA?: number;
  /** Highest current, amperes (default: well above the highest pickup or published point). */
  toA?: number;
  /** Log-spaced samples per decade of current (default 40). */
  pointsPerDecade?: number;
}

export interface BandCurves {
  fromA: number;
  toA: number;
  /** Minimum curve as [amperes, seconds], where it trips. */
  min: [number, number][];
  /** Maximum (total clearing) curve as [amperes, seconds], where it trips. */
  max: [number, number][];
  /** Currents where the band steps (pickups and their tolerance edges, published points), amperes. */
  featuresA: number[];
}

/** Currents where a device's band has a corner or a step, amperes. */
export function bandFeatureCurrentsA(device: Device): number[] {
  const out: number[] = [];
  switch (device.kind) {
    case 'relay': {
      const s = relaySettings(device);
      out.push(s.pickupA, s.pickupA * s.curveLimitMultiple);
      if (s.instantaneousEdges) out.push(s.instantaneousEdges.lowA, s.instantaneousEdges.highA);
      if (s.definiteTime) out.push(s.definiteTime.pickupA);
      break;
    }
    case 'fuse':
      for (const list of [device.totalClearing, device.minimumMelt, device.averageMelt]) {
        if (list) out.push(...list.map((p) => p[0]));
      }
      break;
    case 'band': {
      const scale = device.currentUnit === 'multiple' ? device.ratingA : 1;
      out.push(...device.min.map((p) => p[0] * scale), ...device.max.map((p) => p[0] * scale));
      break;
    }
    case 'thermal-magnetic': {
      const s = thermalMagneticSettings(device);
      out.push(
        ...device.thermal.min.map((p) => p[0] * device.ratingA),
        ...device.thermal.max.map((p) => p[0] * device.ratingA),
      );
      if (s.instantaneous) out.push(s.instantaneous.lowA * device.ratingA, s.instantaneous.highA * device.ratingA);
      break;
    }
    case 'electronic': {
      const s = electronicSettings(device);
      out.push(s.longTime.lowA, s.longTime.highA);
      if (s.shortTime) {
        out.push(s.shortTime.lowA, s.shortTime.highA);
        if (s.shortTime.i2t) out.push(s.shortTime.i2tMultiple * s.longTime.irA);
      }
      if (s.instantaneous) out.push(s.instantaneous.lowA, s.instantaneous.highA);
      break;
    }
    default:
      break;
  }
  return Array.from(new Set(out.filter((x) => Number.isFinite(x) && x > 0))).sort((a, b) => a - b);
}

/**
 * Samples a device's minimum and maximum curves for plotting on log-log axes (client plot, study report):
 * log-spaced currents plus the band's corners (each pickup edge just below, at and just above), so the
 * steps of instantaneous and pickup edges are drawn vertical. Currents where a curve shows no trip are left out.
 */
export function bandCurves(device: Device, options: BandCurvesOptions = {}): BandCurves {
  // Features outside the plot bounds (stored rows from before the curve limits) are left off: they would only
  // stretch the default range.
  const featuresA = bandFeatureCurrentsA(device).filter((f) => f >= PLOT_MIN_A && f <= PLOT_MAX_A);
  const lowestA = featuresA[0] ?? 1;
  const highestA = featuresA[featuresA.length - 1] ?? 10;
  const fromA = options.fromA ?? Math.max(PLOT_MIN_A, lowestA * 0.8);
  const defaultToA = Math.min(Math.max(highestA * 2, fromA * 50), PLOT_MAX_A, fromA * 10 ** MAX_PLOT_DECADES);
  const toA = options.toA ?? defaultToA;
  const perDecade = options.pointsPerDecade ?? 40;
  if (!(fromA > 0) || !Number.isFinite(fromA)) {
    throw new EngineError('invalid-input', 'BAD_RANGE', `fromA must be a positive number (got ${fromA})`, 'fromA');
  }
  if (!(toA > fromA) || !Number.isFinite(toA)) {
    throw new EngineError(
      'invalid-input',
      'BAD_RANGE',
      `Plot range must satisfy 0 < fromA < toA (got ${fromA}, ${toA})`,
      'toA',
    );
  }
  // Bounded work whatever the input: the number of samples grows with the decades spanned.
  if (Math.log10(toA) - Math.log10(fromA) > MAX_PLOT_DECADES) {
    throw new EngineError(
      'invalid-input',
      'RANGE_TOO_WIDE',
      `The plot may span at most ${MAX_PLOT_DECADES} decades of current (got ${fromA} A to ${toA} A)`,
      'toA',
    );
  }
  if (!(perDecade >= 1 && perDecade <= 1000)) {
    throw new EngineError(
      'invalid-input',
      'BAD_DENSITY',
      'pointsPerDecade must be between 1 and 1000',
      'pointsPerDecade',
    );
  }
  const decades = Math.log10(toA) - Math.log10(fromA);
  const n = Math.max(2, Math.ceil(decades * perDecade) + 1);
  const currents = new Set<number>();
  for (let i = 0; i < n; i += 1) currents.add(fromA * Math.pow(toA / fromA, i / (n - 1)));
  const nudge = 1e-6;
  for (const f of featuresA) {
    for (const x of [f * (1 - nudge), f, f * (1 + nudge)]) if (x >= fromA && x <= toA) currents.add(x);
  }
  const sorted = Array.from(currents).sort((a, b) => a - b);
  const min: [number, number][] = [];
  const max: [number, number][] = [];
  for (const currentA of sorted) {
    const band = readBand(device, currentA);
    if (band.minS !== null) min.push([currentA, band.minS]);
    if (band.maxS !== null) max.push([currentA, band.maxS]);
  }
  return { fromA, toA, min, max, featuresA };
}
