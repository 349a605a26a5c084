import type { AppHref } from '../nav';
import { Link } from 'expo-router';
import React, { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import {
  ATTENTION_LIST_INFO,
  type AttentionColumn,
  type AttentionList,
  type AttentionRow,
} from '../../shared/schemas/attention';
import { FIELD_REPORT_STATUS_LABELS, type FieldReportStatus } from '../../shared/schemas/fieldReports';
import { attentionCsvPath, useAttentionList } from '../../hooks/attention';
import { fmtDate, fmtDateTime } from '../../hooks/dates';
import { downloadFile } from '../../hooks/download';
import { serverErrors } from '../../hooks/forms';
import { useLayout } from '../../hooks/useLayout';
import { colors, fonts, space } from '../theme';
import {
  Button,
  cardStyle,
  Empty,
  ListScreen,
  Loading,
  Notice,
  QueryError,
  T,
  TableRowView,
  tableRowFrame,
  TableTop,
  ValueRow,
  type TableColumn,
  type TableRow,
} from '../ui';
import { AttentionCaution, SiteFilter, useSiteParam } from './AttentionScreen';
import { kindLabel } from './ReportsScreen';

/** Where a row of a list opens: its study, its label (by the code in its cells) or its field report. */
export function rowHref(row: AttentionRow): AppHref {
  switch (row.link.kind) {
    case 'study':
      return `/studies/${encodeURIComponent(row.link.id)}`;
    case 'label': {
      const code = row.cells.code;
      return typeof code === 'string' && code
        ? `/labels/${encodeURIComponent(code)}`
        : `/labels?site=${encodeURIComponent(row.siteId)}`;
    }
    case 'field-report':
      return `/reports/${encodeURIComponent(row.link.id)}`;
  }
}

const OPENS: Record<AttentionRow['link']['kind'], string> = {
  study: 'Open the study',
  label: 'Open the label',
  'field-report': 'Open the report',
};

/** Codes some lists carry in their cells, in words. */
const CODE_WORDS: Record<string, (v: string) => string> = {
  kind: kindLabel,
  status: (v) => (v in FIELD_REPORT_STATUS_LABELS ? FIELD_REPORT_STATUS_LABELS[v as FieldReportStatus] : v),
};

function cellText(value: string | number | null | undefined, column: AttentionColumn, list?: AttentionList): string {
  if (value === null || value === undefined || value === '') return '—';
  if (column.kind === 'date' && typeof value === 'string') return value.length > 10 ? fmtDate(value) : value;
  if (list === 'open-reports' && typeof value === 'string' && CODE_WORDS[column.key])
    return CODE_WORDS[column.key](value);
  return String(value);
}

/** Share of the table's width: from the longest of the header and the cells (within limits). */
function columnFlex(column: AttentionColumn, rows: AttentionRow[]): number {
  if (column.kind === 'number') return 0.7;
  if (column.kind === 'date') return 1;
  const longest = Math.max(column.label.length, ...rows.map((r) => String(r.cells[column.key] ?? '').length));
  return Math.min(3, Math.max(0.9, longest / 14));
}

function RowCard({
  row,
  columns,
  showSite,
  list,
}: {
  row: AttentionRow;
  columns: AttentionColumn[];
  showSite: boolean;
  list: AttentionList;
}) {
  const [first, ...rest] = columns;
  return (
    <Link href={rowHref(row)} asChild>
      <Pressable accessibilityRole="link" testID={`attention-row-${row.id}`} style={styles.card}>
        <T variant="subheading">{first ? cellText(row.cells[first.key], first, list) : row.id}</T>
        {showSite ? <T variant="small">{row.siteName}</T> : null}
        <View>
          {rest.map((c) => (
            <ValueRow key={c.key} label={c.label}>
              <T style={c.kind === 'text' ? styles.cellText : styles.cellFigures}>
                {cellText(row.cells[c.key], c, list)}
              </T>
            </ValueRow>
          ))}
        </View>
        <T style={styles.opens}>{OPENS[row.link.kind]} →</T>
      </Pressable>
    </Link>
  );
}

/** One list of the dashboard: its rows, each opening what it is about, and its CSV export. */
export function AttentionListScreen({ list }: { list: AttentionList }) {
  const { wide } = useLayout();
  const [siteId, setSiteId] = useSiteParam();
  const data = useAttentionList(list, siteId);
  const info = ATTENTION_LIST_INFO[list];
  const [downloading, setDownloading] = useState(false);
  const [downloadError, setDownloadError] = useState<string | null>(null);
  const d = data.data;

  const download = () => {
    setDownloadError(null);
    setDownloading(true);
    downloadFile(attentionCsvPath(list, siteId), `${list}.csv`)
      .catch((e) => setDownloadError(serverErrors(e).message))
      .finally(() => setDownloading(false));
  };

  const rows = d?.rows ?? [];
  const tableColumns: TableColumn[] = d
    ? [
        ...d.columns.map((c) => ({
          key: c.key,
          label: c.label,
          flex: columnFlex(c, d.rows),
          numeric: c.kind === 'number',
          mono: c.kind === 'date',
        })),
        { key: '__site', label: 'Site', flex: 1.6 },
      ]
    : [];
  const tableRow = (r: AttentionRow): TableRow => ({
    key: r.id,
    href: rowHref(r),
    testID: `attention-row-${r.id}`,
    cells: {
      ...Object.fromEntries((d?.columns ?? []).map((c) => [c.key, cellText(r.cells[c.key], c, list)])),
      __site: r.siteName,
    },
  });

  // The rows are items of a virtualized list: a table on wide screens, cards on a phone.
  return (
    <ListScreen
      title={d?.title ?? info.title}
      subtitle={d?.description ?? info.description}
      actions={
        <Button
          title="Download CSV"
          kind="secondary"
          testID="download-csv"
          busy={downloading}
          disabled={!d}
          onPress={download}
        />
      }
      data={rows}
      keyExtractor={(r) => r.id}
      renderItem={(r, i) =>
        wide ? (
          <View style={tableRowFrame(i, rows.length)}>
            <TableRowView row={tableRow(r)} columns={tableColumns} />
          </View>
        ) : (
          <View style={styles.cardCell}>
            <RowCard row={r} columns={d?.columns ?? []} showSite={!siteId} list={list} />
          </View>
        )
      }
      listTestID={!wide && rows.length ? 'attention-cards-list' : undefined}
    >
      <Link
        href={siteId ? `/attention?siteId=${encodeURIComponent(siteId)}` : '/attention'}
        style={styles.backLink}
        testID="back-to-dashboard"
      >
        ← All lists
      </Link>
      <AttentionCaution />
      <SiteFilter siteId={siteId} onChange={setSiteId} />
      {downloadError ? <Notice tone="error">{downloadError}</Notice> : null}
      <QueryError error={data.error} title="The list could not be loaded" />
      {data.isLoading ? <Loading what="Loading the list…" /> : null}
      {d ? (
        <>
          <T variant="small" testID="attention-list-count">
            {d.rows.length === 1 ? '1 item' : `${d.rows.length} items`} · as of {fmtDateTime(d.asOf)}
          </T>
          {d.rows.length === 0 ? (
            <Empty title="Nothing on this list" testID="attention-list-empty">
              {`Items appear here when there are ${info.title.toLowerCase()}${siteId ? ' at this site' : ''}. ${info.description}`}
            </Empty>
          ) : wide ? (
            <TableTop columns={tableColumns} testID="attention-table" />
          ) : null}
        </>
      ) : null}
    </ListScreen>
  );
}

const styles = StyleSheet.create({
  cellText: { fontSize: 15, fontFamily: fonts.text, textAlign: 'right' },
  cellFigures: { fontSize: 15, fontFamily: fonts.numbers, textAlign: 'right' },
  /** A row as a card: one plain entry, as the child of a `Link asChild` needs. */
  card: { ...cardStyle, gap: space.xs },
  /** Where the row opens, in link colour (the whole card is the link). */
  opens: { color: colors.accent, fontSize: 15, fontFamily: fonts.textMedium },
  /** A card in the phone's list: the space above it. */
  cardCell: { marginTop: space.md },
  backLink: { color: colors.accent, fontSize: 15, fontFamily: fonts.textMedium },
});
