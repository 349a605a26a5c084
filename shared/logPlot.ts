/**
 * Pure helpers of the log-log time-current plot, shared by the screen's plot (components/plot) and the study
 * report's plot (server/pdf/tccPlot.ts): log scales, decade ticks, tick and readout labels, log-log interpolation
 * for the value readout, clipping and label placement. No React / React Native imports.
 */

import { formatSig, MISSING } from './numberFormat';

/** A point of a time-current curve: [current, seconds]. */
export type CurvePoint = readonly [number, number];

/** A pixel position [x, y]. */
export type Px = [number, number];

export interface LogScale {
  /** Values of the domain ends (both > 0). */
  domain: readonly [number, number];
  /** Pixel positions of the domain ends (may be reversed, e.g. a time axis growing upwards). */
  range: readonly [number, number];
  /** Value → pixel. Non-positive values give NaN. */
  toPx(value: number): number;
  /** Pixel → value (inverse of toPx). */
  fromPx(px: number): number;
  /** Pixels per decade (absolute). */
  pxPerDecade: number;
}

/** True when v is a finite number above zero (drawable on a log axis). */
export function isPositive(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v > 0;
}

/**
 * Log scale: px = r0 + (log10 v − log10 d0) / (log10 d1 − log10 d0) · (r1 − r0).
 * Throws on a domain that is not positive and increasing.
 */
export function logScale(domain: readonly [number, number], range: readonly [number, number]): LogScale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  if (!isPositive(d0) || !isPositive(d1) || !(d1 > d0)) {
    throw new RangeError(`log scale domain must satisfy 0 < d0 < d1 (got ${d0}, ${d1})`);
  }
  const l0 = Math.log10(d0);
  const span = Math.log10(d1) - l0;
  const k = (r1 - r0) / span;
  return {
    domain,
    range,
    toPx: (value: number) => (value > 0 ? r0 + (Math.log10(value) - l0) * k : Number.NaN),
    fromPx: (px: number) => Math.pow(10, l0 + (px - r0) / k),
    pxPerDecade: Math.abs(k),
  };
}

/** Smallest and largest positive finite value of a list (null when there is none). */
export function positiveExtent(values: Iterable<number>): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!isPositive(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? [lo, hi] : null;
}

/**
 * Extends [lo, hi] outwards to whole decades, at least `minDecades` wide (grown on the high side first, then the
 * low side, alternately). A value exactly on a decade stays there (with a 1e-9 relative allowance for float noise).
 */
export function extendToDecades(lo: number, hi: number, minDecades = 2): [number, number] {
  if (!isPositive(lo) || !isPositive(hi)) throw new RangeError(`decade range needs positive values (got ${lo}, ${hi})`);
  const a = Math.min(lo, hi);
  const b = Math.max(lo, hi);
  let e0 = Math.floor(Math.log10(a) + 1e-9);
  let e1 = Math.ceil(Math.log10(b) - 1e-9);
  if (e1 <= e0) e1 = e0 + 1;
  let growHigh = true;
  while (e1 - e0 < minDecades) {
    if (growHigh) e1 += 1;
    else e0 -= 1;
    growHigh = !growHigh;
  }
  return [decade(e0), decade(e1)];
}

/** 10^exponent, exact for the integer exponents used on the axes (avoids 10 ** -2 = 0.010000000000000002 style noise). */
export function decade(exponent: number): number {
  return exponent >= 0 ? Math.pow(10, exponent) : 1 / Math.pow(10, -exponent);
}

export interface DecadeTicks {
  /** Decade values (10^k) inside the domain, ascending. */
  major: number[];
  /** 2..9 × 10^k inside the domain, ascending. */
  minor: number[];
}

/** Major (10^k) and minor (2..9 × 10^k) tick values inside [lo, hi] (ends included, 1e-9 relative allowance). */
export function decadeTicks(lo: number, hi: number): DecadeTicks {
  if (!isPositive(lo) || !isPositive(hi) || !(hi > lo)) return { major: [], minor: [] };
  const inside = (v: number) => v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9);
  const major: number[] = [];
  const minor: number[] = [];
  const e0 = Math.floor(Math.log10(lo) + 1e-9);
  const e1 = Math.ceil(Math.log10(hi) - 1e-9);
  for (let e = e0; e <= e1; e += 1) {
    const d = decade(e);
    if (inside(d)) major.push(d);
    for (let m = 2; m <= 9; m += 1) {
      const v = m * d;
      if (inside(v)) minor.push(v);
    }
  }
  return { major, minor };
}

/**
 * Every how many decades a tick label fits: the smallest step of 1, 2, 3, 5, 10 whose spacing leaves room for the
 * widest label plus a gap.
 */
export function labelEvery(pxPerDecade: number, labelWidthPx: number, gapPx = 8): number {
  for (const step of [1, 2, 3, 5, 10]) {
    if (step * pxPerDecade >= labelWidthPx + gapPx) return step;
  }
  return 10;
}

