/** The legend of the time-current plot. */
import { StyleSheet, View } from 'react-native';
import Svg, { Line, Rect } from 'react-native-svg';
import { colors, fonts, space } from '../theme';
import { T } from '../ui/Text';
import { MAX_CURVE_WIDTH, MIN_CURVE_DASH, MIN_CURVE_WIDTH } from './palette';
import { type PreparedSeries } from './types';

/** Legend key of a device: its band (shaded, heavy maximum line on top, dotted minimum below) or just its line. */
export function Swatch({
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

export function Legend({ series }: { series: PreparedSeries[] }) {
  const shown = series.filter((s) => s.max.length > 0 || s.min.length > 0);
  if (shown.length === 0) return null;
  return (
    <View style={styles.legend}>
      <View style={styles.entries}>
        {shown.map((s, i) => (
          <View key={`${i}-${s.id}`} style={styles.entry}>
            <Swatch color={s.style.color} dash={s.style.maxDash} band={s.min.length > 0 && s.max.length > 0} />
            <T style={styles.entryLabel}>{s.label}</T>
          </View>
        ))}
      </View>
      <T variant="small" style={styles.note}>
        Heavy line: maximum (total clearing) curve. Dotted line: minimum curve. Shaded: the band between them.
      </T>
    </View>
  );
}

const styles = StyleSheet.create({
  legend: { gap: space.sm },
  entries: { flexDirection: 'row', flexWrap: 'wrap', columnGap: space.lg, rowGap: space.sm },
  entry: { flexDirection: 'row', alignItems: 'center', gap: space.sm, maxWidth: '100%' },
  entryLabel: { fontFamily: fonts.textMedium, fontSize: 14, lineHeight: 20, color: colors.ink, flexShrink: 1 },
  note: { fontSize: 12.5, lineHeight: 17 },
});
