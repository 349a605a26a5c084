import { Link } from 'expo-router';
import React, { useState } from 'react';
import { Image, StyleSheet, View } from 'react-native';
import {
  fieldReportTriageSchema,
  type FieldReportDto,
  type FieldReportTriage,
} from '../../shared/schemas/fieldReports';
import { useFieldReport, useTriageReport } from '../../hooks/attention';
import { fmtAgeDays, fmtDateTime } from '../../hooks/dates';
import { applyServerErrors, useZodForm } from '../../hooks/forms';
import { useCan } from '../../hooks/permissions';
import { useAuthedImage } from '../../hooks/useAuthedImage';
import { useLayout } from '../../hooks/useLayout';
import { colors, fonts, radius, space } from '../theme';
import { FormTextField } from '../form';
import { Button, Card, Loading, Notice, QueryError, Screen, T, ValueRow } from '../ui';
import { kindLabel, ReportStatus } from './ReportsScreen';
import { apiPath } from '../../hooks/api';
import { contract } from '../../shared/api';

function Photo({ reportId }: { reportId: string }) {
  const img = useAuthedImage(apiPath(contract.attention.fieldReportPhoto, { params: { reportId } }));
  return (
    <Card testID="report-photo">
      <T variant="subheading">Photo from the field</T>
      {img.loading ? <Loading what="Loading the photo…" /> : null}
      {img.error ? <Notice tone="error">{img.error}</Notice> : null}
      {img.uri ? (
        <Image
          source={{ uri: img.uri }}
          resizeMode="contain"
          accessibilityLabel="Photo attached to the report"
          testID="report-photo-image"
          style={styles.photo}
        />
      ) : null}
    </Card>
  );
}

function Timeline({ r }: { r: FieldReportDto }) {
  return (
    <Card testID="report-timeline">
      <T variant="subheading">Triage</T>
      <ValueRow label="Reported">
        <T style={styles.timelineText}>
          {fmtDateTime(r.createdAt)} by {r.reporter.name}
        </T>
      </ValueRow>
      <ValueRow label="Acknowledged">
        <T style={styles.timelineText} testID="report-acknowledged">
          {r.acknowledgedAt
            ? `${fmtDateTime(r.acknowledgedAt)}${r.acknowledgedBy ? ` by ${r.acknowledgedBy}` : ''}`
            : 'Not yet'}
        </T>
      </ValueRow>
      <ValueRow label="Resolved">
        <T style={styles.timelineText} testID="report-resolved">
          {r.resolvedAt ? `${fmtDateTime(r.resolvedAt)}${r.resolvedBy ? ` by ${r.resolvedBy}` : ''}` : 'Not yet'}
        </T>
      </ValueRow>
      {r.resolutionNote ? (
        <View style={styles.resolution}>
          <T variant="label">WHAT WAS DONE</T>
          <T testID="report-resolution-note">{r.resolutionNote}</T>
        </View>
      ) : null}
    </Card>
  );
}

/** The triage as entered: the button pressed chooses the status; a note is needed to resolve. */
type TriageFields = { status: FieldReportTriage['status']; note: string };

const triageInput = ({ status, note }: TriageFields) =>
  status === 'resolved' ? { status, note } : { status, note: note.trim() || undefined };

/** Engineer and safety officer: acknowledge the report, then resolve it with a note of what was done. */
function TriagePanel({ r }: { r: FieldReportDto }) {
  const triage = useTriageReport(r.id);
  const form = useZodForm<typeof fieldReportTriageSchema, TriageFields>(fieldReportTriageSchema, {
    defaultValues: { status: 'acknowledged', note: '' },
    toInput: triageInput,
  });
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  if (r.status === 'resolved') return null;

  const send = (status: TriageFields['status']) => {
    setError(null);
    setDone(null);
    form.setValue('status', status);
    void form.handleSubmit((data) =>
      triage.mutate(data, {
        onSuccess: () => {
          form.reset({ status, note: '' });
          setDone(
            status === 'resolved'
              ? 'Resolved. The reporter sees the status and your note.'
              : 'Acknowledged. The reporter sees that it is being looked into.',
          );
        },
        onError: (e) => setError(applyServerErrors(form, e)),
      }),
    )();
  };

  return (
    <Card testID="triage-panel">
      <T variant="subheading">{r.status === 'open' ? 'Acknowledge or resolve' : 'Resolve'}</T>
      <FormTextField
        control={form.control}
        name="note"
        label={r.status === 'open' ? 'Note (needed to resolve)' : 'What was done'}
        testID="triage-note"
        multiline
        numberOfLines={3}
        hint="e.g. setting corrected to match the study; label reprinted and replaced"
      />
      {error ? <Notice tone="error">{error}</Notice> : null}
      {done ? <Notice tone="ok">{done}</Notice> : null}
      <View style={styles.buttons}>
        {r.status === 'open' ? (
          <Button
            title="Acknowledge"
            kind="secondary"
            testID="triage-acknowledge"
            busy={triage.isPending && triage.variables?.status === 'acknowledged'}
            onPress={() => send('acknowledged')}
          />
        ) : null}
        <Button
          title="Resolve"
          testID="triage-resolve"
          busy={triage.isPending && triage.variables?.status === 'resolved'}
          onPress={() => send('resolved')}
        />
      </View>
    </Card>
  );
}

