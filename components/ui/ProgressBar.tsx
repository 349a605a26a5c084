import React from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, radius } from '../theme';

export function ProgressBar({ value, testID }: { value: number; testID?: string }) {
  const pct = Math.max(0, Math.min(1, value)) * 100;
  return (
    <View
      testID={testID}
      accessibilityRole="progressbar"
      accessibilityValue={{ min: 0, max: 100, now: Math.round(pct) }}
      style={styles.track}
    >
      <View style={[styles.fill, { width: `${pct}%` }]} />
    </View>
  );
}

const styles = StyleSheet.create({
  track: { height: 12, borderRadius: radius.sm, backgroundColor: colors.lineSoft, overflow: 'hidden' },
  fill: { height: '100%', backgroundColor: colors.accent },
});
