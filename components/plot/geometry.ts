/** The time-current plot's geometry: domains, prepared curves, and the layout of axes, bands, lines, marks and labels (pure). */
import { colors } from '../theme';
import { densify, monoTextWidth, nearestPointOfBox, placeLabel, stackLineLabels, type Box } from './labels';
import { seriesStyle, type SeriesStyle } from './palette';
import {
  bandOutline,
  cleanCurve,
  clipPolygon,
  clipPolyline,
  decadeTicks,
  extendToDecades,
  formatCurrent,
  formatCurrentTick,
  formatTime,
  formatTimeTick,
  isPositive,
  labelEvery,
  logScale,
  pathData,
  positiveExtent,
  type CurrentUnit,
  type CurvePoint,
  type LogRect,
  type LogScale,
  type Px,
} from '../../shared/logPlot';
import { type PreparedSeries, type TimeCurrentMark, type TimeCurrentSeries, type TimeCurrentVertical } from './types';

export const NARROW_PX = 560;

export function validRange(r: readonly [number, number] | undefined): [number, number] | null {
  return r && isPositive(r[0]) && isPositive(r[1]) && r[1] > r[0] ? [r[0], r[1]] : null;
}

export function prepareSeries(series: readonly TimeCurrentSeries[]): PreparedSeries[] {
  return series.map((s, i) => ({
    id: s.id,
    label: s.label,
    style: seriesStyle(i),
    min: cleanCurve(s.min),
    max: cleanCurve(s.max),
  }));
}

/** The current axis: as given, else the data, the verticals and the marks widened to whole decades (at least two). */
export function currentDomain(
  given: readonly [number, number] | undefined,
  prepared: PreparedSeries[],
  verticals: readonly TimeCurrentVertical[] | undefined,
  marks: readonly TimeCurrentMark[] | undefined,
  unit: CurrentUnit,
): [number, number] {
  const valid = validRange(given);
  if (valid) return valid;
  const values: number[] = [];
  for (const s of prepared) for (const p of [...s.min, ...s.max]) values.push(p[0]);
  for (const v of verticals ?? []) values.push(v.currentA);
  for (const m of marks ?? []) values.push(m.currentA);
  const extent = positiveExtent(values);
  if (!extent) return unit === 'A' ? [10, 100_000] : [0.1, 100];
  return extendToDecades(extent[0], extent[1], 2);
}

export function inRanges(m: TimeCurrentMark, iDom: [number, number], tDom: [number, number]): boolean {
  return (
    isPositive(m.currentA) &&
    isPositive(m.timeS) &&
    m.currentA >= iDom[0] &&
    m.currentA <= iDom[1] &&
    m.timeS >= tDom[0] &&
    m.timeS <= tDom[1]
  );
}

export interface AxisTick {
  pos: number;
  label: string | null;
  anchor: 'start' | 'middle' | 'end';
}

export interface PlotGeometry {
  width: number;
  height: number;
  left: number;
  top: number;
  right: number;
  pw: number;
  ph: number;
  unit: CurrentUnit;
  tickFont: number;
  labelFont: number;
  xs: LogScale;
  ys: LogScale;
  majorX: AxisTick[];
  majorY: AxisTick[];
  minorX: number[];
  minorY: number[];
  bands: { id: string; style: SeriesStyle; fill: string | null; max: string[]; min: string[] }[];
  verticals: { x: number; tone: 'full' | 'reduced' | 'neutral'; text: string; box: Box }[];
  marks: {
    x: number;
    y: number;
    color: string;
    text: string;
    box: Box;
    leader: { x1: number; y1: number; x2: number; y2: number } | null;
  }[];
  /** Pixel points along the drawn curves (inside the plot area), for keeping labels and the readout off them. */
  curvePoints: Px[];
  /** Boxes of the labels and dots drawn inside the plot area. */
  labelBoxes: Box[];
}

