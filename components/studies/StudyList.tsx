import { Link } from 'expo-router';
import React from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
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
      <View style={styles.table} testID="study-table">
        <View style={styles.tableHead}>
          {['REV', 'TITLE', 'STATUS', 'APPROVED', 'REVIEW BY', 'LAST EDITED'].map((h, i) => (
            <T key={h} variant="label" style={{ flex: [0.5, 2.2, 2, 1, 1, 1.4][i] }}>
              {h}
            </T>
          ))}
        </View>
        {studies.map((s) => (
          <Link key={s.id} href={`/studies/${s.id}`} asChild>
            <Pressable accessibilityRole="link" testID={`study-${s.revision}`} style={styles.row}>
              <T style={styles.cellRevision}>{s.revision}</T>
              <T style={styles.cellTitle}>{s.title}</T>
              <View style={styles.cellStatus}>
                <StatusBadges study={s} />
              </View>
              <T style={styles.cellDate}>{day(s.approval?.approvedAt)}</T>
              <T style={styles.cellDate}>{day(s.approval?.reviewDueAt)}</T>
              <T variant="small" style={styles.cellEditor}>
                {s.lastEditedBy?.name ?? '—'} · {day(s.modelUpdatedAt)}
              </T>
            </Pressable>
          </Link>
        ))}
      </View>
    );
  }
  return (
    <View style={styles.cards}>
      {studies.map((s) => (
        <Link key={s.id} href={`/studies/${s.id}`} asChild>
          <Pressable accessibilityRole="link" testID={`study-${s.revision}`} style={styles.card}>
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

const styles = StyleSheet.create({
  table: {
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.lineSoft,
    backgroundColor: colors.surface,
  },
  tableHead: {
    flexDirection: 'row',
    paddingHorizontal: space.lg,
    paddingVertical: space.sm,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
  },
  row: {
    flexDirection: 'row',
    alignItems: 'center',
    minHeight: touch.min + 4,
    paddingHorizontal: space.lg,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  cellRevision: { flex: 0.5, fontFamily: fonts.numbersBold },
  cellTitle: { flex: 2.2, fontFamily: fonts.textMedium },
  cellStatus: { flex: 2 },
  cellDate: { flex: 1, fontFamily: fonts.numbers, fontSize: 14 },
  cellEditor: { flex: 1.4 },
  cards: { gap: space.sm },
  card: {
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.lineSoft,
    padding: space.lg,
    gap: space.xs,
  },
});
