import React from 'react';
import { Pressable, View } from 'react-native';
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
    <View style={{ gap: space.xs, maxWidth: '100%', flexShrink: 1 }} testID={testID}>
      {label ? <T variant="label">{label}</T> : null}
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }} accessibilityRole="radiogroup">
        {options.map((o) => {
          const on = o.value === value;
          return (
            <Pressable
              key={o.value}
              accessibilityRole="radio"
              aria-checked={on}
              onPress={() => onChange(o.value)}
              testID={testID ? `${testID}-${o.value}` : undefined}
              style={{
                minHeight: touch.min,
                // A long option wraps inside its button instead of running past the screen's edge (390 px phones).
                maxWidth: '100%',
                flexShrink: 1,
                paddingHorizontal: space.md,
                paddingVertical: space.xs,
                justifyContent: 'center',
                borderRadius: radius.sm,
                borderWidth: 1.5,
                borderColor: on ? colors.accent : colors.line,
                backgroundColor: on ? colors.accentSoft : colors.surface,
              }}
            >
              <T style={{ fontFamily: on ? fonts.textBold : fonts.text, color: colors.ink }}>{o.label}</T>
            </Pressable>
          );
        })}
      </View>
    </View>
  );
}
