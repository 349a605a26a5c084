import { Link, useLocalSearchParams } from 'expo-router';
import React, { useMemo, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { auditQuerySchema, type AuditEventDto } from '../../shared/schemas/auditLog';
import { AUDIT_PAGE_SIZE, auditCsvPath, useAuditEvents, type AuditFilters } from '../../hooks/attention';
import { fmtDateTime } from '../../hooks/dates';
import { downloadFile } from '../../hooks/download';
import { serverErrors } from '../../hooks/forms';
import { useDebounced } from '../../hooks/useDebounced';
import { useLayout } from '../../hooks/useLayout';
import { colors, fonts, radius, space } from '../theme';
import { Button, Choice, Empty, Field, ListScreen, Loading, Notice, QueryError, T } from '../ui';

/** Action prefixes (ending in a dot: the API matches them as prefixes; several comma-separated) to narrow the log by what was acted on. */
const ACTION_CHIPS = [
  { value: '', label: 'Everything' },
  { value: 'study.', label: 'Studies' },
  { value: 'label.,labels.', label: 'Labels' },
  { value: 'field-report.', label: 'Field reports' },
  { value: 'site.', label: 'Sites' },
  { value: 'user.', label: 'People' },
  { value: 'invitation.', label: 'Invitations' },
  { value: 'password.', label: 'Passwords' },
  { value: 'auth.', label: 'Sign-ins' },
  { value: 'reminder-rule.,reminders.', label: 'Reminders' },
  { value: 'mail.', label: 'Mail' },
  { value: 'organization.', label: 'Settings' },
] as const;
type ActionChip = (typeof ACTION_CHIPS)[number]['value'];

const dateSchema = auditQuerySchema.shape.from;

function dateError(value: string): string | undefined {
  if (!value.trim()) return undefined;
  return dateSchema.safeParse(value.trim()).success ? undefined : 'A date as YYYY-MM-DD';
}

function EventRow({ e, wide }: { e: AuditEventDto; wide: boolean }) {
  const who = e.actor ? e.actor.name : 'The system';
  if (wide) {
    return (
      <View testID={`audit-event-${e.id}`} style={styles.wideRow}>
        <T style={styles.when}>{fmtDateTime(e.at).replace(' UTC', '')}</T>
        <View style={styles.actorColumn}>
          <T style={styles.actorName}>{who}</T>
          {e.actor ? (
            <T variant="small" numberOfLines={1}>
              {e.actor.email}
            </T>
          ) : null}
        </View>
        <View style={styles.whatColumn}>
          <T style={styles.description}>{e.description}</T>
          <T variant="small" style={styles.action}>
            {e.action}
          </T>
        </View>
      </View>
    );
  }
  return (
    <View testID={`audit-event-${e.id}`} style={styles.narrowRow}>
      <T style={styles.description}>{e.description}</T>
      <T variant="small">
        {who} · {fmtDateTime(e.at)}
      </T>
      <T variant="small" style={styles.action}>
        {e.action}
      </T>
    </View>
  );
}

/** Who did what and when: searchable, filterable, exportable. Nothing here can be edited or deleted. */
export function AuditLogScreen() {
  const { wide } = useLayout();
  const params = useLocalSearchParams<{ entityType?: string; entityId?: string; actorId?: string }>();
  const [q, setQ] = useState('');
  const [action, setAction] = useState<ActionChip>('');
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const [showFilters, setShowFilters] = useState(false);
  const [downloading, setDownloading] = useState(false);
  const [downloadError, setDownloadError] = useState<string | null>(null);
  const dq = useDebounced(q.trim());
  const dFrom = useDebounced(from.trim());
  const dTo = useDebounced(to.trim());
  const fromError = dateError(from);
  const toError = dateError(to);

  const filters: AuditFilters = useMemo(
    () => ({
      q: dq || undefined,
      action: action || undefined,
      from: dFrom && !dateError(dFrom) ? dFrom : undefined,
      to: dTo && !dateError(dTo) ? dTo : undefined,
      entityType: params.entityType || undefined,
      entityId: params.entityId || undefined,
      actorId: params.actorId || undefined,
    }),
    [dq, action, dFrom, dTo, params.entityType, params.entityId, params.actorId],
  );
  const events = useAuditEvents(filters);
  const all = events.data?.pages.flatMap((p) => p.events) ?? [];
  const filtered = !!(filters.q || filters.action || filters.from || filters.to);
  const activeFilters = [action, from.trim(), to.trim()].filter(Boolean).length;
  const scoped = !!(params.entityType || params.entityId || params.actorId);

  const exportCsv = () => {
    setDownloadError(null);
    setDownloading(true);
    downloadFile(auditCsvPath(filters), 'audit-log.csv')
      .catch((e) => setDownloadError(serverErrors(e).message))
      .finally(() => setDownloading(false));
  };

  const rowFrame = (i: number) => [
    styles.rowFrame,
    i === 0 && !wide ? styles.rowFrameFirst : null,
    i === all.length - 1 ? styles.rowFrameLast : null,
  ];

  // The events are the rows of a virtualized list (the log grows a page at a time as "Load more" is pressed).
  return (
    <ListScreen
      title="Audit log"
      subtitle="Every change to studies, labels, reports, people and settings: who, what and when. The log cannot be edited."
      actions={
        <Button title="Export CSV" kind="secondary" testID="audit-export" busy={downloading} onPress={exportCsv} />
      }
      data={all}
      keyExtractor={(e) => e.id}
      renderItem={(e, i) => (
        <View style={rowFrame(i)}>
          <EventRow e={e} wide={wide} />
        </View>
      )}
      listTestID={all.length ? 'audit-events' : undefined}
      initialNumToRender={AUDIT_PAGE_SIZE}
      footer={
        events.hasNextPage ? (
          <View style={styles.buttonRow}>
            <Button
              title="Load more"
              kind="secondary"
              testID="audit-load-more"
              busy={events.isFetchingNextPage}
              onPress={() => void events.fetchNextPage()}
            />
          </View>
        ) : null
      }
    >
      {scoped ? (
        <Notice testID="audit-scope">
          <T>
            Showing only the events of {params.entityType ?? 'one'} {params.entityId ?? ''}
            {params.actorId ? ` by one person` : ''}.{' '}
            <Link href="/audit-log" style={styles.link}>
              Show every event
            </Link>
          </T>
        </Notice>
      ) : null}
      <View style={styles.filters}>
        <Field
          label="Search"
          testID="audit-search"
          value={q}
          onChangeText={setQ}
          placeholder="Name, tag, word…"
          autoCapitalize="none"
        />
        {wide || showFilters ? (
          <>
            <Choice label="About" value={action} onChange={setAction} options={ACTION_CHIPS} testID="audit-action" />
            <View style={styles.dateRow}>
              <Field
                label="From"
                testID="audit-from"
                value={from}
                onChangeText={setFrom}
                placeholder="YYYY-MM-DD"
                error={fromError}
                containerStyle={styles.dateField}
              />
              <Field
                label="Until (including that day)"
                testID="audit-to"
                value={to}
                onChangeText={setTo}
                placeholder="YYYY-MM-DD"
                error={toError}
                containerStyle={styles.dateField}
              />
            </View>
          </>
        ) : null}
        {!wide ? (
          <View style={styles.buttonRow}>
            <Button
              title={showFilters ? 'Hide filters' : `Filters${activeFilters ? ` (${activeFilters} on)` : ''}`}
              kind="quiet"
              testID="audit-filters"
              onPress={() => setShowFilters((v) => !v)}
            />
          </View>
        ) : null}
      </View>
      {downloadError ? <Notice tone="error">{downloadError}</Notice> : null}
      <QueryError error={events.error} title="The log could not be loaded" />
      {events.isLoading ? <Loading what="Loading the log…" /> : null}
      {events.data ? (
        <T variant="small" testID="audit-count">
          {all.length === 1 ? '1 event' : `${all.length} events`} shown
          {events.hasNextPage ? ', newest first; more below' : ''}
        </T>
      ) : null}
      {events.data && all.length === 0 ? (
        <Empty title={filtered ? 'No events match' : 'No events yet'} testID="audit-empty">
          {filtered
            ? 'Nothing in the log matches these filters. Clear the search or widen the dates.'
            : 'Changes to studies, labels, field reports, people, invitations and settings are recorded here as they happen.'}
        </Empty>
      ) : null}
      {all.length > 0 && wide ? (
        <View style={styles.tableHead}>
          <T variant="label" style={styles.whenHead}>
            WHEN (UTC)
          </T>
          <T variant="label" style={styles.actorHead}>
            WHO
          </T>
          <T variant="label" style={styles.whatHead}>
            WHAT
          </T>
        </View>
      ) : null}
    </ListScreen>
  );
}

/** The wide table's fixed columns (header and rows). */
const WHEN_WIDTH = 130;
const WHO_WIDTH = 170;

const styles = StyleSheet.create({
  /** The frame around each event: the list's first and last rows close the card's rounded border. */
  rowFrame: {
    backgroundColor: colors.surface,
    borderLeftWidth: 1,
    borderRightWidth: 1,
    borderColor: colors.lineSoft,
  },
  rowFrameFirst: {
    marginTop: space.lg,
    borderTopWidth: 1,
    borderTopLeftRadius: radius.lg,
    borderTopRightRadius: radius.lg,
  },
  rowFrameLast: {
    borderBottomWidth: 1,
    borderBottomLeftRadius: radius.lg,
    borderBottomRightRadius: radius.lg,
    overflow: 'hidden',
  },
  wideRow: {
    flexDirection: 'row',
    gap: space.md,
    paddingHorizontal: space.lg,
    paddingVertical: space.md,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  when: { width: WHEN_WIDTH, fontFamily: fonts.numbers, fontSize: 13, color: colors.inkSoft },
  actorColumn: { width: WHO_WIDTH, gap: 2 },
  actorName: { fontSize: 15, fontFamily: fonts.textMedium },
  whatColumn: { flex: 1, gap: 2 },
  description: { fontSize: 15 },
  action: { fontFamily: fonts.numbers, fontSize: 12 },
  narrowRow: {
    paddingHorizontal: space.lg,
    paddingVertical: space.md,
    gap: 2,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  buttonRow: { flexDirection: 'row' },
  link: { color: colors.accent },
  filters: {
    gap: space.md,
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.lineSoft,
    padding: space.lg,
  },
  dateRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  dateField: { flexGrow: 1, flexBasis: 160 },
  tableHead: {
    flexDirection: 'row',
    gap: space.md,
    paddingHorizontal: space.lg,
    paddingVertical: space.md,
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderBottomColor: colors.line,
    borderTopColor: colors.lineSoft,
    borderLeftColor: colors.lineSoft,
    borderRightColor: colors.lineSoft,
    borderTopLeftRadius: radius.lg,
    borderTopRightRadius: radius.lg,
  },
  whenHead: { width: WHEN_WIDTH },
  actorHead: { width: WHO_WIDTH },
  whatHead: { flex: 1 },
});