export { formatSig };

/** Plain label of a decade value: 0.01, 0.1, 1, 10, 100, 1000. */
export function formatPlain(value: number): string {
  if (!isPositive(value)) return '';
  const e = Math.round(Math.log10(value));
  if (Math.abs(value - decade(e)) <= value * 1e-9) {
    return e >= 0 ? String(decade(e)) : `0.${'0'.repeat(-e - 1)}1`;
  }
  return formatSig(value, 3);
}

/** Compact tick label: 10, 100, 1k, 10k, 100k, 1M (below 1000 as formatPlain). Common practice, no source. */
export function formatCompact(value: number): string {
  if (!isPositive(value)) return '';
  if (value >= 1e6 * (1 - 1e-9)) return `${formatSig(value / 1e6, 3)}M`;
  if (value >= 1e3 * (1 - 1e-9)) return `${formatSig(value / 1e3, 3)}k`;
  return formatPlain(value);
}

export type CurrentUnit = 'A' | '×In';

/** Tick label of the current axis: amperes compact (1k, 10k), multiples plain. */
export function formatCurrentTick(value: number, unit: CurrentUnit): string {
  return unit === 'A' ? formatCompact(value) : formatPlain(value);
}

/** Tick label of the time axis, seconds: 0.01, 0.1, 1, 10, 100, 1000. */
export function formatTimeTick(valueS: number): string {
  return formatPlain(valueS);
}

/** Readout of a current, three significant figures: amperes below 1000 ("850 A"), kiloamperes above ("12.3 kA",
 * "20.0 kA"); multiples as "12.3 × In". With `trim`, trailing zeros go ("20 kA"), as for range ends. */
export function formatCurrent(value: number, unit: CurrentUnit, trim = false): string {
  if (!isPositive(value)) return MISSING;
  if (unit === '×In') return `${formatSig(value, 3, trim)} × In`;
  if (value >= 1000 * (1 - 5e-4)) return `${formatSig(value / 1000, 3, trim)} kA`;
  return `${formatSig(value, 3, trim)} A`;
}

/** Readout of a time in seconds, three significant figures: "0.0831 s", "0.300 s", "12.3 s", "1500 s"
 * (with `trim`: "0.3 s"). */
export function formatTime(valueS: number, trim = false): string {
  if (!isPositive(valueS)) return MISSING;
  return `${formatSig(valueS, 3, trim)} s`;
}

/**
 * Drawable points of a curve: pairs of finite positive numbers, in current order (a stable sort, so a vertical
 * step given as two points at the same current keeps its order).
 */
export function cleanCurve(points: readonly (readonly number[])[] | null | undefined): CurvePoint[] {
  if (!Array.isArray(points)) return [];
  const out: CurvePoint[] = [];
  for (const p of points) {
    if (Array.isArray(p) && p.length >= 2 && isPositive(p[0]) && isPositive(p[1])) out.push([p[0], p[1]]);
  }
  let sorted = true;
  for (let i = 1; i < out.length; i += 1) if (out[i][0] < out[i - 1][0]) sorted = false;
  return sorted ? out : out.slice().sort((a, b) => a[0] - b[0]);
}

export type CurveRead =
  | { status: 'value'; timeS: number }
  /** The current is below the curve's first point (on a maximum curve: the device is not sure to clear). */
  | { status: 'below'; firstCurrent: number }
  /** The current is beyond the curve's last point: the curve is not read beyond its data. */
  | { status: 'above'; lastCurrent: number }
  | { status: 'empty' };

/**
 * Reads a curve at `current` by log-log interpolation between the neighbouring points:
 * log t = log t0 + (log x − log x0) / (log x1 − log x0) · (log t1 − log t0)  (straight line on log-log axes).
 * Points must be clean (see cleanCurve). At a vertical step (two points at one current) the later point's time is
 * taken on the step. Outside the data: 'below' / 'above', never extrapolated.
 */
export function readCurveLogLog(points: readonly CurvePoint[], current: number): CurveRead {
  if (points.length === 0) return { status: 'empty' };
  if (!isPositive(current)) return { status: 'below', firstCurrent: points[0][0] };
  const first = points[0];
  const last = points[points.length - 1];
  const tol = 1e-12;
  if (current < first[0] * (1 - tol)) return { status: 'below', firstCurrent: first[0] };
  if (current > last[0] * (1 + tol)) return { status: 'above', lastCurrent: last[0] };
  for (let i = points.length - 1; i >= 0; i -= 1) {
    if (Math.abs(points[i][0] - current) <= current * tol) return { status: 'value', timeS: points[i][1] };
  }
  for (let i = 1; i < points.length; i += 1) {
    const [x0, t0] = points[i - 1];
    const [x1, t1] = points[i];
    if (current > x0 && current < x1) {
      const f = (Math.log10(current) - Math.log10(x0)) / (Math.log10(x1) - Math.log10(x0));
      return { status: 'value', timeS: Math.pow(10, Math.log10(t0) + f * (Math.log10(t1) - Math.log10(t0))) };
    }
  }
  return { status: 'above', lastCurrent: last[0] };
}

