import React, { useCallback, useId, useMemo, useState } from 'react';
import {
  Pressable,
  View,
  type GestureResponderEvent,
  type LayoutChangeEvent,
  type PointerEvent as RNPointerEvent,
} from 'react-native';
import Svg, { Circle, ClipPath, Defs, G, Line, Path, Rect, Text as SvgText } from 'react-native-svg';
import { colors, fonts, radius, space } from '../theme';
import { T } from '../ui/Text';
import {
  boxesOverlap,
  densify,
  monoTextWidth,
  nearestPointOfBox,
  placeLabel,
  pointsInBox,
  stackLineLabels,
  type Box,
} from './labels';
import { MAX_CURVE_WIDTH, MIN_CURVE_DASH, MIN_CURVE_WIDTH, seriesStyle, type SeriesStyle } from './palette';
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
  readCurveLogLog,
  type CurrentUnit,
  type CurvePoint,
  type CurveRead,
  type LogRect,
  type LogScale,
  type Px,
} from './scales';

/** One protective device's band. Current in the plot's unit (amperes, or multiples of rating), time in seconds. */
export interface TimeCurrentSeries {
  id: string;
  /** Legend and readout name, e.g. "CB-2 feeder breaker". */
  label: string;
  /** Minimum curve, [current, seconds] by rising current; may be empty. */
  min: readonly (readonly [number, number])[];
  /** Maximum (total clearing) curve, [current, seconds] by rising current. */
  max: readonly (readonly [number, number])[];
}

/** A vertical line across the plot, e.g. at the full or reduced arcing current. */
export interface TimeCurrentVertical {
  /** Current in the plot's unit (amperes, or multiples of rating when currentUnit is '×In'). */
  currentA: number;
  /** Short name; the plot adds the current ("Full arcing" → "Full arcing 18.2 kA"). */
  label: string;
  /** 'full': solid, 'reduced': dashed, 'neutral' (default): dotted and muted. */
  tone?: 'full' | 'reduced' | 'neutral';
}

/** A point marked with a dot, e.g. where a device's maximum curve clears the arcing current. */
export interface TimeCurrentMark {
  /** Current in the plot's unit (amperes, or multiples of rating when currentUnit is '×In'). */
  currentA: number;
  timeS: number;
  /** Short name; the plot adds the time ("CB-2" → "CB-2 0.300 s"). */
  label: string;
  /** Colours the dot as that series; otherwise ink. */
  seriesId?: string;
}

export interface TimeCurrentPlotProps {
  series: readonly TimeCurrentSeries[];
  /** 'A': currents in amperes, axis "Current (A)"; '×In': multiples of the device rating. */
  currentUnit: CurrentUnit;
  verticals?: readonly TimeCurrentVertical[];
  marks?: readonly TimeCurrentMark[];
  /** Time axis, seconds (default [0.01, 1000]). */
  timeRangeS?: readonly [number, number];
  /** Current axis in the plot's unit (default: the data, the verticals and the marks, extended to whole decades). */
  currentRange?: readonly [number, number];
  /** Height of the drawing (axes included, legend and lists excluded), px. Default: from the width and the decades. */
  height?: number;
  testID?: string;
  /** Shown over an empty grid when no series has a drawable point (default "No trip band to show."). */
  emptyMessage?: string;
  /** The list of marks under the plot ("CB-2 at 18.2 kA: 0.300 s"); default true. */
  showMarkList?: boolean;
  /** Replaces the generated screen-reader summary. */
  accessibilityLabel?: string;
}

const DEFAULT_TIME_RANGE_S: readonly [number, number] = [0.01, 1000];
const NARROW_PX = 560;

/** A reading position, kept as values so that it survives a change of width. */
interface Probe {
  current: number;
  timeS: number;
}

interface PreparedSeries {
  id: string;
  label: string;
  style: SeriesStyle;
  min: CurvePoint[];
  max: CurvePoint[];
}

