import React from 'react';
import { ActivityIndicator, Pressable, type PressableProps, StyleSheet, type ViewStyle } from 'react-native';
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
  const off = disabled || busy;
  return (
    <Pressable
      accessibilityRole="button"
      aria-disabled={!!off}
      aria-busy={!!busy}
      disabled={off}
      {...rest}
      style={({ pressed }) => [styles.button, boxes[kind], off ? styles.off : pressed && styles.pressed, style]}
    >
      {busy ? <ActivityIndicator color={titles[kind].color} /> : null}
      <T style={[styles.title, titles[kind]]}>{title}</T>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  button: {
    minHeight: touch.min,
    paddingHorizontal: space.lg,
    borderRadius: radius.md,
    borderWidth: 0,
    borderColor: colors.line,
    alignItems: 'center',
    justifyContent: 'center',
    flexDirection: 'row',
    gap: space.sm,
    opacity: 1,
  },
  off: { opacity: 0.55 },
  pressed: { opacity: 0.85 },
  title: { fontFamily: fonts.textBold, fontSize: 16 },
});

/** Each kind's box. */
const boxes = StyleSheet.create({
  primary: { backgroundColor: colors.accent },
  secondary: { backgroundColor: colors.surface, borderWidth: 1 },
  quiet: { backgroundColor: 'transparent' },
  danger: { backgroundColor: colors.danger },
});

/** Each kind's words (the spinner takes the same colour). */
const titles = StyleSheet.create({
  primary: { color: colors.accentInk },
  secondary: { color: colors.ink },
  quiet: { color: colors.accent },
  danger: { color: '#FFFFFF' },
});