export function layoutPlot(args: {
  width: number;
  height?: number;
  iDom: [number, number];
  tDom: [number, number];
  unit: CurrentUnit;
  prepared: PreparedSeries[];
  verticals: readonly TimeCurrentVertical[];
  marks: readonly TimeCurrentMark[];
}): PlotGeometry {
  const { width, iDom, tDom, unit, prepared } = args;
  const narrow = width < NARROW_PX;
  const tickFont = narrow ? 11 : 12;
  const labelFont = narrow ? 11 : 12;
  const yTicks = decadeTicks(tDom[0], tDom[1]);
  const xTicks = decadeTicks(iDom[0], iDom[1]);
  const yLabelW = Math.max(
    ...yTicks.major.map((v) => monoTextWidth(formatTimeTick(v), tickFont)),
    monoTextWidth('100', tickFont),
  );
  const left = Math.ceil(yLabelW + 12);
  const right = narrow ? 12 : 18;
  const top = 24;
  const bottom = tickFont + 10 + 24;
  const pw = Math.max(60, width - left - right);
  const iDec = Math.log10(iDom[1] / iDom[0]);
  const tDec = Math.log10(tDom[1] / tDom[0]);
  // Decades about as tall as they are wide (a little flatter), within limits set by the width.
  const autoPh = Math.min(Math.min(520, pw * 1.25), Math.max(Math.max(220, pw * 0.55), pw * (tDec / iDec) * 0.8));
  const ph = args.height && args.height > top + bottom + 60 ? args.height - top - bottom : Math.round(autoPh);
  const height = ph + top + bottom;
  const xs = logScale(iDom, [0, pw]);
  const ys = logScale(tDom, [ph, 0]);

  // Tick labels: every decade where they fit, else every 2nd, 3rd… (aligned on exponents divisible by the step).
  const xLabelW = Math.max(...xTicks.major.map((v) => monoTextWidth(formatCurrentTick(v, unit), tickFont)), 1);
  const xStep = labelEvery(xs.pxPerDecade, xLabelW, 10);
  const yStep = labelEvery(ys.pxPerDecade, tickFont + 4, 2);
  const keep = (v: number, step: number) => Math.round(Math.log10(v)) % step === 0;
  const majorX: AxisTick[] = xTicks.major.map((v) => {
    const pos = xs.toPx(v);
    const anchor = pos < xLabelW / 2 ? 'start' : pos > pw - xLabelW / 2 ? 'end' : 'middle';
    return { pos, label: keep(v, xStep) ? formatCurrentTick(v, unit) : null, anchor };
  });
  const majorY: AxisTick[] = yTicks.major.map((v) => ({
    pos: ys.toPx(v),
    label: keep(v, yStep) ? formatTimeTick(v) : null,
    anchor: 'end',
  }));
  const minorX = xs.pxPerDecade >= 18 ? xTicks.minor.map((v) => xs.toPx(v)) : [];
  const minorY = ys.pxPerDecade >= 18 ? yTicks.minor.map((v) => ys.toPx(v)) : [];

  // Curves: clipped in log space to the visible domain widened by one decade (the SVG clip then cuts exactly),
  // so far-off points never become huge pixel coordinates.
  const lx0 = Math.log10(iDom[0]);
  const lx1 = Math.log10(iDom[1]);
  const ly0 = Math.log10(tDom[0]);
  const ly1 = Math.log10(tDom[1]);
  const rect: LogRect = { x0: lx0 - 1, x1: lx1 + 1, y0: ly0 - 1, y1: ly1 + 1 };
  const toLog = (pts: readonly CurvePoint[]): Px[] => pts.map((p) => [Math.log10(p[0]), Math.log10(p[1])]);
  const toPx = (p: Px): Px => [((p[0] - lx0) / (lx1 - lx0)) * pw, ph - ((p[1] - ly0) / (ly1 - ly0)) * ph];
  const curvePoints: Px[] = [];
  const lines = (pts: readonly CurvePoint[]) =>
    clipPolyline(toLog(pts), rect).map((piece) => {
      const px = piece.map(toPx);
      for (const p of densify(px, 5)) if (p[0] >= 0 && p[0] <= pw && p[1] >= 0 && p[1] <= ph) curvePoints.push(p);
      return pathData(px);
    });
  const bands = prepared.map((s) => {
    const outline = bandOutline(s.max, s.min);
    const poly = outline ? clipPolygon(toLog(outline), rect) : [];
    return {
      id: s.id,
      style: s.style,
      fill: poly.length ? pathData(poly.map(toPx), true) : null,
      max: lines(s.max),
      min: lines(s.min),
    };
  });

  // Vertical lines and their labels, stacked in rows at the top of the plot.
  const rowH = labelFont + 6;
  const vIn = args.verticals
    .filter((v) => isPositive(v.currentA) && v.currentA >= iDom[0] && v.currentA <= iDom[1])
    .map((v) => ({
      x: xs.toPx(v.currentA),
      tone: v.tone ?? 'neutral',
      text: `${v.label} ${formatCurrent(v.currentA, unit)}`,
    }));
  const stacked = stackLineLabels(
    vIn.map((v) => ({ x: v.x, width: monoTextWidth(v.text, labelFont) })),
    2,
    pw - 2,
  );
  const verticals = vIn.map((v, i) => ({
    ...v,
    box: { x: stacked[i].x, y: 4 + stacked[i].row * (rowH + 2), width: monoTextWidth(v.text, labelFont), height: rowH },
  }));

  // Marks: a dot, and a label placed clear of the other labels, of the lines and (where it can) of the curves.
  const colorOf = new Map(prepared.map((s) => [s.id, s.style.color]));
  const bounds: Box = { x: 2, y: 2, width: pw - 4, height: ph - 4 };
  const dots = args.marks
    .filter((m) => inRanges(m, iDom, tDom))
    .map((m) => ({ m, x: xs.toPx(m.currentA), y: ys.toPx(m.timeS) }));
  const boxes: Box[] = verticals.map((v) => ({ ...v.box, x: v.box.x - 2, width: v.box.width + 4 }));
  for (const d of dots) boxes.push({ x: d.x - 7, y: d.y - 7, width: 14, height: 14 });
  const linesX = verticals.map((v) => v.x);
  const marks = dots.map(({ m, x, y }) => {
    const text = `${m.label} ${formatTime(m.timeS)}`;
    const box = placeLabel(
      [x, y],
      monoTextWidth(text, labelFont),
      rowH,
      bounds,
      { boxes, linesX, points: curvePoints },
      10,
    );
    boxes.push({ ...box, x: box.x - 2, width: box.width + 4 });
    // A leader from the dot's rim to a label that sits away from it.
    const [nx, ny] = nearestPointOfBox([x, y], { ...box, x: box.x - 2, width: box.width + 4 });
    const dist = Math.hypot(nx - x, ny - y);
    const leader = dist > 16 ? { x1: x + ((nx - x) * 8) / dist, y1: y + ((ny - y) * 8) / dist, x2: nx, y2: ny } : null;
    return { x, y, color: (m.seriesId && colorOf.get(m.seriesId)) || colors.ink, text, box, leader };
  });

  const labelBoxes = boxes;
  return {
    width,
    height,
    left,
    top,
    right,
    pw,
    ph,
    unit,
    tickFont,
    labelFont,
    xs,
    ys,
    majorX,
    majorY,
    minorX,
    minorY,
    bands,
    verticals,
    marks,
    curvePoints,
    labelBoxes,
  };
}