function validRange(r: readonly [number, number] | undefined): [number, number] | null {
  return r && isPositive(r[0]) && isPositive(r[1]) && r[1] > r[0] ? [r[0], r[1]] : null;
}

function prepareSeries(series: readonly TimeCurrentSeries[]): PreparedSeries[] {
  return series.map((s, i) => ({
    id: s.id,
    label: s.label,
    style: seriesStyle(i),
    min: cleanCurve(s.min),
    max: cleanCurve(s.max),
  }));
}

/** The current axis: as given, else the data, the verticals and the marks widened to whole decades (at least two). */
function currentDomain(
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

function summary(
  props: TimeCurrentPlotProps,
  prepared: PreparedSeries[],
  iDom: [number, number],
  tDom: [number, number],
): string {
  const u = props.currentUnit;
  const parts = [
    `Time-current plot on log-log axes, current ${formatCurrent(iDom[0], u, true)} to ${formatCurrent(iDom[1], u, true)}, time ${formatTime(tDom[0], true)} to ${formatTime(tDom[1], true)}.`,
  ];
  const drawn = prepared.filter((s) => s.max.length > 0 || s.min.length > 0);
  parts.push(
    drawn.length
      ? `Trip bands: ${drawn.map((s) => s.label).join('; ')}.`
      : (props.emptyMessage ?? 'No trip band to show.'),
  );
  for (const v of props.verticals ?? [])
    if (isPositive(v.currentA)) parts.push(`Line at ${v.label} ${formatCurrent(v.currentA, u)}.`);
  for (const m of props.marks ?? []) parts.push(markSentence(m, u) + '.');
  return parts.join(' ');
}

function inRanges(m: TimeCurrentMark, iDom: [number, number], tDom: [number, number]): boolean {
  return (
    isPositive(m.currentA) &&
    isPositive(m.timeS) &&
    m.currentA >= iDom[0] &&
    m.currentA <= iDom[1] &&
    m.timeS >= tDom[0] &&
    m.timeS <= tDom[1]
  );
}

function markSentence(m: TimeCurrentMark, unit: CurrentUnit): string {
  return `${m.label} at ${formatCurrent(m.currentA, unit)}: ${formatTime(m.timeS)}`;
}

/** Position of a pointer or press inside the element that received it (web: offsetX; native: locationX). */
function localPoint(e: GestureResponderEvent | RNPointerEvent): Px | null {
  const ne = e.nativeEvent as unknown as { locationX?: number; locationY?: number; offsetX?: number; offsetY?: number };
  const x = typeof ne.offsetX === 'number' ? ne.offsetX : ne.locationX;
  const y = typeof ne.offsetY === 'number' ? ne.offsetY : ne.locationY;
  return typeof x === 'number' && typeof y === 'number' && Number.isFinite(x) && Number.isFinite(y) ? [x, y] : null;
}

const VERTICAL_STYLE = {
  full: { stroke: colors.ink, width: 1.6, dash: '' },
  reduced: { stroke: colors.ink, width: 1.6, dash: '7 4' },
  neutral: { stroke: colors.muted, width: 1.2, dash: '2 3' },
} as const;

/**
 * Log-log time-current plot: each device's band (minimum to maximum clearing curve) shaded, the maximum curve as a
 * heavy line and the minimum as a thin dotted one; vertical lines (arcing currents) and marked clearing points.
 * Hover (web) or tap reads the time of every maximum curve at the current under the pointer.
 */
export function TimeCurrentPlot(props: TimeCurrentPlotProps) {
  const { currentUnit, testID, showMarkList = true } = props;
  const [width, setWidth] = useState(0);
  const [hover, setHover] = useState<Probe | null>(null);
  const [pinned, setPinned] = useState<Probe | null>(null);
  const clipId = `tcclip${useId().replace(/[^A-Za-z0-9]/g, '')}`;

  const onLayout = useCallback((e: LayoutChangeEvent) => {
    const w = Math.round(e.nativeEvent.layout.width);
    setWidth((prev) => (Math.abs(prev - w) >= 1 ? w : prev));
  }, []);

  const prepared = useMemo(() => prepareSeries(props.series), [props.series]);
  const tDom = useMemo(
    () => validRange(props.timeRangeS) ?? ([...DEFAULT_TIME_RANGE_S] as [number, number]),
    [props.timeRangeS],
  );
  const iDom = useMemo(
    () => currentDomain(props.currentRange, prepared, props.verticals, props.marks, currentUnit),
    [props.currentRange, prepared, props.verticals, props.marks, currentUnit],
  );
  const empty = prepared.every((s) => s.max.length === 0 && s.min.length === 0);
  const a11y = props.accessibilityLabel ?? summary(props, prepared, iDom, tDom);

  const g = useMemo(
    () =>
      width > 0
        ? layoutPlot({
            width,
            height: props.height,
            iDom,
            tDom,
            unit: currentUnit,
            prepared,
            verticals: props.verticals ?? [],
            marks: props.marks ?? [],
          })
        : null,
    [width, props.height, iDom, tDom, currentUnit, prepared, props.verticals, props.marks],
  );

  const reading = hover ?? pinned;
  const probe = g && reading ? { x: g.xs.toPx(reading.current), y: g.ys.toPx(reading.timeS) } : null;
  const readout = g && reading ? readAt(g, prepared, reading) : null;
  const narrow = width > 0 && width < NARROW_PX;

  /** A pointer position in the plot area → the current and time there (clamped to the axes). */
  const toProbe = (p: Px | null): Probe | null => {
    if (!g || !p) return null;
    const x = Math.min(Math.max(p[0], 0), g.pw);
    const y = Math.min(Math.max(p[1], 0), g.ph);
    return { current: g.xs.fromPx(x), timeS: g.ys.fromPx(y) };
  };

  return (
    <View testID={testID} style={{ gap: space.md }}>
      <View
        onLayout={onLayout}
        accessible
        accessibilityRole="image"
        accessibilityLabel={a11y}
        style={{ width: '100%', minHeight: g ? g.height : 300 }}
      >
        {g ? (
          <>
            <Svg width={g.width} height={g.height}>
              <Defs>
                <ClipPath id={clipId}>
                  <Rect x={0} y={0} width={g.pw} height={g.ph} />
                </ClipPath>
              </Defs>
              <G x={g.left} y={g.top}>
                <Rect x={0} y={0} width={g.pw} height={g.ph} fill={colors.surface} />
                {g.minorX.map((x) => (
                  <Line key={`mx${x}`} x1={x} x2={x} y1={0} y2={g.ph} stroke={colors.lineSoft} strokeWidth={1} />
                ))}
                {g.minorY.map((y) => (
                  <Line key={`my${y}`} x1={0} x2={g.pw} y1={y} y2={y} stroke={colors.lineSoft} strokeWidth={1} />
                ))}
                {g.majorX.map((t) => (
                  <Line
                    key={`Mx${t.pos}`}
                    x1={t.pos}
                    x2={t.pos}
                    y1={0}
                    y2={g.ph}
                    stroke={colors.line}
                    strokeWidth={1}
                  />
                ))}
                {g.majorY.map((t) => (
                  <Line
                    key={`My${t.pos}`}
                    x1={0}
                    x2={g.pw}
                    y1={t.pos}
                    y2={t.pos}
                    stroke={colors.line}
                    strokeWidth={1}
                  />
                ))}
                <G clipPath={`url(#${clipId})`}>
                  {g.bands.map((b, bi) => (
                    <G key={`${bi}-${b.id}`}>
                      {b.fill ? (
                        <Path d={b.fill} fill={b.style.fill} fillOpacity={b.style.fillOpacity} stroke="none" />
                      ) : null}
                      {b.min.map((d, i) => (
                        <Path
                          key={`n${i}`}
                          d={d}
                          fill="none"
                          stroke={b.style.color}
                          strokeWidth={MIN_CURVE_WIDTH}
                          strokeDasharray={MIN_CURVE_DASH}
                          strokeLinecap="round"
                          strokeLinejoin="round"
                        />
                      ))}
                      {b.max.map((d, i) => (
                        <Path
                          key={`x${i}`}
                          d={d}
                          fill="none"
                          stroke={b.style.color}
                          strokeWidth={MAX_CURVE_WIDTH}
                          strokeDasharray={b.style.maxDash || undefined}
                          strokeLinejoin="round"
                        />
                      ))}
                    </G>
                  ))}
                  {g.verticals.map((v, i) => (
                    <Line
                      key={`v${i}`}
                      x1={v.x}
                      x2={v.x}
                      y1={0}
                      y2={g.ph}
                      stroke={VERTICAL_STYLE[v.tone].stroke}
                      strokeWidth={VERTICAL_STYLE[v.tone].width}
                      strokeDasharray={VERTICAL_STYLE[v.tone].dash || undefined}
                    />
                  ))}
                  {probe ? (
                    <G>
                      <Line
                        x1={probe.x}
                        x2={probe.x}
                        y1={0}
                        y2={g.ph}
                        stroke={colors.inkSoft}
                        strokeOpacity={0.7}
                        strokeWidth={1}
                        strokeDasharray="4 3"
                      />
                      <Line
                        x1={0}
                        x2={g.pw}
                        y1={probe.y}
                        y2={probe.y}
                        stroke={colors.inkSoft}
                        strokeOpacity={0.7}
                        strokeWidth={1}
                        strokeDasharray="4 3"
                      />
                      {readout?.rows.map((r) =>
                        r.y !== null ? (
                          <Circle
                            key={r.id}
                            cx={probe.x}
                            cy={r.y}
                            r={4}
                            fill={colors.surface}
                            stroke={r.color}
                            strokeWidth={2}
                          />
                        ) : null,
                      )}
                    </G>
                  ) : null}
                  {g.marks.map((m, i) => (
                    <G key={`m${i}`}>
                      <Circle cx={m.x} cy={m.y} r={6.5} fill={colors.surface} stroke={m.color} strokeWidth={2.5} />
                      <Circle cx={m.x} cy={m.y} r={2.5} fill={m.color} />
                    </G>
                  ))}
                </G>
                {g.verticals.map((v, i) => (
                  <G key={`vl${i}`}>
                    <Rect
                      x={v.box.x - 2}
                      y={v.box.y}
                      width={v.box.width + 4}
                      height={v.box.height}
                      rx={3}
                      fill={colors.surface}
                      fillOpacity={0.9}
                    />
                    <SvgText
                      x={v.box.x}
                      y={v.box.y + v.box.height - 4}
                      fontFamily={fonts.numbers}
                      fontSize={g.labelFont}
                      fill={colors.ink}
                    >
                      {v.text}
                    </SvgText>
                  </G>
                ))}
                {g.marks.map((m, i) => (
                  <G key={`ml${i}`}>
                    {m.leader ? <Line {...m.leader} stroke={colors.inkSoft} strokeWidth={1} /> : null}
                    <Rect
                      x={m.box.x - 2}
                      y={m.box.y}
                      width={m.box.width + 4}
                      height={m.box.height}
                      rx={3}
                      fill={colors.surface}
                      fillOpacity={0.92}
                      stroke={m.color}
                      strokeWidth={1}
                    />
                    <SvgText
                      x={m.box.x}
                      y={m.box.y + m.box.height - 4}
                      fontFamily={fonts.numbers}
                      fontSize={g.labelFont}
                      fill={colors.ink}
                    >
                      {m.text}
                    </SvgText>
                  </G>
                ))}
                <Rect x={0} y={0} width={g.pw} height={g.ph} fill="none" stroke={colors.inkSoft} strokeWidth={1} />
              </G>
              {g.majorX.map((t) =>
                t.label ? (
                  <SvgText
                    key={`lx${t.pos}`}
                    x={g.left + t.pos}
                    y={g.top + g.ph + g.tickFont + 6}
                    textAnchor={t.anchor}
                    fontFamily={fonts.numbers}
                    fontSize={g.tickFont}
                    fill={colors.inkSoft}
                  >
                    {t.label}
                  </SvgText>
                ) : null,
              )}
              {g.majorY.map((t) =>
                t.label ? (
                  <SvgText
                    key={`ly${t.pos}`}
                    x={g.left - 6}
                    y={g.top + t.pos + g.tickFont * 0.35}
                    textAnchor="end"
                    fontFamily={fonts.numbers}
                    fontSize={g.tickFont}
                    fill={colors.inkSoft}
                  >
                    {t.label}
                  </SvgText>
                ) : null,
              )}
              <SvgText x={2} y={14} fontFamily={fonts.textMedium} fontSize={12.5} fill={colors.inkSoft}>
                Time (s)
              </SvgText>
              <SvgText
                x={g.left + g.pw / 2}
                y={g.height - 6}
                textAnchor="middle"
                fontFamily={fonts.textMedium}
                fontSize={12.5}
                fill={colors.inkSoft}
              >
                {currentUnit === 'A' ? 'Current (A)' : 'Current (multiples of rating)'}
              </SvgText>
            </Svg>
            {empty ? (
              <View
                pointerEvents="none"
                style={{
                  position: 'absolute',
                  left: g.left,
                  top: g.top,
                  width: g.pw,
                  height: g.ph,
                  alignItems: 'center',
                  justifyContent: 'center',
                  padding: space.lg,
                }}
              >
                <View
                  style={{
                    backgroundColor: colors.surface,
                    borderRadius: radius.md,
                    borderWidth: 1,
                    borderColor: colors.line,
                    paddingVertical: space.md,
                    paddingHorizontal: space.lg,
                  }}
                >
                  <T
                    variant="small"
                    style={{ color: colors.inkSoft, textAlign: 'center' }}
                    testID={testID ? `${testID}-empty` : undefined}
                  >
                    {props.emptyMessage ?? 'No trip band to show.'}
                  </T>
                </View>
              </View>
            ) : (
              <Pressable
                accessible={false}
                focusable={false}
                testID={testID ? `${testID}-surface` : undefined}
                onPress={(e) => setPinned(toProbe(localPoint(e)))}
                onPointerMove={(e) => {
                  const type = (e.nativeEvent as unknown as { pointerType?: string }).pointerType;
                  if (type === 'mouse' || type === 'pen') setHover(toProbe(localPoint(e)));
                }}
                onPointerLeave={() => setHover(null)}
                style={
                  {
                    position: 'absolute',
                    left: g.left,
                    top: g.top,
                    width: g.pw,
                    height: g.ph,
                    cursor: 'crosshair',
                  } as never
                }
              />
            )}
            {readout && probe && !narrow ? (
              <View
                pointerEvents="none"
                testID={testID ? `${testID}-readout` : undefined}
                style={{
                  position: 'absolute',
                  left: g.left + readoutSpot(g, readout, probe).x,
                  top: g.top + readoutSpot(g, readout, probe).y,
                  width: readoutSize(readout, g.pw).width,
                }}
              >
                <ReadoutBox readout={readout} floating />
              </View>
            ) : null}
          </>
        ) : null}
      </View>
      {narrow && !empty ? (
        <View testID={testID ? `${testID}-readout` : undefined}>
          {readout ? (
            <ReadoutBox readout={readout} onClear={() => setPinned(null)} />
          ) : (
            <T variant="small">Tap the plot to read the clearing time at a current.</T>
          )}
        </View>
      ) : null}
      <Legend series={prepared} />
      {showMarkList && (props.marks?.length ?? 0) > 0 ? (
        <View style={{ gap: 2 }} testID={testID ? `${testID}-marks` : undefined}>
          <T variant="label">Clearing points</T>
          {props.marks!.map((m, i) => (
            <T key={i} variant="small" style={{ color: colors.inkSoft }}>
              {markSentence(m, currentUnit)}
              {inRanges(m, iDom, tDom) ? '' : ' (outside the plotted range)'}
            </T>
          ))}
        </View>
      ) : null}
    </View>
  );
}

interface ReadoutRow {
  id: string;
  label: string;
  color: string;
  dash: string;
  text: string;
  /** Where the maximum curve crosses the probe's current, px in the plot area (null when it is not read). */
  y: number | null;
}

interface Readout {
  head: string;
  rows: ReadoutRow[];
}

/** Estimated size of the floating readout box, px (mono 14 px head, 13 px rows). */
function readoutSize(r: Readout, pw: number): { width: number; height: number } {
  const head = monoTextWidth(r.head, 14);
  const rows = Math.max(0, ...r.rows.map((row) => 22 + 8 + row.label.length * 6.8 + 12 + monoTextWidth(row.text, 13)));
  return {
    width: Math.min(Math.max(head, rows) + 2 * space.md + 2, 380, pw - 16),
    height: 2 * space.sm + 22 + r.rows.length * 21,
  };
}

/**
 * Where the floating readout goes: the plot corner that keeps clear of the pointer and covers the fewest
 * curve points and labels (time-current bands usually leave the upper right and lower left free).
 */
function readoutSpot(g: PlotGeometry, r: Readout, probe: { x: number; y: number }): { x: number; y: number } {
  const { width, height } = readoutSize(r, g.pw);
  const inset = 8;
  const corners = [
    { x: g.pw - inset - width, y: inset },
    { x: inset, y: g.ph - inset - height },
    { x: inset, y: inset },
    { x: g.pw - inset - width, y: g.ph - inset - height },
  ];
  let best = corners[0];
  let bestScore = Infinity;
  corners.forEach((c, i) => {
    const box: Box = { x: c.x, y: c.y, width, height };
    const near: Box = { x: c.x - 16, y: c.y - 16, width: width + 32, height: height + 32 };
    let score = pointsInBox([[probe.x, probe.y]], near) * 10000 + pointsInBox(g.curvePoints, box) + i * 0.5;
    for (const b of g.labelBoxes) if (boxesOverlap(box, b)) score += 25;
    if (score < bestScore) {
      bestScore = score;
      best = c;
    }
  });
  return best;
}

function describeRead(read: CurveRead, unit: CurrentUnit): string {
  switch (read.status) {
    case 'value':
      return formatTime(read.timeS);
    case 'below':
      return `below band (from ${formatCurrent(read.firstCurrent, unit)})`;
    case 'above':
      return `beyond data (to ${formatCurrent(read.lastCurrent, unit)})`;
    default:
      return 'no maximum curve';
  }
}

function readAt(g: PlotGeometry, prepared: PreparedSeries[], probe: Probe): Readout {
  const { current, timeS } = probe;
  const rows = prepared.map((s, i) => {
    const read = readCurveLogLog(s.max, current);
    const y = read.status === 'value' ? g.ys.toPx(read.timeS) : null;
    return {
      id: `${i}-${s.id}`,
      label: s.label,
      color: s.style.color,
      dash: s.style.maxDash,
      text: describeRead(read, g.unit),
      y: y !== null && y >= 0 && y <= g.ph ? y : null,
    };
  });
  return { head: `I = ${formatCurrent(current, g.unit)} · t = ${formatTime(timeS)}`, rows };
}

function ReadoutBox({ readout, floating, onClear }: { readout: Readout; floating?: boolean; onClear?: () => void }) {
  return (
    <View
      style={{
        backgroundColor: floating ? 'rgba(255,255,255,0.96)' : colors.canvas,
        borderRadius: radius.md,
        borderWidth: 1,
        borderColor: colors.line,
        paddingVertical: space.sm,
        paddingHorizontal: space.md,
        gap: 3,
      }}
    >
      <View style={{ flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: space.md }}>
        <T style={{ fontFamily: fonts.numbersBold, fontSize: 14, lineHeight: 20, color: colors.ink }}>{readout.head}</T>
        {onClear ? (
          <Pressable
            accessibilityRole="button"
            accessibilityLabel="Clear the reading"
            onPress={onClear}
            hitSlop={12}
            style={{ paddingHorizontal: space.sm, paddingVertical: 2 }}
          >
            <T style={{ color: colors.accent, fontFamily: fonts.textMedium, fontSize: 14 }}>Clear</T>
          </Pressable>
        ) : null}
      </View>
      {readout.rows.map((r) => (
        <View key={r.id} style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm }}>
          <Swatch color={r.color} dash={r.dash} width={22} band={false} />
          <T
            numberOfLines={1}
            style={{ fontFamily: fonts.text, fontSize: 13, lineHeight: 18, color: colors.inkSoft, flexShrink: 1 }}
          >
            {r.label}
          </T>
          <T style={{ fontFamily: fonts.numbers, fontSize: 13, lineHeight: 18, color: colors.ink, marginLeft: 'auto' }}>
            {r.text}
          </T>
        </View>
      ))}
    </View>
  );
}