/** Rectangle in log10 space: x = log10(current), y = log10(time). */
export interface LogRect {
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

/**
 * Clips a polyline (log space) to a rectangle, segment by segment (Liang–Barsky). Returns the visible pieces;
 * a piece has at least two points. Used to keep far-off points (1e-300 s, 1e12 A) out of pixel coordinates.
 */
export function clipPolyline(points: readonly Px[], rect: LogRect): Px[][] {
  const pieces: Px[][] = [];
  let current: Px[] = [];
  const flush = () => {
    if (current.length >= 2) pieces.push(current);
    current = [];
  };
  for (let i = 1; i < points.length; i += 1) {
    const seg = clipSegment(points[i - 1], points[i], rect);
    if (!seg) {
      flush();
      continue;
    }
    const [a, b] = seg;
    const last = current[current.length - 1];
    if (!last || last[0] !== a[0] || last[1] !== a[1]) {
      flush();
      current.push(a);
    }
    current.push(b);
  }
  if (points.length === 1) {
    const [x, y] = points[0];
    if (x >= rect.x0 && x <= rect.x1 && y >= rect.y0 && y <= rect.y1) current.push([x, y]);
  }
  flush();
  return pieces;
}

function clipSegment(a: Px, b: Px, r: LogRect): [Px, Px] | null {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  let t0 = 0;
  let t1 = 1;
  const p = [-dx, dx, -dy, dy];
  const q = [a[0] - r.x0, r.x1 - a[0], a[1] - r.y0, r.y1 - a[1]];
  for (let i = 0; i < 4; i += 1) {
    if (p[i] === 0) {
      if (q[i] < 0) return null;
    } else {
      const t = q[i] / p[i];
      if (p[i] < 0) {
        if (t > t1) return null;
        if (t > t0) t0 = t;
      } else {
        if (t < t0) return null;
        if (t < t1) t1 = t;
      }
    }
  }
  const at = (t: number): Px => (t === 0 ? [a[0], a[1]] : t === 1 ? [b[0], b[1]] : [a[0] + t * dx, a[1] + t * dy]);
  return [at(t0), at(t1)];
}

/** Clips a closed polygon (log space) to a rectangle (Sutherland–Hodgman). Returns [] when nothing is inside. */
export function clipPolygon(points: readonly Px[], rect: LogRect): Px[] {
  type Edge = { inside: (p: Px) => boolean; cut: (a: Px, b: Px) => Px };
  const cutX =
    (x: number) =>
    (a: Px, b: Px): Px => [x, a[1] + ((b[1] - a[1]) * (x - a[0])) / (b[0] - a[0])];
  const cutY =
    (y: number) =>
    (a: Px, b: Px): Px => [a[0] + ((b[0] - a[0]) * (y - a[1])) / (b[1] - a[1]), y];
  const edges: Edge[] = [
    { inside: (p) => p[0] >= rect.x0, cut: cutX(rect.x0) },
    { inside: (p) => p[0] <= rect.x1, cut: cutX(rect.x1) },
    { inside: (p) => p[1] >= rect.y0, cut: cutY(rect.y0) },
    { inside: (p) => p[1] <= rect.y1, cut: cutY(rect.y1) },
  ];
  let out: Px[] = points.map((p) => [p[0], p[1]]);
  for (const edge of edges) {
    const input = out;
    out = [];
    for (let i = 0; i < input.length; i += 1) {
      const cur = input[i];
      const prev = input[(i + input.length - 1) % input.length];
      const curIn = edge.inside(cur);
      const prevIn = edge.inside(prev);
      if (curIn) {
        if (!prevIn) out.push(edge.cut(prev, cur));
        out.push(cur);
      } else if (prevIn) {
        out.push(edge.cut(prev, cur));
      }
    }
    if (out.length === 0) return [];
  }
  return out.length >= 3 ? out : [];
}

/**
 * The band between the two curves as one closed outline: the maximum curve forward (rising current), then the
 * minimum curve backward. Null when either curve is empty (then only the maximum curve is drawn as a line).
 */
export function bandOutline(max: readonly CurvePoint[], min: readonly CurvePoint[]): CurvePoint[] | null {
  if (max.length === 0 || min.length === 0) return null;
  return [...max, ...min.slice().reverse()];
}

/** SVG path data of a polyline in pixels ("M x y L x y …"), rounded to 0.1 px; closed with Z when asked. */
export function pathData(points: readonly Px[], close = false): string {
  if (points.length === 0) return '';
  const r = (v: number) => Math.round(v * 10) / 10;
  let d = `M${r(points[0][0])} ${r(points[0][1])}`;
  for (let i = 1; i < points.length; i += 1) d += `L${r(points[i][0])} ${r(points[i][1])}`;
  return close ? `${d}Z` : d;
}
