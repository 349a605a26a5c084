import React from 'react';
import { View } from 'react-native';
import { colors, radius, space } from '../theme';
import { T } from './Text';

type Tone = 'info' | 'warning' | 'error' | 'ok';

/** An inline message box: errors from the server, warnings on results, confirmations. */
export function Notice({
  tone = 'info',
  title,
  children,
  testID,
}: {
  tone?: Tone;
  title?: string;
  children?: React.ReactNode;
  testID?: string;
}) {
  const palette = {
    info: { bg: colors.accentSoft, fg: colors.ink, bar: colors.accent },
    warning: { bg: colors.cautionSoft, fg: colors.caution, bar: colors.caution },
    error: { bg: colors.dangerSoft, fg: colors.danger, bar: colors.danger },
    ok: { bg: colors.okSoft, fg: colors.ok, bar: colors.ok },
  }[tone];
  return (
    <View
      testID={testID}
      accessibilityRole={tone === 'error' ? 'alert' : undefined}
      style={{
        backgroundColor: palette.bg,
        borderLeftWidth: 4,
        borderLeftColor: palette.bar,
        borderRadius: radius.sm,
        padding: space.md,
        gap: 2,
      }}
    >
      {title ? (
        <T variant="subheading" style={{ color: palette.fg }}>
          {title}
        </T>
      ) : null}
      {typeof children === 'string' ? <T style={{ color: palette.fg }}>{children}</T> : children}
    </View>
  );
}