/** Legend key of a device: its band (shaded, heavy maximum line on top, dotted minimum below) or just its line. */
function Swatch({
  color,
  dash,
  width = 34,
  band = true,
}: {
  color: string;
  dash: string;
  width?: number;
  band?: boolean;
}) {
  const h = band ? 18 : 10;
  return (
    <Svg width={width} height={h}>
      {band ? <Rect x={0} y={3} width={width} height={12} fill={color} fillOpacity={0.16} /> : null}
      <Line
        x1={0}
        x2={width}
        y1={band ? 3.5 : h / 2}
        y2={band ? 3.5 : h / 2}
        stroke={color}
        strokeWidth={MAX_CURVE_WIDTH}
        strokeDasharray={dash || undefined}
      />
      {band ? (
        <Line
          x1={1}
          x2={width}
          y1={14.5}
          y2={14.5}
          stroke={color}
          strokeWidth={MIN_CURVE_WIDTH}
          strokeDasharray={MIN_CURVE_DASH}
          strokeLinecap="round"
        />
      ) : null}
    </Svg>
  );
}

function Legend({ series }: { series: PreparedSeries[] }) {
  const shown = series.filter((s) => s.max.length > 0 || s.min.length > 0);
  if (shown.length === 0) return null;
  return (
    <View style={{ gap: space.sm }}>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', columnGap: space.lg, rowGap: space.sm }}>
        {shown.map((s, i) => (
          <View
            key={`${i}-${s.id}`}
            style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm, maxWidth: '100%' }}
          >
            <Swatch color={s.style.color} dash={s.style.maxDash} band={s.min.length > 0 && s.max.length > 0} />
            <T style={{ fontFamily: fonts.textMedium, fontSize: 14, lineHeight: 20, color: colors.ink, flexShrink: 1 }}>
              {s.label}
            </T>
          </View>
        ))}
      </View>
      <T variant="small" style={{ fontSize: 12.5, lineHeight: 17 }}>
        Heavy line: maximum (total clearing) curve. Dotted line: minimum curve. Shaded: the band between them.
      </T>
    </View>
  );
}

/* ---------------------------------------------------------------- geometry ---------------------------------------------------------------- */

interface AxisTick {
  pos: number;
  label: string | null;
  anchor: 'start' | 'middle' | 'end';
}

interface PlotGeometry {
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

function layoutPlot(args: {
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
