import { REPORT_KIND_LABELS, REPORT_KINDS } from '../../shared/schemas/fieldReports';
import React, { useState } from 'react';
import { Platform, StyleSheet, View } from 'react-native';
import { LABEL_STATUS_LABELS } from '../../shared/schemas/labels';
import { applyServerErrors, serverErrors, useZodForm } from '../../hooks/forms';
import { useLabelCheck, useLabelDetail, useMarkInstalled, useReportMismatch } from '../../hooks/labels';
import { useCan } from '../../hooks/permissions';
import { useLayout } from '../../hooks/useLayout';
import { Cautions } from '../Cautions';
import { LabelView } from '../labels/LabelView';
import { colors, fonts, radius, space } from '../theme';
import { contract } from '../../shared/api';
import { FormChoice, FormTextField } from '../form';
import { Button, Card, Notice, Screen, T } from '../ui';

const KINDS = REPORT_KINDS.map((value) => ({ value, label: REPORT_KIND_LABELS[value] }));

function PhotoInput({ onFile, testID, label }: { onFile: (f: File | null) => void; testID: string; label: string }) {
  if (Platform.OS !== 'web') return null;
  return (
    <View style={styles.photoInput}>
      <T variant="label">{label}</T>
      {React.createElement('input', {
        type: 'file',
        accept: 'image/jpeg,image/png',
        capture: 'environment',
        'data-testid': testID,
        onChange: (e: { target: { files?: FileList | null } }) => onFile(e.target.files?.[0] ?? null),
        style: { fontSize: 15, padding: 8 },
      })}
      <T variant="small">JPEG or PNG, at most 10 MB.</T>
    </View>
  );
}

function InstallPanel({ code }: { code: string }) {
  const install = useMarkInstalled(code);
  const [photo, setPhoto] = useState<File | null>(null);
  const [error, setError] = useState<string | null>(null);
  return (
    <Card testID="install-panel">
      <T variant="subheading">Mark installed</T>
      <T variant="small">Take a photo of the label in place on the equipment.</T>
      <PhotoInput onFile={setPhoto} testID="install-photo" label="Photo of the installed label" />
      {error ? <Notice tone="error">{error}</Notice> : null}
      {install.isSuccess ? <Notice tone="ok">Recorded as installed.</Notice> : null}
      <Button
        title="Mark installed"
        testID="mark-installed"
        busy={install.isPending}
        onPress={() => {
          if (!photo) return setError('Add a photo of the installed label');
          setError(null);
          install.mutate(photo, { onError: (e) => setError(serverErrors(e).message) });
        }}
      />
    </Card>
  );
}

function ReportPanel({ code }: { code: string }) {
  const report = useReportMismatch(code);
  // The text fields of the multipart report, checked with the route's own schema; the photo travels beside them.
  const form = useZodForm(contract.labels.report.body, { defaultValues: { kind: 'device', text: '' } });
  const [photo, setPhoto] = useState<File | null>(null);
  const [error, setError] = useState<string | null>(null);
  const send = () => {
    setError(null);
    void form.handleSubmit(({ kind, text }) =>
      report.mutate({ kind, text, photo }, { onError: (e) => setError(applyServerErrors(form, e)) }),
    )();
  };
  return (
    <Card testID="report-panel">
      <T variant="subheading">Report what does not match</T>
      <FormChoice control={form.control} name="kind" label="What does not match" options={KINDS} testID="report-kind" />
      <FormTextField
        control={form.control}
        name="text"
        label="What you see"
        testID="report-text"
        multiline
        style={styles.reportText}
        hint="e.g. the breaker on the door is a 400 A frame, the label names a 600 A feeder"
      />
      <PhotoInput onFile={setPhoto} testID="report-photo" label="Photo (optional)" />
      {error ? <Notice tone="error">{error}</Notice> : null}
      {report.isSuccess ? <Notice tone="ok">Report sent to the engineers and the safety officer.</Notice> : null}
      <Button title="Send report" testID="send-report" kind="secondary" busy={report.isPending} onPress={send} />
    </Card>
  );
}

/** A label of the organization: what it says, its status, and the electrician's field actions. */
export function LabelScreen({ code }: { code: string }) {
  const can = useCan();
  const { wide } = useLayout();
  const detail = useLabelDetail(code);
  const check = useLabelCheck(code);
  if (detail.error)
    return (
      <Screen title="Label">
        <Notice tone="error">{detail.error.message}</Notice>
      </Screen>
    );
  if (!detail.data)
    return (
      <Screen title="Label">
        <T variant="small">Loading…</T>
      </Screen>
    );
  const l = detail.data;
  const tone = l.status === 'current' ? colors.ok : l.status === 'superseded' ? colors.danger : colors.caution;
  const field = can('fieldWork');
  const info = (
    <View style={styles.info}>
      <View style={[styles.status, { backgroundColor: tone }]} testID="label-status">
        <T style={styles.statusWord}>{LABEL_STATUS_LABELS[l.status].toUpperCase()}</T>
        <T style={styles.statusDetail}>
          {l.installedAt
            ? `Installed ${l.installedAt.slice(0, 10)}${l.installedBy ? ` by ${l.installedBy}` : ''}`
            : 'Not marked installed'}{' '}
          · {l.printedAt ? `printed ${l.printedAt.slice(0, 10)}` : 'not printed yet'}
        </T>
      </View>
      {l.status === 'superseded' && check.data?.current ? (
        <Notice tone="error" title="Superseded">
          Replace this label: the current label of {l.equipmentTag} says{' '}
          {check.data.current.incidentEnergyCalPerCm2.toFixed(2)} cal/cm² (revision {check.data.current.studyRevision}).
        </Notice>
      ) : null}
      {field && l.status !== 'superseded' && !l.installedAt ? <InstallPanel code={l.code} /> : null}
      {field ? <ReportPanel code={l.code} /> : null}
      <Cautions reviewed incidentEnergyCalPerCm2={l.content.incidentEnergyCalPerCm2} compact />
    </View>
  );
  return (
    <Screen
      title={`${l.content.equipmentName} (${l.equipmentTag})`}
      subtitle={`${l.content.siteName} · code ${l.code}`}
    >
      {wide ? (
        <View style={styles.split}>
          <View style={styles.column}>
            <LabelView content={l.content} code={l.code} width={420} />
          </View>
          <View style={styles.column}>{info}</View>
        </View>
      ) : (
        <>
          {info}
          <LabelView content={l.content} code={l.code} />
        </>
      )}
    </Screen>
  );
}

const styles = StyleSheet.create({
  photoInput: { gap: space.xs },
  reportText: { minHeight: 90 },
  info: { gap: space.lg },
  status: { borderRadius: radius.lg, padding: space.lg },
  statusWord: { color: '#fff', fontFamily: fonts.textBold, fontSize: 28 },
  statusDetail: { color: '#fff' },
  split: { flexDirection: 'row', gap: space.xl, alignItems: 'flex-start' },
  column: { flex: 1 },
});
