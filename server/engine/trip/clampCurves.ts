import { CURVE_LIMITS } from '../../../shared/schemas/device';

type Point = [number, number];

function isPoint(p: unknown): p is Point {
  return Array.isArray(p) && p.length === 2 && p.every((v) => typeof v === 'number' && Number.isFinite(v) && v > 0);
}

/**
 * A stored point list brought inside CURVE_LIMITS (rows saved before the limits existed): currents and times
 * clamped to their bounds, points whose clamped current does not rise above the previous one dropped, at most
 * CURVE_LIMITS.maxPoints kept (evenly thinned, first and last kept). Clamping keeps the order of currents and of
 * times, so a valid list stays valid. Anything that is not a list of positive finite pairs is returned unchanged
 * for the schema to refuse.
 */
export function clampCurvePoints(points: unknown, maxCurrent: number): unknown {
  if (!Array.isArray(points) || !points.every(isPoint)) return points;
  const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));
  const out: Point[] = [];
  for (const [current, timeS] of points as Point[]) {
    const c = clamp(current, CURVE_LIMITS.minCurrent, maxCurrent);
    const t = clamp(timeS, CURVE_LIMITS.minTimeS, CURVE_LIMITS.maxTimeS);
    const prev = out[out.length - 1];
    if (prev && !(c > prev[0])) continue;
    out.push([c, t]);
  }
  if (out.length <= CURVE_LIMITS.maxPoints) return out;
  const step = (out.length - 1) / (CURVE_LIMITS.maxPoints - 1);
  const thinned: Point[] = [];
  for (let i = 0; i < CURVE_LIMITS.maxPoints; i += 1) thinned.push(out[Math.round(i * step)]);
  return thinned;
}

/**
 * A stored device definition (parsed JSON, not yet validated) with every curve brought inside CURVE_LIMITS, so a
 * row saved before the limits existed still reads and cannot make plotting or sampling unbounded.
 */
export function clampStoredCurves(definition: unknown): unknown {
  if (typeof definition !== 'object' || definition === null) return definition;
  const d = { ...(definition as Record<string, unknown>) };
  switch (d.kind) {
    case 'fuse':
      for (const key of ['totalClearing', 'minimumMelt', 'averageMelt']) {
        if (d[key] !== undefined) d[key] = clampCurvePoints(d[key], CURVE_LIMITS.maxCurrentA);
      }
      break;
    case 'band': {
      const max = d.currentUnit === 'multiple' ? CURVE_LIMITS.maxMultiple : CURVE_LIMITS.maxCurrentA;
      d.min = clampCurvePoints(d.min, max);
      d.max = clampCurvePoints(d.max, max);
      break;
    }
    case 'thermal-magnetic':
      if (typeof d.thermal === 'object' && d.thermal !== null) {
        const t = d.thermal as Record<string, unknown>;
        d.thermal = {
          ...t,
          min: clampCurvePoints(t.min, CURVE_LIMITS.maxMultiple),
          max: clampCurvePoints(t.max, CURVE_LIMITS.maxMultiple),
        };
      }
      break;
    default:
      break;
  }
  return d;
}
