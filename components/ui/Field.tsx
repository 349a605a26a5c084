import React from 'react';
import { TextInput, View, type TextInputProps, type ViewStyle } from 'react-native';
import { colors, fonts, radius, space, touch } from '../theme';
import { T } from './Text';

/** A labelled text field with its unit and its validation message (multi-line fields start taller; `style` adds to the box). */
export function Field({
  label,
  error,
  unit,
  hint,
  numeric,
  testID,
  containerStyle,
  style,
  ...rest
}: TextInputProps & {
  label: string;
  error?: string;
  unit?: string;
  hint?: string;
  numeric?: boolean;
  containerStyle?: ViewStyle;
}) {
  return (
    <View style={[{ gap: space.xs }, containerStyle]}>
      <T variant="label" nativeID={testID ? `${testID}-label` : undefined}>
        {label}
        {unit ? ` (${unit})` : ''}
      </T>
      <TextInput
        testID={testID}
        accessibilityLabel={label}
        placeholderTextColor={colors.muted}
        inputMode={numeric ? 'decimal' : undefined}
        {...rest}
        style={[
          {
            minHeight: rest.multiline ? touch.min * 2.5 : touch.min,
            borderWidth: 1.5,
            borderColor: error ? colors.danger : colors.line,
            borderRadius: radius.sm,
            paddingHorizontal: space.md,
            backgroundColor: colors.surface,
            color: colors.ink,
            fontFamily: numeric ? fonts.numbers : fonts.text,
            fontSize: 16,
            ...(rest.multiline ? { paddingVertical: space.sm, textAlignVertical: 'top' as const } : null),
          },
          style,
        ]}
      />
      {error ? (
        <T variant="small" style={{ color: colors.danger }} accessibilityRole="alert">
          {error}
        </T>
      ) : hint ? (
        <T variant="small">{hint}</T>
      ) : null}
    </View>
  );
}
