import { Link } from 'expo-router';
import React from 'react';
import { Pressable, View } from 'react-native';
import type { StudyDto } from '../../shared/schemas/studies';
import { useLayout } from '../../hooks/useLayout';
import { colors, fonts, radius, space, touch } from '../theme';
import { T } from '../ui';
import { StatusBadges } from './StatusBadge';

const day = (iso: string | null | undefined) => (iso ? iso.slice(0, 10) : '—');

/** Revisions of a site: a table on a wide screen, cards on a phone. */
export function StudyList({ studies }: { studies: StudyDto[] }) {
  const { wide } = useLayout();
  if (wide) {
    return (
      <View
        style={{
          borderRadius: radius.lg,
          borderWidth: 1,
          borderColor: colors.lineSoft,
          backgroundColor: colors.surface,
        }}
        testID="study-table"
      >
        <View
          style={{
            flexDirection: 'row',
            paddingHorizontal: space.lg,
            paddingVertical: space.sm,
            borderBottomWidth: 1,
            borderBottomColor: colors.line,
          }}
        >
          {['REV', 'TITLE', 'STATUS', 'APPROVED', 'REVIEW BY', 'LAST EDITED'].map((h, i) => (
            <T key={h} variant="label" style={{ flex: [0.5, 2.2, 2, 1, 1, 1.4][i] }}>
              {h}
            </T>
          ))}
        </View>
        {studies.map((s) => (
          <Link key={s.id} href={`/studies/${s.id}`} asChild>
            <Pressable
              accessibilityRole="link"
              testID={`study-${s.revision}`}
              style={{
                flexDirection: 'row',
                alignItems: 'center',
                minHeight: touch.min + 4,
                paddingHorizontal: space.lg,
                borderBottomWidth: 1,
                borderBottomColor: colors.lineSoft,
              }}
            >
              <T style={{ flex: 0.5, fontFamily: fonts.numbersBold }}>{s.revision}</T>
              <T style={{ flex: 2.2, fontFamily: fonts.textMedium }}>{s.title}</T>
              <View style={{ flex: 2 }}>
                <StatusBadges study={s} />
              </View>
              <T style={{ flex: 1, fontFamily: fonts.numbers, fontSize: 14 }}>{day(s.approval?.approvedAt)}</T>
              <T style={{ flex: 1, fontFamily: fonts.numbers, fontSize: 14 }}>{day(s.approval?.reviewDueAt)}</T>
              <T variant="small" style={{ flex: 1.4 }}>
                {s.lastEditedBy?.name ?? '—'} · {day(s.modelUpdatedAt)}
              </T>
            </Pressable>
          </Link>
        ))}
      </View>
    );
  }
  return (
    <View style={{ gap: space.sm }}>
      {studies.map((s) => (
        <Link key={s.id} href={`/studies/${s.id}`} asChild>
          <Pressable
            accessibilityRole="link"
            testID={`study-${s.revision}`}
            style={{
              backgroundColor: colors.surface,
              borderRadius: radius.lg,
              borderWidth: 1,
              borderColor: colors.lineSoft,
              padding: space.lg,
              gap: space.xs,
            }}
          >
            <T variant="subheading">
              Rev {s.revision} · {s.title}
            </T>
            <StatusBadges study={s} />
            <T variant="small">
              {s.approval
                ? `Approved ${day(s.approval.approvedAt)} · review by ${day(s.approval.reviewDueAt)}`
                : `Edited ${day(s.modelUpdatedAt)}`}
            </T>
          </Pressable>
        </Link>
      ))}
    </View>
  );
}