/** One field report: what was seen, on which label, the photo, and its triage. */
export function ReportScreen({ reportId }: { reportId: string }) {
  const can = useCan();
  const { wide } = useLayout();
  const report = useFieldReport(reportId);
  const canTriage = can('triageReports');
  if (report.error) {
    return (
      <Screen title="Field report">
        <QueryError error={report.error} />
        <Link href="/reports" style={styles.backLink}>
          ← All reports
        </Link>
      </Screen>
    );
  }
  if (!report.data) {
    return (
      <Screen title="Field report">
        <Loading what="Loading the report…" />
      </Screen>
    );
  }
  const r = report.data;
  const main = (
    <View style={styles.column}>
      <Card testID="report-detail">
        <View style={styles.detailHead}>
          <T variant="label">{kindLabel(r.kind).toUpperCase()}</T>
          <ReportStatus status={r.status} testID="report-status" />
        </View>
        <T style={styles.reportText}>{r.text}</T>
        <T variant="small">
          {r.reporter.name} · {fmtDateTime(r.createdAt)} ({fmtAgeDays(r.ageDays)})
        </T>
        <Link href={`/labels/${encodeURIComponent(r.labelCode)}`} style={styles.labelLink} testID="report-label-link">
          Open the label of {r.equipmentTag} (code <T style={styles.labelCode}>{r.labelCode}</T>) →
        </Link>
      </Card>
      {r.hasPhoto ? <Photo reportId={r.id} /> : null}
    </View>
  );
  const side = (
    <View style={styles.column}>
      <Timeline r={r} />
      {canTriage ? <TriagePanel r={r} /> : null}
      {!canTriage && r.status !== 'resolved' ? (
        <Notice>
          {!can('seeAllFieldReports')
            ? 'The engineers and the safety officer see this report. Its status changes here when they acknowledge and resolve it.'
            : 'Engineers and safety officers acknowledge and resolve reports.'}
        </Notice>
      ) : null}
    </View>
  );
  return (
    <Screen title={`${r.equipmentTag} · field report`} subtitle={r.siteName}>
      <Link href="/reports" style={styles.backLinkSmall}>
        ← All reports
      </Link>
      {wide ? (
        <View style={styles.columns}>
          <View style={styles.mainColumn}>{main}</View>
          <View style={styles.sideColumn}>{side}</View>
        </View>
      ) : (
        <>
          {main}
          {side}
        </>
      )}
    </Screen>
  );
}

const styles = StyleSheet.create({
  photo: { width: '100%', height: 320, borderRadius: radius.md, backgroundColor: colors.canvas },
  timelineText: { fontSize: 15 },
  resolution: { gap: 2 },
  buttons: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  backLink: { color: colors.accent, fontSize: 16, fontFamily: fonts.textMedium },
  column: { gap: space.lg },
  detailHead: {
    flexDirection: 'row',
    justifyContent: 'space-between',
    alignItems: 'center',
    flexWrap: 'wrap',
    gap: space.sm,
  },
  reportText: { fontSize: 18, lineHeight: 26 },
  labelLink: { color: colors.accent, fontSize: 16, fontFamily: fonts.textMedium },
  labelCode: { fontFamily: fonts.numbers, color: colors.accent },
  backLinkSmall: { color: colors.accent, fontSize: 15, fontFamily: fonts.textMedium },
  columns: { flexDirection: 'row', gap: space.xl, alignItems: 'flex-start' },
  mainColumn: { flex: 1.3 },
  sideColumn: { flex: 1 },
});
