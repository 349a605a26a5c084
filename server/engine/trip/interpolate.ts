import { EngineError, type EngineWarning } from '../errors';
import { formatSig } from '../../../shared/numberFormat';

/** A point of a time-current curve: [current (amperes or multiple of rating), seconds]. */
export type TimeCurrentPoint = readonly [number, number];

/**
 * Checks a point list read off a time-current curve: at least one point, every current and time finite and
 * positive (log-log axes), current strictly increasing. With `timeNonIncreasing` (the default for trip
 * curves) a time may not exceed the previous point's time.
 * Throws EngineError 'invalid-input' naming the field and index, e.g. `device.max[3]`.
 */
export function validateCurvePoints(
  points: readonly TimeCurrentPoint[],
  field: string,
  options: { timeNonIncreasing?: boolean } = {},
): void {
  const timeNonIncreasing = options.timeNonIncreasing ?? true;
  if (!Array.isArray(points) || points.length === 0) {
    throw new EngineError(
      'invalid-input',
      'CURVE_EMPTY',
      `${field}: give at least one [current, seconds] point`,
      field,
    );
  }
  for (let i = 0; i < points.length; i += 1) {
    const point = points[i];
    const at = `${field}[${i}]`;
    if (!Array.isArray(point) || point.length !== 2) {
      throw new EngineError('invalid-input', 'CURVE_POINT_SHAPE', `${at}: a point is a pair [current, seconds]`, at);
    }
    const [current, timeS] = point;
    if (typeof current !== 'number' || !Number.isFinite(current) || current <= 0) {
      throw new EngineError(
        'invalid-input',
        'CURVE_POINT_NON_POSITIVE',
        `${at}: current ${String(current)} must be a positive number`,
        at,
      );
    }
    if (typeof timeS !== 'number' || !Number.isFinite(timeS) || timeS <= 0) {
      throw new EngineError(
        'invalid-input',
        'CURVE_POINT_NON_POSITIVE',
        `${at}: time ${String(timeS)} s must be a positive number`,
        at,
      );
    }
    if (i > 0) {
      const [prevCurrent, prevTimeS] = points[i - 1];
      if (!(current > prevCurrent)) {
        throw new EngineError(
          'invalid-input',
          'CURVE_POINTS_UNSORTED',
          `${at}: current ${current} must be greater than the previous point's ${prevCurrent} (points sorted by current)`,
          at,
        );
      }
      if (timeNonIncreasing && timeS > prevTimeS) {
        throw new EngineError(
          'invalid-input',
          'CURVE_TIME_RISES',
          `${at}: time ${timeS} s exceeds the previous point's ${prevTimeS} s; a trip curve does not rise with current`,
          at,
        );
      }
    }
  }
}

export type ClampSide = 'below-data' | 'above-data';

export interface CurveReading {
  /** Time read off the curve, seconds. */
  timeS: number;
  /** Set when the current lies outside the published points and the end point's time was used. */
  clamped: ClampSide | null;
  /** Indices of the two points interpolated between, or the one point read exactly / clamped to. */
  segment: [number, number] | [number];
  warnings: EngineWarning[];
}

/**
 * Log-log interpolation between points of a time-current curve:
 *   log t = log t_i + (log x − log x_i) / (log x_{i+1} − log x_i) · (log t_{i+1} − log t_i),
 * i.e. a straight line between neighbouring points on log-log axes (docs/ARCHITECTURE.md, Clearing time from a trip
 * band). Exact at the points. Outside the points the end point's time is used (clamped) and a BAND_BEYOND_DATA warning
 * says so: the curve is never extrapolated. The points must already be valid (see validateCurvePoints); `field` names
 * the curve in warnings.
 */
export function interpolateLogLog(points: readonly TimeCurrentPoint[], current: number, field: string): CurveReading {
  const last = points.length - 1;
  if (current < points[0][0]) {
    return {
      timeS: points[0][1],
      clamped: 'below-data',
      segment: [0],
      warnings: [
        {
          code: 'BAND_BEYOND_DATA',
          message: `${field}: ${fmt(current)} is below the lowest published current ${fmt(points[0][0])}; the first point's time ${fmt(points[0][1])} s is used (not extrapolated)`,
        },
      ],
    };
  }
  if (current > points[last][0]) {
    return {
      timeS: points[last][1],
      clamped: 'above-data',
      segment: [last],
      warnings: [
        {
          code: 'BAND_BEYOND_DATA',
          message: `${field}: ${fmt(current)} is above the highest published current ${fmt(points[last][0])}; the last point's time ${fmt(points[last][1])} s is used (not extrapolated)`,
        },
      ],
    };
  }
  // Binary search for the segment [lo, lo + 1] with x_lo <= current <= x_{lo+1}.
  let lo = 0;
  let hi = last;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (points[mid][0] <= current) lo = mid;
    else hi = mid;
  }
  if (current === points[lo][0]) return { timeS: points[lo][1], clamped: null, segment: [lo], warnings: [] };
  if (current === points[hi][0]) return { timeS: points[hi][1], clamped: null, segment: [hi], warnings: [] };
  const [x0, t0] = points[lo];
  const [x1, t1] = points[hi];
  const fraction = Math.log(current / x0) / Math.log(x1 / x0);
  // Kept between t0 and t1 so rounding never makes the line rise between two points.
  const raw = Math.exp(Math.log(t0) + fraction * Math.log(t1 / t0));
  const timeS = Math.min(Math.max(t0, t1), Math.max(Math.min(t0, t1), raw));
  return { timeS, clamped: null, segment: [lo, hi], warnings: [] };
}

/** Compact number formatting for messages (four significant figures, shared/numberFormat.ts). */
export function fmt(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  return formatSig(value, 4);
}
