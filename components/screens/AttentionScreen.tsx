import type { AppHref } from '../nav';
import { Link, useLocalSearchParams, useRouter } from 'expo-router';
import React from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import {
  ATTENTION_LIST_INFO,
  ATTENTION_LISTS,
  type AttentionList,
  type AttentionSummary,
} from '../../shared/schemas/attention';
import { useAttentionSummary } from '../../hooks/attention';
import { fmtDateTime } from '../../hooks/dates';
import { useSites } from '../../hooks/queries';
import { useLayout } from '../../hooks/useLayout';
import { colors, fonts, radius, space, touch } from '../theme';
import { Card, Choice, Loading, Notice, Num, QueryError, Screen, T, Table, ValueRow } from '../ui';

/** Short column names of the per-site table (the cards carry the full titles). */
export const ATTENTION_SHORT: Record<AttentionList, string> = {
  'review-overdue': 'Past review',
  'review-due-30': 'Due in 30 days',
  'review-due-90': 'Due in 90 days',
  'stale-studies': 'Stale studies',
  'superseded-installed': 'Superseded, installed',
  'not-installed': 'Not installed',
  'open-reports': 'Open reports',
};

const SEVERITY = {
  high: { word: 'High priority', bar: colors.danger },
  medium: { word: 'Medium priority', bar: colors.caution },
  low: { word: 'Low priority', bar: colors.accent },
} as const;

export function attentionHref(list: AttentionList, siteId: string | null): AppHref {
  return `/attention/${list}${siteId ? `?siteId=${encodeURIComponent(siteId)}` : ''}`;
}

/** The dashboard's standing caution: where the lists come from, and what governs. */
export function AttentionCaution() {
  return (
    <View testID="attention-caution" style={styles.caution}>
      <T variant="small" style={styles.cautionText}>
        Dates and lists come from the recorded studies, labels and field reports in Emberline. The facility’s electrical
        safety program governs what must be done and by when.
      </T>
    </View>
  );
}

/** All sites, or one: kept in the address so a list opened from here and the way back keep it. */
export function SiteFilter({ siteId, onChange }: { siteId: string | null; onChange: (id: string | null) => void }) {
  const sites = useSites();
  if (!sites.data || sites.data.length < 2) return null;
  return (
    <Choice
      label="Site"
      value={siteId ?? ''}
      onChange={(v) => onChange(v || null)}
      options={[{ value: '', label: 'All sites' }, ...sites.data.map((s) => ({ value: s.id, label: s.name }))]}
      testID="attention-site"
    />
  );
}

function CountCard({
  list,
  count,
  siteId,
  wide,
}: {
  list: AttentionList;
  count: number;
  siteId: string | null;
  wide: boolean;
}) {
  const info = ATTENTION_LIST_INFO[list];
  const sev = SEVERITY[info.severity];
  const some = count > 0;
  return (
    <Link href={attentionHref(list, siteId)} asChild>
      <Pressable
        accessibilityRole="link"
        testID={`attention-card-${list}`}
        style={cardStyle(wide, some ? sev.bar : colors.lineSoft)}
      >
        <View style={styles.cardHead}>
          <View style={styles.cardTitle}>
            <T variant="subheading">{info.title}</T>
            <T variant="label" style={some ? styles.severity : styles.none}>
              {some ? sev.word.toUpperCase() : 'NOTHING HERE'}
            </T>
          </View>
          <Num
            value={String(count)}
            size={30}
            bold
            style={some ? styles.count : styles.none}
            testID={`attention-count-${list}`}
          />
        </View>
        {wide ? <T variant="small">{info.description}</T> : null}
      </Pressable>
    </Link>
  );
}

/** The count of each list as cards (the dashboard, and the safety officer's home). */
export function AttentionCards({ summary, siteId }: { summary: AttentionSummary; siteId: string | null }) {
  const { wide } = useLayout();
  return (
    <View style={[styles.cards, wide && styles.cardsWide]} testID="attention-cards">
      {ATTENTION_LISTS.map((l) => (
        <CountCard key={l} list={l} count={summary.counts[l] ?? 0} siteId={siteId} wide={wide} />
      ))}
    </View>
  );
}

export function OpenReportAges({ summary, siteId }: { summary: AttentionSummary; siteId: string | null }) {
  const a = summary.openReportAges;
  const total = a.under7Days + a.from7To30Days + a.over30Days;
  const parts = [
    { label: 'Under 7 days', value: a.under7Days },
    { label: '7 to 30 days', value: a.from7To30Days },
    { label: 'Over 30 days', value: a.over30Days },
  ];
  return (
    <Card testID="open-report-ages">
      <View style={styles.agesHead}>
        <T variant="subheading">Open field reports by age</T>
        <Link href={attentionHref('open-reports', siteId)} style={styles.link}>
          {total ? 'Open the list →' : 'See the list →'}
        </Link>
      </View>
      {total === 0 ? (
        <T variant="small">
          No open field reports. Mismatches reported from the field appear here until they are resolved.
        </T>
      ) : null}
      <View style={styles.ages}>
        {parts.map((p) => (
          <View key={p.label} style={styles.age}>
            <Num value={String(p.value)} size={26} bold style={p.value ? styles.count : styles.none} />
            <T variant="small">{p.label}</T>
          </View>
        ))}
      </View>
    </Card>
  );
}

