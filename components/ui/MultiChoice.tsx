import React from 'react';
import { Pressable, View } from 'react-native';
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
    <View style={{ gap: space.xs }} testID={testID}>
      {label ? <T variant="label">{label}</T> : null}
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }}>
        {options.map((o) => {
          const on = values.includes(o.value);
          return (
            <Pressable
              key={o.value}
              accessibilityRole="checkbox"
              aria-checked={on}
              onPress={() => toggle(o.value)}
              testID={testID ? `${testID}-${o.value}` : undefined}
              style={{
                minHeight: touch.min,
                paddingHorizontal: space.md,
                flexDirection: 'row',
                alignItems: 'center',
                gap: space.sm,
                borderRadius: radius.sm,
                borderWidth: 1.5,
                borderColor: on ? colors.accent : colors.line,
                backgroundColor: on ? colors.accentSoft : colors.surface,
              }}
            >
              <View
                style={{
                  width: 18,
                  height: 18,
                  borderRadius: 4,
                  borderWidth: 2,
                  borderColor: on ? colors.accent : colors.line,
                  backgroundColor: on ? colors.accent : colors.surface,
                  alignItems: 'center',
                  justifyContent: 'center',
                }}
              >
                {on ? (
                  <T style={{ color: colors.accentInk, fontSize: 12, lineHeight: 14, fontFamily: fonts.textBold }}>✓</T>
                ) : null}
              </View>
              <T style={{ fontFamily: on ? fonts.textBold : fonts.text, color: colors.ink }}>{o.label}</T>
            </Pressable>
          );
        })}
      </View>
      {error ? (
        <T variant="small" style={{ color: colors.danger }} accessibilityRole="alert">
          {error}
        </T>
      ) : null}
    </View>
  );
}
