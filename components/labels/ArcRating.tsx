import React from 'react';
import { StyleSheet } from 'react-native';
import { minimumArcRatingDisplay } from '../../shared/labelDisplay';
import { fonts } from '../theme';
import { Num, T } from '../ui';

/**
 * The minimum arc rating of clothing as the label prints it (shared/labelDisplay.ts): a whole number of cal/cm², or
 * the words the label uses above 40 cal/cm² ("No arc-rated PPE is adequate") and below 1.2 cal/cm².
 */
export function ArcRating({ calPerCm2, size = 16 }: { calPerCm2: number; size?: number }) {
  const d = minimumArcRatingDisplay(calPerCm2);
  if (d.unit) return <Num value={d.value} unit={d.unit} size={size} />;
  return <T style={[styles.words, { fontSize: size }]}>{d.value}</T>;
}

const styles = StyleSheet.create({
  /** The words the label prints instead of a number; the size comes from the caller. */
  words: { fontFamily: fonts.textBold },
});
