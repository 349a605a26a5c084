import { useCallback, useId, useMemo, useState } from 'react';
import {
  Pressable,
  StyleSheet,
  View,
  type GestureResponderEvent,
  type LayoutChangeEvent,
  type PointerEvent as RNPointerEvent,
} from 'react-native';
import Svg, { Circle, ClipPath, Defs, G, Line, Path, Rect, Text as SvgText } from 'react-native-svg';
import { colors, fonts, radius, space } from '../theme';
import { T } from '../ui/Text';
import { MAX_CURVE_WIDTH, MIN_CURVE_DASH, MIN_CURVE_WIDTH } from './palette';
import { formatCurrent, formatTime, isPositive, type CurrentUnit, type Px } from '../../shared/logPlot';
import { Legend } from './Legend';
import { ReadoutBox, readAt, readoutSize, readoutSpot } from './Readout';
import { NARROW_PX, currentDomain, inRanges, layoutPlot, prepareSeries, validRange } from './geometry';
import { type PreparedSeries, type Probe, type TimeCurrentMark, type TimeCurrentPlotProps } from './types';

export type { TimeCurrentMark, TimeCurrentPlotProps, TimeCurrentSeries, TimeCurrentVertical } from './types';

const DEFAULT_TIME_RANGE_S: readonly [number, number] = [0.01, 1000];

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
    <View testID={testID} style={styles.plot}>
      <View
        onLayout={onLayout}
        accessible
        accessibilityRole="image"
        accessibilityLabel={a11y}
        style={[styles.drawing, { minHeight: g ? g.height : 300 }]}
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
                style={[styles.emptyArea, { left: g.left, top: g.top, width: g.pw, height: g.ph }]}
              >
                <View style={styles.emptyBox}>
                  <T variant="small" style={styles.emptyText} testID={testID ? `${testID}-empty` : undefined}>
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
                style={[styles.surface, { left: g.left, top: g.top, width: g.pw, height: g.ph }]}
              />
            )}
            {readout && probe && !narrow ? (
              <View
                pointerEvents="none"
                testID={testID ? `${testID}-readout` : undefined}
                style={[
                  styles.floatingReadout,
                  {
                    left: g.left + readoutSpot(g, readout, probe).x,
                    top: g.top + readoutSpot(g, readout, probe).y,
                    width: readoutSize(readout, g.pw).width,
                  },
                ]}
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
        <View style={styles.marks} testID={testID ? `${testID}-marks` : undefined}>
          <T variant="label">Clearing points</T>
          {props.marks!.map((m, i) => (
            <T key={i} variant="small" style={styles.mark}>
              {markSentence(m, currentUnit)}
              {inRanges(m, iDom, tDom) ? '' : ' (outside the plotted range)'}
            </T>
          ))}
        </View>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  plot: { gap: space.md },
  /** The drawing's box; until it is measured it holds a place 300 px tall. */
  drawing: { width: '100%' },
  /** Over the plot area when there is no band: the message in the middle. */
  emptyArea: { position: 'absolute', alignItems: 'center', justifyContent: 'center', padding: space.lg },
  emptyBox: {
    backgroundColor: colors.surface,
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.line,
    paddingVertical: space.md,
    paddingHorizontal: space.lg,
  },
  emptyText: { color: colors.inkSoft, textAlign: 'center' },
  /** The plot area that reads the pointer. */
  surface: {
    position: 'absolute',
    // A web cursor beyond React Native's 'auto' | 'pointer' (react-native-web hands it to CSS).
    cursor: 'crosshair' as never,
  },
  floatingReadout: { position: 'absolute' },
  marks: { gap: 2 },
  mark: { color: colors.inkSoft },
});
