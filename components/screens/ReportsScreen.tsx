import { Link } from 'expo-router';
import React, { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import {
  FIELD_REPORT_STATUS_LABELS,
  FIELD_REPORT_STATUSES,
  reportKindLabel,
  type FieldReportDto,
  type FieldReportStatus,
} from '../../shared/schemas/fieldReports';
import { useFieldReports } from '../../hooks/attention';
import { fmtAgeDays, fmtDate } from '../../hooks/dates';
import { useSites } from '../../hooks/queries';
import { useCan } from '../../hooks/permissions';
import { useLayout } from '../../hooks/useLayout';
import { fonts, space } from '../theme';
import { cardStyle, Choice, Empty, Loading, Pill, type PillTone, QueryError, Screen, T, Table } from '../ui';

export const kindLabel = reportKindLabel;

const STATUS_TONE: Record<FieldReportStatus, PillTone> = { open: 'caution', acknowledged: 'accent', resolved: 'ok' };

export function ReportStatus({ status, testID }: { status: FieldReportStatus; testID?: string }) {
  return <Pill label={FIELD_REPORT_STATUS_LABELS[status]} tone={STATUS_TONE[status]} testID={testID} />;
}

type StatusFilter = FieldReportStatus | 'all';

function ReportCard({ r, showReporter }: { r: FieldReportDto; showReporter: boolean }) {
  return (
    <Link href={`/reports/${r.id}`} asChild>
      <Pressable accessibilityRole="link" testID={`report-${r.id}`} style={styles.card}>
        <View style={styles.cardHead}>
          <T variant="subheading" style={styles.cardTitle}>
            <T style={styles.tag}>{r.equipmentTag}</T> · {kindLabel(r.kind)}
          </T>
          <ReportStatus status={r.status} />
        </View>
        <T numberOfLines={2}>{r.text}</T>
        <T variant="small">
          {r.siteName} · {fmtAgeDays(r.ageDays)}
          {showReporter ? ` · ${r.reporter.name}` : ''}
        </T>
      </Pressable>
    </Link>
  );
}

/** Field reports: mismatches reported from the field and where their triage stands. Electricians see their own. */
export function ReportsScreen() {
  const can = useCan();
  const { wide } = useLayout();
  const sites = useSites();
  const own = !can('seeAllFieldReports');
  const [status, setStatus] = useState<StatusFilter>('all');
  const [siteId, setSiteId] = useState<string>('');
  const reports = useFieldReports({
    status: status === 'all' ? undefined : status,
    siteId: siteId || undefined,
    mine: own || undefined,
  });
  const rows = reports.data ?? [];
  const statusWord = status === 'all' ? '' : `${FIELD_REPORT_STATUS_LABELS[status].toLowerCase()} `;

  return (
    <Screen
      title={own ? 'My reports' : 'Field reports'}
      subtitle={
        own
          ? 'What you reported from the field as not matching its label, and where each report stands.'
          : 'Mismatches reported from the field. Acknowledge what you are looking into; resolve with a note of what was done.'
      }
    >
      <Choice
        label="Status"
        value={status}
        onChange={setStatus}
        testID="report-status-filter"
        options={[
          { value: 'all' as StatusFilter, label: 'All' },
          ...FIELD_REPORT_STATUSES.map((s) => ({ value: s as StatusFilter, label: FIELD_REPORT_STATUS_LABELS[s] })),
        ]}
      />
      {sites.data && sites.data.length > 1 ? (
        <Choice
          label="Site"
          value={siteId}
          onChange={setSiteId}
          options={[{ value: '', label: 'All sites' }, ...sites.data.map((s) => ({ value: s.id, label: s.name }))]}
          testID="report-site-filter"
        />
      ) : null}
      <QueryError error={reports.error} title="The reports could not be loaded" />
      {reports.isLoading ? <Loading what="Loading field reports…" /> : null}
      {reports.data && rows.length === 0 ? (
        <Empty title={`No ${statusWord}reports`} testID="reports-empty">
          {own
            ? 'When a label does not match the equipment, open the label (Scan or Labels) and use “Report what does not match”. Your reports and their status appear here.'
            : 'Reports that electricians send from a label’s page appear here, oldest open ones first on the dashboard.'}
        </Empty>
      ) : null}
      {rows.length > 0 && wide ? (
        <Table
          testID="reports-table"
          columns={[
            { key: 'tag', label: 'Equipment', flex: 1, mono: true },
            { key: 'kind', label: 'What', flex: 1.2 },
            { key: 'text', label: 'Report', flex: 3 },
            { key: 'site', label: 'Site', flex: 1.4 },
            ...(own ? [] : [{ key: 'reporter', label: 'Reported by', flex: 1.3 }]),
            { key: 'date', label: 'Reported', flex: 1, mono: true },
            { key: 'status', label: 'Status', flex: 1.1 },
          ]}
          rows={rows.map((r) => ({
            key: r.id,
            href: `/reports/${r.id}`,
            testID: `report-${r.id}`,
            cells: {
              tag: r.equipmentTag,
              kind: kindLabel(r.kind),
              text: (
                <T numberOfLines={2} style={styles.tableText}>
                  {r.text}
                </T>
              ),
              site: r.siteName,
              reporter: r.reporter.name,
              date: fmtDate(r.createdAt),
              status: <ReportStatus status={r.status} />,
            },
          }))}
        />
      ) : null}
      {rows.length > 0 && !wide ? (
        <View style={styles.cards}>
          {rows.map((r) => (
            <ReportCard key={r.id} r={r} showReporter={!own} />
          ))}
        </View>
      ) : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  /** A row as a card: one plain entry, as the child of a `Link asChild` needs. */
  card: { ...cardStyle, gap: space.xs },
  cardHead: { flexDirection: 'row', justifyContent: 'space-between', gap: space.sm, alignItems: 'flex-start' },
  cardTitle: { flexShrink: 1 },
  tag: { fontFamily: fonts.numbersBold },
  tableText: { fontSize: 15 },
  cards: { gap: space.md },
});
