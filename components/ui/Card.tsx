import React from 'react';
import { View, type ViewProps } from 'react-native';
import { colors, radius, space } from '../theme';

export function Card({ style, ...rest }: ViewProps) {
  return (
    <View
      {...rest}
      style={[
        {
          backgroundColor: colors.surface,
          borderRadius: radius.lg,
          borderWidth: 1,
          borderColor: colors.lineSoft,
          padding: space.lg,
          gap: space.md,
        },
        style,
      ]}
    />
  );
}
