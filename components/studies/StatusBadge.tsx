import React from 'react';
import { StyleSheet, View } from 'react-native';
import { STUDY_STATUS_LABELS, type StudyDto } from '../../shared/schemas/studies';
import { colors, fonts, radius, space } from '../theme';
import { T } from '../ui';

const TONES = {
  draft: { bg: colors.lineSoft, fg: colors.inkSoft },
  'in-review': { bg: colors.accentSoft, fg: colors.accent },
  approved: { bg: colors.okSoft, fg: colors.ok },
  superseded: { bg: colors.lineSoft, fg: colors.inkSoft },
} as const;

function Pill({ label, bg, fg, testID }: { label: string; bg: string; fg: string; testID?: string }) {
  return (
    <View testID={testID} style={[styles.badge, { backgroundColor: bg }]}>
      <T style={[styles.badgeText, { color: fg }]}>{label}</T>
    </View>
  );
}

/** The study's status, plus "past review" and "stale" when they apply. */
export function StatusBadges({ study }: { study: StudyDto }) {
  const tone = TONES[study.status];
  return (
    <View style={styles.badges}>
      <Pill label={STUDY_STATUS_LABELS[study.status]} bg={tone.bg} fg={tone.fg} testID="study-status" />
      {study.pastReview ? <Pill label="Past review" bg={colors.dangerSoft} fg={colors.danger} /> : null}
      {study.stale ? <Pill label="Model changed since approval" bg={colors.cautionSoft} fg={colors.caution} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  badge: { borderRadius: radius.sm, paddingHorizontal: space.sm, paddingVertical: 3, alignSelf: 'flex-start' },
  badgeText: { fontFamily: fonts.textBold, fontSize: 13 },
  badges: { flexDirection: 'row', gap: 6, flexWrap: 'wrap' },
});
