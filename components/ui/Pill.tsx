import React from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, fonts, radius, space } from '../theme';
import { T } from './Text';

export type PillTone = 'neutral' | 'accent' | 'ok' | 'caution' | 'danger';

/** A small status tag (interface colours only; never the safety colours of labels). */
export function Pill({ label, tone = 'neutral', testID }: { label: string; tone?: PillTone; testID?: string }) {
  return (
    <View testID={testID} style={[styles.pill, pills[tone]]}>
      <T style={[styles.label, labels[tone]]}>{label}</T>
    </View>
  );
}

const styles = StyleSheet.create({
  pill: { borderRadius: radius.sm, paddingHorizontal: space.sm, paddingVertical: 3, alignSelf: 'flex-start' },
  label: { fontFamily: fonts.textBold, fontSize: 13 },
});

/** Each tone's background. */
const pills = StyleSheet.create({
  neutral: { backgroundColor: colors.lineSoft },
  accent: { backgroundColor: colors.accentSoft },
  ok: { backgroundColor: colors.okSoft },
  caution: { backgroundColor: colors.cautionSoft },
  danger: { backgroundColor: colors.dangerSoft },
});

/** Each tone's words. */
const labels = StyleSheet.create({
  neutral: { color: colors.inkSoft },
  accent: { color: colors.accent },
  ok: { color: colors.ok },
  caution: { color: colors.caution },
  danger: { color: colors.danger },
});
