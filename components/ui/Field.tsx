import React from 'react';
import { StyleSheet, TextInput, type TextInputProps, View, type ViewStyle } from 'react-native';
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
    <View style={[styles.field, containerStyle]}>
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
          styles.input,
          rest.multiline && styles.inputMultiline,
          !!error && styles.inputError,
          numeric && styles.inputFigures,
          style,
        ]}
      />
      {error ? (
        <T variant="small" style={styles.error} accessibilityRole="alert">
          {error}
        </T>
      ) : hint ? (
        <T variant="small">{hint}</T>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  field: { gap: space.xs },
  input: {
    minHeight: touch.min,
    borderWidth: 1.5,
    borderColor: colors.line,
    borderRadius: radius.sm,
    paddingHorizontal: space.md,
    backgroundColor: colors.surface,
    color: colors.ink,
    fontFamily: fonts.text,
    fontSize: 16,
  },
  inputMultiline: { minHeight: touch.min * 2.5, paddingVertical: space.sm, textAlignVertical: 'top' },
  inputError: { borderColor: colors.danger },
  inputFigures: { fontFamily: fonts.numbers },
  error: { color: colors.danger },
});
