import React, { useDeferredValue, useMemo, useState } from 'react';
import { useLocalSearchParams } from 'expo-router';
import { Platform, StyleSheet, View } from 'react-native';
import { parseModel, type ModelInput, type ModelIssue } from '../../shared/schemas/model';
import type { StudyDto } from '../../shared/schemas/studies';
import type { ModelWarning } from '../../shared/schemas/modelWarnings';
import { plausibilityWarnings } from '../../shared/modelPlausibility';
import { downloadFile } from '../../hooks/download';
import { serverErrors } from '../../hooks/forms';
import { useDeviceTypes } from '../../hooks/queries';
import { clearModelDraft, setModelDraft, useModelDraft } from '../../hooks/modelDrafts';
import { useCan } from '../../hooks/permissions';
import { useImportModel, useSaveModel, useStudyModel } from '../../hooks/studies';
import { ModelEditor } from '../model/ModelEditor';
import { SystemTree } from '../model/SystemTree';
import { colors, space } from '../theme';
import { Button, Card, Choice, Notice, T } from '../ui';
import { apiPath } from '../../hooks/api';
import { contract, type QueryInputOf } from '../../shared/api';

const TABLES = ['buses', 'sources', 'transformers', 'cables', 'motors', 'ties', 'devices', 'scenarios'] as const;

type ExportQuery = QueryInputOf<typeof contract.studies.exportModel>;

function ImportExport({ study, editable, onImported }: { study: StudyDto; editable: boolean; onImported: () => void }) {
  const imp = useImportModel(study.id);
  const [table, setTable] = useState<(typeof TABLES)[number]>('buses');
  const [message, setMessage] = useState<{ tone: 'ok' | 'error'; text: string; lines?: string[] } | null>(null);
  const download = (query: ExportQuery, name: string) =>
    downloadFile(apiPath(contract.studies.exportModel, { params: { studyId: study.id }, query }), name).catch((e) =>
      setMessage({ tone: 'error', text: serverErrors(e).message }),
    );
  const onFiles = (files: File[]) => {
    setMessage(null);
    imp.mutate(files, {
      onSuccess: (env) => {
        setMessage({
          tone: 'ok',
          text: `Imported ${files.map((f) => f.name).join(', ')}: model version ${env.version}.`,
        });
        onImported();
      },
      onError: (e) => {
        const s = serverErrors(e);
        setMessage({ tone: 'error', text: s.message, lines: Object.entries(s.fields).map(([k, v]) => `${k}: ${v}`) });
      },
    });
  };
  return (
    <Card testID="import-export">
      <T variant="subheading">Import and export</T>
      {message ? (
        <Notice tone={message.tone} testID="import-message">
          <View style={styles.importMessage}>
            <T style={message.tone === 'ok' ? styles.okText : styles.errorText}>{message.text}</T>
            {message.lines?.slice(0, 12).map((l) => (
              <T key={l} variant="small" style={styles.errorText}>
                • {l}
              </T>
            ))}
          </View>
        </Notice>
      ) : null}
      {editable && Platform.OS === 'web' ? (
        <View style={styles.importField}>
          <T variant="label">IMPORT (REPLACES THE MODEL; NOTHING CHANGES UNLESS THE WHOLE FILE IS VALID)</T>
          {React.createElement('input', {
            type: 'file',
            multiple: true,
            accept: '.xlsx,.csv,.json',
            'data-testid': 'model-file-input',
            'aria-label': 'Model files to import (workbook, CSV or JSON)',
            onChange: (e: { target: { files?: FileList | null; value: string } }) => {
              const files = Array.from(e.target.files ?? []);
              e.target.value = '';
              if (files.length) onFiles(files);
            },
            style: { fontSize: 15, padding: 8 },
          })}
          <T variant="small">
            A workbook (one sheet per element type), CSV files (one per element type, e.g. buses.csv), or a JSON model.
          </T>
        </View>
      ) : null}
      <T variant="label">EXPORT</T>
      <View style={styles.buttonRow}>
        <Button
          title="Workbook (.xlsx)"
          kind="secondary"
          testID="export-xlsx"
          onPress={() => void download({ format: 'xlsx' }, 'model.xlsx')}
        />
        <Button
          title="JSON"
          kind="secondary"
          testID="export-json"
          onPress={() => void download({ format: 'json' }, 'model.json')}
        />
      </View>
      <View style={styles.csvRow}>
        <Choice value={table} options={TABLES.map((t) => ({ value: t, label: t }))} onChange={setTable} />
        <Button
          title="CSV of this table"
          kind="secondary"
          onPress={() => void download({ format: 'csv', element: table }, `${table}.csv`)}
        />
      </View>
    </Card>
  );
}

