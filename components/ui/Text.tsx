import React from 'react';
import { Text as RNText, type TextProps, type TextStyle } from 'react-native';
import { colors, fonts } from '../theme';

type Variant = 'title' | 'heading' | 'subheading' | 'body' | 'small' | 'label';

const styles: Record<Variant, TextStyle> = {
  title: { fontFamily: fonts.textBold, fontSize: 26, lineHeight: 32, color: colors.ink },
  heading: { fontFamily: fonts.textBold, fontSize: 20, lineHeight: 26, color: colors.ink },
  subheading: { fontFamily: fonts.textMedium, fontSize: 16, lineHeight: 22, color: colors.ink },
  body: { fontFamily: fonts.text, fontSize: 16, lineHeight: 23, color: colors.ink },
  small: { fontFamily: fonts.text, fontSize: 14, lineHeight: 20, color: colors.muted },
  label: { fontFamily: fonts.textMedium, fontSize: 13, lineHeight: 18, color: colors.inkSoft, letterSpacing: 0.3 },
};

export function T({ variant = 'body', style, ...rest }: TextProps & { variant?: Variant }) {
  return <RNText {...rest} style={[styles[variant], style]} />;
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
    <RNText testID={testID} style={[{ color: colors.ink }, style]}>
      <RNText style={{ fontFamily: bold ? fonts.numbersBold : fonts.numbers, fontSize: size }}>{value}</RNText>
      {unit ? (
        <RNText style={{ fontFamily: fonts.text, fontSize: Math.max(12, size * 0.7), color: colors.muted }}>
          {' '}
          {unit}
        </RNText>
      ) : null}
    </RNText>
  );
}
