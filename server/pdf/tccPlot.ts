/**
 * A small log-log time-current plot drawn with vector lines in a PDF: decade grid, each device's minimum and
 * maximum curves (currents referred to the bus voltage), vertical lines at the arcing currents, the arc-duration
 * cap, and dots at the clearing points. Presentation choices are conventions (common practice, no source).
 */
import { rgb, type RGB } from 'pdf-lib';
import { BLACK, Canvas } from './canvas';
import type { PdfFonts } from './fonts';
import { clipPolyline, decade, decadeTicks, logScale } from '../../shared/logPlot';
import { formatSig } from './format';
import { textWidth } from './text';

export interface PlotCurve {
  label: string;
  /** [amperes at the bus voltage, seconds] */
  min: [number, number][];
  max: [number, number][];
}

export interface PlotMarker {
  currentA: number;
  label: string;
  dash?: boolean;
}

export interface PlotPoint {
  currentA: number;
  timeS: number;
  filled: boolean;
}

export interface PlotInput {
  curves: PlotCurve[];
  /** Vertical lines (arcing currents), amperes at the bus voltage. */
  markers: PlotMarker[];
  points: PlotPoint[];
  /** Horizontal line at the arc-duration cap, seconds. */
  capS: number | null;
  fromA: number;
  toA: number;
  fromS?: number;
  toS?: number;
}

/** Device curve colours for the report (not safety colours: those are kept for labels and hazard markers). */
export const CURVE_COLORS: RGB[] = [
  rgb(0.11, 0.3, 0.62),
  rgb(0.1, 0.47, 0.4),
  rgb(0.42, 0.24, 0.6),
  rgb(0.35, 0.35, 0.35),
  rgb(0.55, 0.38, 0.15),
];

/** Decade limits that contain [lo, hi], at least one decade and at most 16 wide whatever the data. */
export function decadeRange(lo: number, hi: number): [number, number] {
  let a = Math.floor(Math.log10(lo) + 1e-9);
  let b = Math.ceil(Math.log10(hi) - 1e-9);
  // Bounded grid whatever the data: never an infinite or NaN end.
  if (!Number.isFinite(a)) a = Number.isFinite(b) ? b - 1 : 0;
  if (!Number.isFinite(b)) b = a + 1;
  if (b <= a) b = a + 1;
  if (b - a > 16) a = b - 16;
  return [decade(a), decade(b)];
}

/**
 * Polyline (plot coordinates) clipped to the rectangle [x0,x1]×[y0,y1], as SVG path data (one M/L run per visible
 * piece); the clipping is the screen plot's (shared/logPlot.ts).
 */
export function clippedPath(points: [number, number][], x0: number, y0: number, x1: number, y1: number): string {
  return clipPolyline(points, { x0, x1, y0, y1 })
    .map((piece) => piece.map(([x, y], i) => `${i ? 'L' : 'M'} ${x.toFixed(2)} ${y.toFixed(2)}`).join(' '))
    .join(' ');
}

function currentTick(a: number): string {
  if (a >= 1000) return `${formatSig(a / 1000, 3)}k`;
  return formatSig(a, 3);
}

/**
 * Draws the plot in the box (x, y, w, h) of the canvas (top-down points), axes labels included. Returns the
 * colour used for each curve (same order as input.curves) for a legend.
 */
