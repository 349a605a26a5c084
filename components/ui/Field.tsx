import React from 'react';
import { TextInput, View, type TextInputProps, type ViewStyle } from 'react-native';
import { colors, fonts, radius, space, touch } from '../theme';
import { T } from './Text';

/** A labelled text field with its unit and its validation message. */
export function Field({
  label,
  error,
  unit,
  hint,
  numeric,
  testID,
  containerStyle,
  ...rest
}: TextInputProps & { label: string; error?: string; unit?: string; hint?: string; numeric?: boolean; containerStyle?: ViewStyle }) {
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
        style={{
          minHeight: touch.min,
          borderWidth: 1.5,
          borderColor: error ? colors.danger : colors.line,
          borderRadius: radius.sm,
          paddingHorizontal: space.md,
          backgroundColor: colors.surface,
          color: colors.ink,
          fontFamily: numeric ? fonts.numbers : fonts.text,
          fontSize: 16,
        }}
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
