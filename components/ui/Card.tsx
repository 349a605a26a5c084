import React from 'react';
import { View, type ViewProps } from 'react-native';
import { colors, radius, space } from '../theme';

/** The card's box, also for pressable rows that look like cards (links cannot wrap a Card and keep its style). */
export const cardStyle = {
  backgroundColor: colors.surface,
  borderRadius: radius.lg,
  borderWidth: 1,
  borderColor: colors.lineSoft,
  padding: space.lg,
  gap: space.md,
} as const;

export function Card({ style, ...rest }: ViewProps) {
  return <View {...rest} style={[cardStyle, style]} />;
}