export function drawTimeCurrentPlot(
  cv: Canvas,
  fonts: PdfFonts,
  box: { x: number; y: number; w: number; h: number },
  input: PlotInput,
): RGB[] {
  const padL = 34;
  const padB = 24;
  const padT = 4 + 8 * input.markers.length;
  const padR = 6;
  const px0 = box.x + padL;
  const px1 = box.x + box.w - padR;
  const py0 = box.y + padT;
  const py1 = box.y + box.h - padB;
  const [ax0, ax1] = decadeRange(input.fromA, input.toA);
  const [ty0, ty1] = decadeRange(input.fromS ?? 0.01, input.toS ?? 1000);
  const X = logScale([ax0, ax1], [px0, px1]).toPx;
  const Y = logScale([ty0, ty1], [py1, py0]).toPx;
  const grey = rgb(0.78, 0.78, 0.78);
  const lightGrey = rgb(0.9, 0.9, 0.9);

  // Grid: decades (darker) and 2..9 within each decade (lighter).
  const iTicks = decadeTicks(ax0, ax1);
  const tTicks = decadeTicks(ty0, ty1);
  for (const a of iTicks.minor) cv.line(X(a), py0, X(a), py1, { width: 0.25, color: lightGrey });
  for (const t of tTicks.minor) cv.line(px0, Y(t), px1, Y(t), { width: 0.25, color: lightGrey });
  for (const a of iTicks.major) {
    cv.line(X(a), py0, X(a), py1, { width: 0.5, color: grey });
    cv.text(currentTick(a), X(a) - 20, py1 + 2, 40, { font: fonts.mono, size: 6, align: 'center' });
  }
  for (const t of tTicks.major) {
    cv.line(px0, Y(t), px1, Y(t), { width: 0.5, color: grey });
    cv.text(formatSig(t, 3), box.x, Y(t) - 3.5, padL - 3, { font: fonts.mono, size: 6, align: 'right' });
  }
  cv.rect(px0, py0, px1 - px0, py1 - py0, { stroke: BLACK, lineWidth: 0.6 });
  cv.text('Current, A at the bus voltage', px0, py1 + 11, px1 - px0, { font: fonts.text, size: 6.5, align: 'center' });
  cv.text('s', box.x, py0 - 1, 10, { font: fonts.text, size: 6.5 });

  const inside = (pts: [number, number][]) =>
    clippedPath(
      pts.filter(([a, s]) => a > 0 && s > 0).map(([a, s]) => [X(a), Y(s)] as [number, number]),
      px0,
      py0,
      px1,
      py1,
    );

  // Arc-duration cap and arcing-current markers.
  if (input.capS !== null && input.capS > ty0 && input.capS < ty1) {
    const yy = Y(input.capS);
    cv.line(px0, yy, px1, yy, { width: 0.5, color: BLACK, dash: [1, 2] });
    cv.text(`arc-duration cap ${formatSig(input.capS, 3)} s`, px1 - 90, yy - 8, 88, {
      font: fonts.text,
      size: 5.5,
      align: 'right',
    });
  }
  input.markers.forEach((m) => {
    if (!(m.currentA > ax0 && m.currentA < ax1)) return;
    const x = X(m.currentA);
    cv.line(x, py0, x, py1, { width: 0.7, color: BLACK, dash: m.dash ? [3, 2] : undefined });
  });
  // Marker labels in the band above the frame, one row each (left to right, top to bottom), so that they hide
  // no curve and no label crosses another marker's tick.
  [...input.markers]
    .sort((a, b) => a.currentA - b.currentA)
    .forEach((m, i) => {
      if (!(m.currentA > ax0 && m.currentA < ax1)) return;
      const x = X(m.currentA);
      const fitted = cv.fit(m.label, 100, { font: fonts.text, size: 5.5 });
      const lw = fitted.lines.length > 0 ? textWidth(fonts.text, fitted.lines[0], fitted.size) : 0;
      const ly = box.y + 1 + i * 8;
      cv.line(x, ly + 3, x, py0, { width: 0.4, color: BLACK, dash: m.dash ? [1, 1] : undefined });
      const right = x + 3 + lw < box.x + box.w;
      cv.drawFitted(fitted, right ? x + 3 : x - 3 - lw, ly, lw + 1, { font: fonts.text, size: fitted.size });
    });

  const colors: RGB[] = [];
  input.curves.forEach((c, i) => {
    const color = CURVE_COLORS[i % CURVE_COLORS.length];
    colors.push(color);
    const minPath = inside(c.min);
    const maxPath = inside(c.max);
    if (minPath) cv.path(minPath, 0, 0, { stroke: color, lineWidth: 0.6, dash: [2, 1.5] });
    if (maxPath) cv.path(maxPath, 0, 0, { stroke: color, lineWidth: 1.1 });
  });

  for (const p of input.points) {
    if (!(p.currentA > ax0 && p.currentA < ax1 && p.timeS > ty0 && p.timeS < ty1)) continue;
    cv.circle(
      X(p.currentA),
      Y(p.timeS),
      2.2,
      p.filled ? { fill: BLACK } : { fill: rgb(1, 1, 1), stroke: BLACK, lineWidth: 0.8 },
    );
  }
  return colors;
}