function SiteBreakdown({ summary }: { summary: AttentionSummary }) {
  const { wide } = useLayout();
  if (summary.sites.length === 0) return null;
  if (wide) {
    return (
      <Table
        testID="attention-sites"
        columns={[
          { key: 'site', label: 'Site', flex: 2 },
          ...ATTENTION_LISTS.map((l) => ({ key: l, label: ATTENTION_SHORT[l], numeric: true })),
        ]}
        rows={summary.sites.map((s) => ({
          key: s.siteId,
          testID: `attention-site-${s.siteId}`,
          cells: {
            site: <T style={styles.siteName}>{s.siteName}</T>,
            ...Object.fromEntries(
              ATTENTION_LISTS.map((l) => {
                const n = s.counts[l] ?? 0;
                return [
                  l,
                  <Link key={l} href={attentionHref(l, s.siteId)} style={n ? styles.siteCount : styles.siteCountNone}>
                    {String(n)}
                  </Link>,
                ];
              }),
            ),
          },
        }))}
      />
    );
  }
  return (
    <View style={styles.sites} testID="attention-sites">
      {summary.sites.map((s) => (
        <Card key={s.siteId} testID={`attention-site-${s.siteId}`}>
          <T variant="subheading">{s.siteName}</T>
          <View>
            {ATTENTION_LISTS.map((l) => {
              const n = s.counts[l] ?? 0;
              return (
                <Link key={l} href={attentionHref(l, s.siteId)} asChild>
                  <Pressable accessibilityRole="link" style={styles.siteListRow}>
                    <ValueRow label={ATTENTION_LIST_INFO[l].title}>
                      <Num value={String(n)} bold={n > 0} style={n ? styles.count : styles.none} />
                    </ValueRow>
                  </Pressable>
                </Link>
              );
            })}
          </View>
        </Card>
      ))}
    </View>
  );
}

/** The site filter kept in the address (`?siteId=`). */
export function useSiteParam(): [string | null, (id: string | null) => void] {
  const params = useLocalSearchParams<{ siteId?: string }>();
  const router = useRouter();
  const siteId = typeof params.siteId === 'string' && params.siteId ? params.siteId : null;
  return [siteId, (id) => router.setParams({ siteId: id ?? undefined })];
}

/** The safety officer's dashboard: what needs attention, per list and per site. */
export function AttentionScreen() {
  const [siteId, setSiteId] = useSiteParam();
  const summary = useAttentionSummary(siteId);
  const s = summary.data;
  const anything = !!s && ATTENTION_LISTS.some((l) => (s.counts[l] ?? 0) > 0);
  return (
    <Screen
      title="Needs attention"
      subtitle={
        s
          ? `As of ${fmtDateTime(s.asOf)} · review interval ${s.reviewIntervalMonths} months · labels due installed ${s.notInstalledAfterDays} days after issue`
          : 'Studies, labels and field reports that need someone to act.'
      }
    >
      <AttentionCaution />
      <SiteFilter siteId={siteId} onChange={setSiteId} />
      <QueryError error={summary.error} title="The dashboard could not be loaded" />
      {summary.isLoading ? <Loading what="Counting what needs attention…" /> : null}
      {s ? (
        <>
          {!anything ? (
            <Notice tone="ok" testID="attention-clear">
              Nothing needs attention{siteId ? ' at this site' : ''} right now.
            </Notice>
          ) : null}
          <AttentionCards summary={s} siteId={siteId} />
          <OpenReportAges summary={s} siteId={siteId} />
          {s.sites.length ? <T variant="heading">By site</T> : null}
          <SiteBreakdown summary={s} />
        </>
      ) : null}
    </Screen>
  );
}

/**
 * A count card's box, its left bar in the list's severity colour. One plain object, not an array: the card is the child
 * of a `Link asChild`, which merges its own props into the child's style.
 */
function cardStyle(wide: boolean, barColor: string) {
  return StyleSheet.flatten([styles.card, wide && styles.cardWide, { borderLeftColor: barColor }]);
}

const styles = StyleSheet.create({
  /** Words and numbers of a list with something in it, and of an empty one. */
  severity: { color: colors.inkSoft },
  count: { color: colors.ink },
  none: { color: colors.muted },
  caution: {
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radius.md,
    paddingVertical: space.sm,
    paddingHorizontal: space.md,
    backgroundColor: colors.surface,
  },
  cautionText: { color: colors.inkSoft },
  card: {
    flexGrow: 1,
    flexBasis: 'auto',
    minHeight: touch.min + 24,
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.lineSoft,
    borderLeftWidth: 5,
    padding: space.lg,
    gap: space.xs,
  },
  cardWide: { flexBasis: 280 },
  cardHead: { flexDirection: 'row', alignItems: 'flex-start', justifyContent: 'space-between', gap: space.md },
  cardTitle: { flexShrink: 1, gap: 2 },
  cards: { gap: space.md },
  cardsWide: { flexDirection: 'row', flexWrap: 'wrap' },
  agesHead: { flexDirection: 'row', justifyContent: 'space-between', flexWrap: 'wrap', gap: space.sm },
  link: { color: colors.accent, fontSize: 15, fontFamily: fonts.textMedium },
  ages: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xl },
  age: { gap: 2, minWidth: 90 },
  siteName: { fontFamily: fonts.textMedium },
  siteCount: { textAlign: 'right', fontFamily: fonts.numbers, fontSize: 16, color: colors.accent },
  siteCountNone: { textAlign: 'right', fontFamily: fonts.numbers, fontSize: 16, color: colors.muted },
  sites: { gap: space.md },
  siteListRow: { minHeight: 40, justifyContent: 'center' },
});
