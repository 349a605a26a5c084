import React from 'react';
import { ActivityIndicator, Pressable, type PressableProps, type ViewStyle } from 'react-native';
import { colors, fonts, radius, space, touch } from '../theme';
import { T } from './Text';

type Kind = 'primary' | 'secondary' | 'quiet' | 'danger';

export function Button({
  title,
  kind = 'primary',
  busy,
  disabled,
  style,
  ...rest
}: Omit<PressableProps, 'style' | 'children'> & { title: string; kind?: Kind; busy?: boolean; style?: ViewStyle }) {
  const bg = { primary: colors.accent, secondary: colors.surface, quiet: 'transparent', danger: colors.danger }[kind];
  const fg = { primary: colors.accentInk, secondary: colors.ink, quiet: colors.accent, danger: '#FFFFFF' }[kind];
  const off = disabled || busy;
  return (
    <Pressable
      accessibilityRole="button"
      aria-disabled={!!off}
      aria-busy={!!busy}
      disabled={off}
      {...rest}
      style={({ pressed }) => [
        {
          minHeight: touch.min,
          paddingHorizontal: space.lg,
          borderRadius: radius.md,
          backgroundColor: bg,
          borderWidth: kind === 'secondary' ? 1 : 0,
          borderColor: colors.line,
          alignItems: 'center',
          justifyContent: 'center',
          flexDirection: 'row',
          gap: space.sm,
          opacity: off ? 0.55 : pressed ? 0.85 : 1,
        },
        style,
      ]}
    >
      {busy ? <ActivityIndicator color={fg} /> : null}
      <T style={{ color: fg, fontFamily: fonts.textBold, fontSize: 16 }}>{title}</T>
    </Pressable>
  );
}
