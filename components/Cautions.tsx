import React from 'react';
import { StyleSheet, View } from 'react-native';
import Svg, { Circle, Path } from 'react-native-svg';
import { CAUTIONS, NO_ADEQUATE_PPE_CAL_PER_CM2, NO_ADEQUATE_PPE_CAUTION, UNREVIEWED_CAUTION } from '../shared/cautions';
import { colors, radius, space } from './theme';
import { T } from './ui/Text';

/**
 * The cautions block, on every screen that shows a result. `reviewed=false` adds the "preliminary" banner;
 * an energy above 40 cal/cm² adds the no-adequate-PPE caution.
 */
export function Cautions({
  reviewed = false,
  incidentEnergyCalPerCm2,
  compact,
}: {
  reviewed?: boolean;
  incidentEnergyCalPerCm2?: number;
  compact?: boolean;
}) {
  const tooHigh = incidentEnergyCalPerCm2 !== undefined && incidentEnergyCalPerCm2 > NO_ADEQUATE_PPE_CAL_PER_CM2;
  return (
    <View testID="cautions" accessibilityRole="summary" style={styles.cautions}>
      <View style={styles.heading}>
        <HazardMark size={20} />
        <T variant="subheading">Cautions</T>
      </View>
      {!reviewed ? (
        <T style={styles.strongCaution} testID="caution-unreviewed">
          {UNREVIEWED_CAUTION}
        </T>
      ) : null}
      {tooHigh ? (
        <T style={styles.strongCaution} testID="caution-no-ppe">
          {NO_ADEQUATE_PPE_CAUTION}
        </T>
      ) : null}
      {(compact ? CAUTIONS.slice(0, 2) : CAUTIONS).map((c) => (
        <T key={c} variant="small" style={styles.note}>
          • {c}
        </T>
      ))}
    </View>
  );
}

/** The safety alert symbol (a triangle with an exclamation mark), in ANSI Z535.4 safety yellow and black. */
export function HazardMark({ size = 18 }: { size?: number }) {
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24" accessibilityLabel="Safety alert">
      <Path d="M12 1.8 L23 21.6 H1 Z" fill="#F6D100" stroke="#000000" strokeWidth={1.6} strokeLinejoin="round" />
      <Path d="M10.7 8.2 H13.3 L12.8 15.6 H11.2 Z" fill="#000000" />
      <Circle cx={12} cy={18.3} r={1.35} fill="#000000" />
    </Svg>
  );
}

const styles = StyleSheet.create({
  cautions: {
    borderWidth: 1.5,
    borderColor: colors.ink,
    borderRadius: radius.md,
    padding: space.md,
    gap: space.sm,
    backgroundColor: colors.surface,
  },
  heading: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  strongCaution: { fontWeight: '700', color: colors.danger },
  note: { color: colors.inkSoft },
});
