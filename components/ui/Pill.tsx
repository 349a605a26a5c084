import React from 'react';
import { View } from 'react-native';
import { colors, fonts, radius } from '../theme';
import { T } from './Text';

export type PillTone = 'neutral' | 'accent' | 'ok' | 'caution' | 'danger';

const TONES: Record<PillTone, { bg: string; fg: string }> = {
  neutral: { bg: colors.lineSoft, fg: colors.inkSoft },
  accent: { bg: colors.accentSoft, fg: colors.accent },
  ok: { bg: colors.okSoft, fg: colors.ok },
  caution: { bg: colors.cautionSoft, fg: colors.caution },
  danger: { bg: colors.dangerSoft, fg: colors.danger },
};

/** A small status tag (interface colours only; never the safety colours of labels). */
export function Pill({ label, tone = 'neutral', testID }: { label: string; tone?: PillTone; testID?: string }) {
  const t = TONES[tone];
  return (
    <View
      testID={testID}
      style={{
        backgroundColor: t.bg,
        borderRadius: radius.sm,
        paddingHorizontal: 8,
        paddingVertical: 3,
        alignSelf: 'flex-start',
      }}
    >
      <T style={{ color: t.fg, fontFamily: fonts.textBold, fontSize: 13 }}>{label}</T>
    </View>
  );
}
