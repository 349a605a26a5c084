import React from 'react';
import { Text as RNText, StyleSheet, type TextProps, type TextStyle } from 'react-native';
import { colors, fonts } from '../theme';

type Variant = 'title' | 'heading' | 'subheading' | 'body' | 'small' | 'label';

const variants: Record<Variant, TextStyle> = {
  title: { fontFamily: fonts.textBold, fontSize: 26, lineHeight: 32, color: colors.ink },
  heading: { fontFamily: fonts.textBold, fontSize: 20, lineHeight: 26, color: colors.ink },
  subheading: { fontFamily: fonts.textMedium, fontSize: 16, lineHeight: 22, color: colors.ink },
  body: { fontFamily: fonts.text, fontSize: 16, lineHeight: 23, color: colors.ink },
  small: { fontFamily: fonts.text, fontSize: 14, lineHeight: 20, color: colors.muted },
  label: { fontFamily: fonts.textMedium, fontSize: 13, lineHeight: 18, color: colors.inkSoft, letterSpacing: 0.3 },
};

export function T({ variant = 'body', style, ...rest }: TextProps & { variant?: Variant }) {
  return <RNText {...rest} style={[variants[variant], style]} />;
}

/** Numbers in the tabular-figure face, with the unit in the text face. */
export function Num({
  value,
  unit,
  size = 16,
  bold,
  style,
  testID,
}: {
  value: string;
  unit?: string;
  size?: number;
  bold?: boolean;
  style?: TextStyle;
  testID?: string;
}) {
  return (
    <RNText testID={testID} style={[styles.num, style]}>
      <RNText style={[bold ? styles.figuresBold : styles.figures, { fontSize: size }]}>{value}</RNText>
      {unit ? <RNText style={[styles.unit, { fontSize: Math.max(12, size * 0.7) }]}> {unit}</RNText> : null}
    </RNText>
  );
}

const styles = StyleSheet.create({
  num: { color: colors.ink },
  /** The number in tabular figures; its size comes from the caller. */
  figures: { fontFamily: fonts.numbers },
  figuresBold: { fontFamily: fonts.numbersBold },
  /** The unit in the text face, smaller than the number. */
  unit: { fontFamily: fonts.text, color: colors.muted },
});