/** The model of a revision: editor (drafts, engineers), system tree, import and export, save with a version check. */
export function ModelPanel({ study }: { study: StudyDto }) {
  const can = useCan();
  const editable = can('editModel') && study.status === 'draft';
  const envelope = useStudyModel(study.id);
  const deviceTypes = useDeviceTypes();
  const save = useSaveModel(study.id);
  const [conflict, setConflict] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const [focus, setFocus] = useState<{ collection: string; index: number } | null>(null);
  const [showTree, setShowTree] = useState(true);
  // `?device=ID` (a device tapped on the one-line): its settings and band open, in the devices section.
  const { device: deviceParam } = useLocalSearchParams<{ device?: string }>();
  const [openDevice, setOpenDevice] = useState<{ id: string } | null>(null);

  // Unsaved edits live in the draft store (kept across the study's tabs); without them the editor shows the server's
  // copy, so a clean editor follows the server and unsaved edits are never overwritten silently.
  const stored = useModelDraft(study.id);
  const dirty = stored?.dirty ?? false;
  const draft: ModelInput | null = stored?.draft ?? envelope.data?.model ?? null;
  const baseVersion = stored?.baseVersion ?? envelope.data?.version ?? 0;

  // Once per device asked for, when the model is there (edits to the draft do not reopen it).
  const [seenDevice, setSeenDevice] = useState<string | undefined>(undefined);
  if (draft && deviceParam && deviceParam !== seenDevice) {
    setSeenDevice(deviceParam);
    setOpenDevice({ id: deviceParam });
  }

  const deferred = useDeferredValue(draft);
  // Plausibility warnings (never blocking) as the server gives them: on a model that parses, computed as it is typed.
  const { issues, warnings } = useMemo((): { issues: ModelIssue[]; warnings: ModelWarning[] } => {
    if (!deferred) return { issues: [], warnings: [] };
    const r = parseModel(deferred);
    return r.success ? { issues: [], warnings: plausibilityWarnings(r.model) } : { issues: r.issues, warnings: [] };
  }, [deferred]);

  if (envelope.error) return <Notice tone="error">{envelope.error.message}</Notice>;
  if (!draft) return <T variant="small">Loading the model…</T>;

  const onSave = () => {
    setConflict(null);
    setSaved(null);
    save.mutate(
      { model: draft, version: baseVersion },
      {
        onSuccess: (env) => {
          // useSaveModel has put the saved model in the cache and dropped the draft.
          setSaved(
            `Saved as model version ${env.version}${env.issues.length ? ` — ${env.issues.length} problem(s) to fix before a run` : ''}.`,
          );
        },
        onError: (e) => setConflict(serverErrors(e).message),
      },
    );
  };

  const reload = () => {
    clearModelDraft(study.id);
    setConflict(null);
    void envelope.refetch();
  };

  return (
    <View style={styles.panel}>
      {!editable ? (
        <Notice>
          {study.status === 'draft'
            ? 'Only engineers edit the model.'
            : `Revision ${study.revision} is ${study.status}: its model is read-only. Start a new revision to change it.`}
        </Notice>
      ) : null}
      {editable ? (
        <Card style={styles.saveBar}>
          <T testID="model-state" style={dirty ? styles.stateDirty : styles.stateSaved}>
            {dirty ? 'Unsaved changes' : `Saved · model version ${baseVersion}`}
            {issues.length ? ` · ${issues.length} problem${issues.length === 1 ? '' : 's'}` : ' · no problems'}
            {warnings.length ? ` · ${warnings.length} worth checking` : ''}
          </T>
          <Button title="Save model" testID="save-model" disabled={!dirty} busy={save.isPending} onPress={onSave} />
        </Card>
      ) : null}
      {saved ? <Notice tone="ok">{saved}</Notice> : null}
      {conflict ? (
        <Notice tone="error" title="Not saved">
          <View style={styles.conflict}>
            <T style={styles.errorText}>{conflict}</T>
            <View style={styles.buttonRow}>
              <Button title="Reload the saved model (drops my changes)" kind="secondary" onPress={reload} />
            </View>
          </View>
        </Notice>
      ) : null}
      <ImportExport study={study} editable={editable} onImported={reload} />
      <Card>
        <View style={styles.treeHead}>
          <T variant="subheading">System tree</T>
          <Button title={showTree ? 'Hide' : 'Show'} kind="quiet" onPress={() => setShowTree((s) => !s)} />
        </View>
        {showTree ? <SystemTree model={draft} onSelect={(ref) => setFocus({ ...ref })} /> : null}
      </Card>
      <ModelEditor
        model={draft}
        onChange={(m) => {
          setModelDraft(study.id, { draft: m, baseVersion, dirty: true });
          setSaved(null);
        }}
        issues={issues}
        warnings={warnings}
        studyId={study.id}
        editable={editable}
        deviceTypes={deviceTypes.data ?? []}
        focus={focus}
        openDeviceRequest={openDevice}
      />
    </View>
  );
}

const styles = StyleSheet.create({
  importMessage: { gap: 2 },
  okText: { color: colors.ok },
  errorText: { color: colors.danger },
  stateDirty: { color: colors.caution },
  stateSaved: { color: colors.muted },
  importField: { gap: space.xs },
  buttonRow: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  csvRow: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap', alignItems: 'flex-end' },
  panel: { gap: space.lg },
  /** Card's own padding is an inline style, which a sheet's paddingVertical alone would not override: restated here. */
  saveBar: {
    padding: space.lg,
    flexDirection: 'row',
    alignItems: 'center',
    justifyContent: 'space-between',
    flexWrap: 'wrap',
    gap: space.sm,
    paddingVertical: space.md,
  },
  conflict: { gap: space.sm },
  treeHead: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'center' },
});
