/** The readout of the maximum curves at the current under the pointer: its content, size, place and box. */
import { Pressable, StyleSheet, View } from 'react-native';
import { colors, fonts, radius, space } from '../theme';
import { T } from '../ui/Text';
import { boxesOverlap, monoTextWidth, pointsInBox, type Box } from './labels';
import { formatCurrent, formatTime, readCurveLogLog, type CurrentUnit, type CurveRead } from '../../shared/logPlot';
import { Swatch } from './Legend';
import { type PlotGeometry } from './geometry';
import { type PreparedSeries, type Probe } from './types';

export interface ReadoutRow {
  id: string;
  label: string;
  color: string;
  dash: string;
  text: string;
  /** Where the maximum curve crosses the probe's current, px in the plot area (null when it is not read). */
  y: number | null;
}

export interface Readout {
  head: string;
  rows: ReadoutRow[];
}

/** Estimated size of the floating readout box, px (mono 14 px head, 13 px rows). */
export function readoutSize(r: Readout, pw: number): { width: number; height: number } {
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
export function readoutSpot(g: PlotGeometry, r: Readout, probe: { x: number; y: number }): { x: number; y: number } {
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

export function describeRead(read: CurveRead, unit: CurrentUnit): string {
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

export function readAt(g: PlotGeometry, prepared: PreparedSeries[], probe: Probe): Readout {
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

export function ReadoutBox({
  readout,
  floating,
  onClear,
}: {
  readout: Readout;
  floating?: boolean;
  onClear?: () => void;
}) {
  return (
    <View style={[styles.readout, floating && styles.readoutFloating]}>
      <View style={styles.headRow}>
        <T style={styles.head}>{readout.head}</T>
        {onClear ? (
          <Pressable
            accessibilityRole="button"
            accessibilityLabel="Clear the reading"
            onPress={onClear}
            hitSlop={12}
            style={styles.clear}
          >
            <T style={styles.clearText}>Clear</T>
          </Pressable>
        ) : null}
      </View>
      {readout.rows.map((r) => (
        <View key={r.id} style={styles.row}>
          <Swatch color={r.color} dash={r.dash} width={22} band={false} />
          <T numberOfLines={1} style={styles.rowLabel}>
            {r.label}
          </T>
          <T style={styles.rowValue}>{r.text}</T>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  readout: {
    backgroundColor: colors.canvas,
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.line,
    paddingVertical: space.sm,
    paddingHorizontal: space.md,
    gap: 3,
  },
  /** Floating over the plot: nearly opaque white so the curves under it do not show through. */
  readoutFloating: { backgroundColor: 'rgba(255,255,255,0.96)' },
  headRow: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: space.md },
  head: { fontFamily: fonts.numbersBold, fontSize: 14, lineHeight: 20, color: colors.ink },
  clear: { paddingHorizontal: space.sm, paddingVertical: 2 },
  clearText: { color: colors.accent, fontFamily: fonts.textMedium, fontSize: 14 },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  rowLabel: { fontFamily: fonts.text, fontSize: 13, lineHeight: 18, color: colors.inkSoft, flexShrink: 1 },
  rowValue: { fontFamily: fonts.numbers, fontSize: 13, lineHeight: 18, color: colors.ink, marginLeft: 'auto' },
});
