import { Link, useRouter } from 'expo-router';
import React, { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { approveSchema, type ApproveInput, type StudyDto } from '../../shared/schemas/studies';
import { downloadFile } from '../../hooks/download';
import { applyServerErrors, serverErrors, useZodForm } from '../../hooks/forms';
import { useCan } from '../../hooks/permissions';
import { useUser } from '../../hooks/session';
import {
  useApproveStudy,
  useReturnToDraft,
  useReviseStudy,
  useRun,
  useStartRun,
  useSubmitStudy,
} from '../../hooks/studies';
import { Cautions } from '../Cautions';
import { ComparePanel } from './ComparePanel';
import { ReportAppendixForm } from '../mitigation/ReportAppendixForm';
import { colors, radius, space } from '../theme';
import { FormCheckbox, FormTextField } from '../form';
import { Button, Card, Notice, ProgressBar, T } from '../ui';
import { apiPath } from '../../hooks/api';
import { contract } from '../../shared/api';

const when = (iso: string | null | undefined) =>
  iso ? new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' }) : '—';

function RunPanel({ study }: { study: StudyDto }) {
  const can = useCan();
  const run = useRun(study.id);
  const start = useStartRun(study.id);
  const r = run.data ?? study.latestRun;
  const active = r && (r.status === 'queued' || r.status === 'running');
  const canRun = can('runStudy') && study.status === 'draft';
  return (
    <Card testID="run-panel">
      <T variant="subheading">Run</T>
      <T variant="small">
        Short circuit at every bus, both arcing currents, the clearing time of every device on the way, then incident
        energy and label values.
      </T>
      {r ? (
        <View style={styles.runState}>
          <T testID="run-status">
            {r.status === 'done'
              ? 'Finished'
              : r.status === 'failed'
                ? 'Failed'
                : r.status === 'queued'
                  ? 'Waiting to start'
                  : 'Running'}{' '}
            · {r.message}
          </T>
          {active ? <ProgressBar value={r.progress} testID="run-progress" /> : null}
          <T variant="small">
            Started {when(r.startedAt)}
            {r.finishedAt ? ` · finished ${when(r.finishedAt)}` : ''} · model version {r.modelVersion}
          </T>
          {r.status === 'done' && r.modelVersion !== study.modelVersion ? (
            <Notice tone="warning">
              The model has changed since this run (now version {study.modelVersion}). Run again before review.
            </Notice>
          ) : null}
          {r.status === 'failed' ? <Notice tone="error">{r.message}</Notice> : null}
        </View>
      ) : (
        <T variant="small">Not run yet.</T>
      )}
      {start.error ? <Notice tone="error">{serverErrors(start.error).message}</Notice> : null}
      {canRun ? (
        <Button
          title={active ? 'Running…' : 'Run the study'}
          testID="run-study"
          busy={start.isPending || !!active}
          onPress={() => start.mutate()}
        />
      ) : null}
    </Card>
  );
}

/** The approval's fields as entered: the confirmation starts unticked (the schema takes only a ticked one). */
type ApproveFields = Omit<ApproveInput, 'confirm'> & { confirm: boolean };

function ApproveForm({ study }: { study: StudyDto }) {
  const user = useUser();
  const approve = useApproveStudy(study.id);
  const back = useReturnToDraft(study.id);
  const form = useZodForm<typeof approveSchema, ApproveFields>(approveSchema, {
    defaultValues: { approverName: user.name, licenceNumber: '', jurisdiction: '', confirm: false },
  });
  const [message, setMessage] = useState<string | null>(null);
  const submit = () =>
    void form.handleSubmit((data) =>
      approve.mutate(data, {
        onError: (e) => setMessage(applyServerErrors(form, e)),
      }),
    )();
  return (
    <Card testID="approve-form">
      <T variant="subheading">Review and approval</T>
      <T variant="small">
        Approval records the approving engineer’s name, licence number and jurisdiction. The approved revision can no
        longer change; it supersedes the site’s previous approved revision.
      </T>
      {message ? <Notice tone="error">{message}</Notice> : null}
      <View style={styles.approvalFields}>
        <FormTextField
          control={form.control}
          name="approverName"
          label="Approving engineer"
          testID="approver-name"
          containerStyle={styles.approverField}
        />
        <FormTextField
          control={form.control}
          name="licenceNumber"
          label="Licence number"
          testID="licence-number"
          containerStyle={styles.approvalField}
        />
        <FormTextField
          control={form.control}
          name="jurisdiction"
          label="Jurisdiction"
          testID="jurisdiction"
          containerStyle={styles.approvalField}
        />
      </View>
      <FormCheckbox
        control={form.control}
        name="confirm"
        testID="confirm-review"
        label="I reviewed the model, the results and their warnings, and I take responsibility for this approval."
      />
      <View style={styles.buttonRow}>
        <Button title="Approve this revision" testID="approve" busy={approve.isPending} onPress={submit} />
        <Button title="Return to draft" kind="secondary" busy={back.isPending} onPress={() => back.mutate()} />
      </View>
    </Card>
  );
}

function ReviewPanel({ study }: { study: StudyDto }) {
  const can = useCan();
  const router = useRouter();
  const submit = useSubmitStudy(study.id);
  const revise = useReviseStudy(study.id);
  if (!can('approveStudy')) return null;
  if (study.status === 'draft') {
    return (
      <Card>
        <T variant="subheading">Review</T>
        <T variant="small">Submit when the results on the current model are ready for an engineer’s review.</T>
        {submit.error ? <Notice tone="error">{serverErrors(submit.error).message}</Notice> : null}
        <Button
          title="Submit for review"
          testID="submit-review"
          kind={study.resultsCurrent ? 'primary' : 'secondary'}
          busy={submit.isPending}
          onPress={() => submit.mutate()}
        />
      </Card>
    );
  }
  if (study.status === 'in-review') return <ApproveForm study={study} />;
  return (
    <Card>
      <T variant="subheading">Revise</T>
      <T variant="small">An approved revision never changes. Start a new draft revision from it to make changes.</T>
      {revise.error ? <Notice tone="error">{serverErrors(revise.error).message}</Notice> : null}
      <Button
        title="Start a new revision"
        testID="revise"
        kind="secondary"
        busy={revise.isPending}
        onPress={() => revise.mutate(undefined, { onSuccess: (s) => router.push(`/studies/${s.id}`) })}
      />
    </Card>
  );
}

function Documents({ study }: { study: StudyDto }) {
  const can = useCan();
  const [error, setError] = useState<string | null>(null);
  const approved = study.status === 'approved' || study.status === 'superseded';
  const canReport = can('downloadReport') && (approved || study.resultsCurrent);
  const canPrint = approved && can('printLabels');
  if (!canReport && !canPrint) return null;
  const get = (path: string, name: string) =>
    void downloadFile(path, name).catch((e) => setError(serverErrors(e).message));
  return (
    <Card testID="documents">
      <T variant="subheading">Documents</T>
      {error ? <Notice tone="error">{error}</Notice> : null}
      <View style={styles.buttonRow}>
        {canReport ? (
          <Button
            title="Study report (PDF)"
            kind="secondary"
            testID="study-report"
            onPress={() =>
              get(apiPath(contract.labelBatches.studyReportPdf, { params: { studyId: study.id } }), 'study-report.pdf')
            }
          />
        ) : null}
        {canPrint ? (
          <Button
            title="All labels, 4 × 6 in (PDF)"
            kind="secondary"
            testID="labels-pdf"
            onPress={() =>
              get(
                apiPath(contract.labelBatches.studyLabelsPdf, {
                  params: { studyId: study.id },
                  query: { size: '4x6' },
                }),
                'labels.pdf',
              )
            }
          />
        ) : null}
      </View>
      {canReport && can('mitigate') ? <ReportAppendixForm studyId={study.id} /> : null}
      {!approved ? (
        <T variant="small">The report of an unapproved revision is marked PRELIMINARY on every page.</T>
      ) : null}
    </Card>
  );
}

export function OverviewPanel({ study }: { study: StudyDto }) {
  return (
    <View style={styles.panel}>
      <Card>
        <View style={styles.siteBlock}>
          <T variant="label">SITE</T>
          <Link href={`/sites/${study.siteId}`} style={styles.siteLink}>
            {study.siteName}
          </Link>
          <T variant="label">LAST EDITED</T>
          <T>
            {study.lastEditedBy?.name ?? '—'} · {when(study.modelUpdatedAt)} · model version {study.modelVersion}
          </T>
          {study.approval ? (
            <View style={styles.approvalBlock} testID="approval-block">
              <T variant="label">APPROVED</T>
              <T>
                {study.approval.approverName} · licence {study.approval.licenceNumber} · {study.approval.jurisdiction}
              </T>
              <T variant="small">
                {when(study.approval.approvedAt)} · review by {study.approval.reviewDueAt.slice(0, 10)}
              </T>
            </View>
          ) : null}
          {study.supersededAt ? (
            <Notice tone="warning">Superseded on {when(study.supersededAt)} by a later approved revision.</Notice>
          ) : null}
          {study.pastReview ? (
            <Notice tone="error">
              The review date has passed: this study needs a review (NFPA 70E: at least every five years).
            </Notice>
          ) : null}
          {study.stale ? (
            <Notice tone="warning">
              The site’s model has changed since this approval (a newer revision is being edited).
            </Notice>
          ) : null}
        </View>
      </Card>
      <RunPanel study={study} />
      <ComparePanel study={study} />
      <ReviewPanel study={study} />
      <Documents study={study} />
      <Cautions reviewed={study.status === 'approved'} compact />
    </View>
  );
}

const styles = StyleSheet.create({
  runState: { gap: space.xs },
  approvalFields: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  approverField: { flexGrow: 1, flexBasis: 200 },
  approvalField: { flexGrow: 1, flexBasis: 160 },
  buttonRow: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  panel: { gap: space.lg },
  siteBlock: { gap: 6 },
  siteLink: { color: colors.accent, fontSize: 16 },
  approvalBlock: { gap: 6, padding: space.md, borderRadius: radius.md, backgroundColor: colors.okSoft },
});
