import React from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { colors, fonts, radius, space, touch } from '../theme';
import { T } from './Text';

/** A row of mutually exclusive options (segmented), wrapping on a phone. */
export function Choice<V extends string>({
  label,
  value,
  options,
  onChange,
  testID,
}: {
  label?: string;
  value: V;
  options: readonly { value: V; label: string }[];
  onChange: (v: V) => void;
  testID?: string;
}) {
  return (
    <View style={styles.choice} testID={testID}>
      {label ? <T variant="label">{label}</T> : null}
      <View style={styles.options} accessibilityRole="radiogroup">
        {options.map((o) => {
          const on = o.value === value;
          return (
            <Pressable
              key={o.value}
              accessibilityRole="radio"
              aria-checked={on}
              onPress={() => onChange(o.value)}
              testID={testID ? `${testID}-${o.value}` : undefined}
              style={[styles.option, on && styles.optionOn]}
            >
              <T style={on ? styles.optionTextOn : styles.optionText}>{o.label}</T>
            </Pressable>
          );
        })}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  choice: { gap: space.xs, maxWidth: '100%', flexShrink: 1 },
  options: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  option: {
    minHeight: touch.min,
    // A long option wraps inside its button instead of running past the screen's edge (390 px phones).
    maxWidth: '100%',
    flexShrink: 1,
    paddingHorizontal: space.md,
    paddingVertical: space.xs,
    justifyContent: 'center',
    borderRadius: radius.sm,
    borderWidth: 1.5,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  /** The chosen option. */
  optionOn: { borderColor: colors.accent, backgroundColor: colors.accentSoft },
  optionText: { fontFamily: fonts.text, color: colors.ink },
  optionTextOn: { fontFamily: fonts.textBold, color: colors.ink },
});
