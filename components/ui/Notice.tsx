import React from 'react';
import { StyleSheet, View } from 'react-native';
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
  return (
    <View
      testID={testID}
      accessibilityRole={tone === 'error' ? 'alert' : undefined}
      style={[styles.notice, boxes[tone]]}
    >
      {title ? (
        <T variant="subheading" style={texts[tone]}>
          {title}
        </T>
      ) : null}
      {typeof children === 'string' ? <T style={texts[tone]}>{children}</T> : children}
    </View>
  );
}

const styles = StyleSheet.create({
  /** The box; its colours come from the tone. */
  notice: { borderLeftWidth: 4, borderRadius: radius.sm, padding: space.md, gap: 2 },
});

/** Each tone's box: background and the bar at its left. */
const boxes = StyleSheet.create({
  info: { backgroundColor: colors.accentSoft, borderLeftColor: colors.accent },
  warning: { backgroundColor: colors.cautionSoft, borderLeftColor: colors.caution },
  error: { backgroundColor: colors.dangerSoft, borderLeftColor: colors.danger },
  ok: { backgroundColor: colors.okSoft, borderLeftColor: colors.ok },
});

/** Each tone's words. */
const texts = StyleSheet.create({
  info: { color: colors.ink },
  warning: { color: colors.caution },
  error: { color: colors.danger },
  ok: { color: colors.ok },
});
