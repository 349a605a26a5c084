import React from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { colors, fonts, radius, space, touch } from '../theme';
import { T } from './Text';

/** Chips that each switch on and off (several may be chosen), wrapping on a phone. */
export function MultiChoice<V extends string>({
  label,
  values,
  options,
  onChange,
  error,
  testID,
}: {
  label?: string;
  values: readonly V[];
  options: readonly { value: V; label: string }[];
  onChange: (v: V[]) => void;
  error?: string;
  testID?: string;
}) {
  const toggle = (v: V) => onChange(values.includes(v) ? values.filter((x) => x !== v) : [...values, v]);
  return (
    <View style={styles.multiChoice} testID={testID}>
      {label ? <T variant="label">{label}</T> : null}
      <View style={styles.chips}>
        {options.map((o) => {
          const on = values.includes(o.value);
          return (
            <Pressable
              key={o.value}
              accessibilityRole="checkbox"
              aria-checked={on}
              onPress={() => toggle(o.value)}
              testID={testID ? `${testID}-${o.value}` : undefined}
              style={[styles.chip, on && styles.chipOn]}
            >
              <View style={[styles.box, on && styles.boxOn]}>{on ? <T style={styles.tick}>✓</T> : null}</View>
              <T style={on ? styles.chipTextOn : styles.chipText}>{o.label}</T>
            </Pressable>
          );
        })}
      </View>
      {error ? (
        <T variant="small" style={styles.error} accessibilityRole="alert">
          {error}
        </T>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  multiChoice: { gap: space.xs },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  chip: {
    minHeight: touch.min,
    paddingHorizontal: space.md,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    borderRadius: radius.sm,
    borderWidth: 1.5,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  /** A chip switched on. */
  chipOn: { borderColor: colors.accent, backgroundColor: colors.accentSoft },
  /** The tick box inside a chip. */
  box: {
    width: 18,
    height: 18,
    borderRadius: 4,
    borderWidth: 2,
    borderColor: colors.line,
    backgroundColor: colors.surface,
    alignItems: 'center',
    justifyContent: 'center',
  },
  boxOn: { borderColor: colors.accent, backgroundColor: colors.accent },
  tick: { color: colors.accentInk, fontSize: 12, lineHeight: 14, fontFamily: fonts.textBold },
  chipText: { fontFamily: fonts.text, color: colors.ink },
  chipTextOn: { fontFamily: fonts.textBold, color: colors.ink },
  error: { color: colors.danger },
});
