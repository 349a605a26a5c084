import { Link, useLocalSearchParams } from 'expo-router';
import React, { useMemo, useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { LABEL_STATUS_LABELS, type LabelDto, type LabelSize } from '../../shared/schemas/labels';
import { downloadFile } from '../../hooks/download';
import { serverErrors } from '../../hooks/forms';
import { useBatch, useCreateBatch, useSiteLabels } from '../../hooks/labels';
import { useSites } from '../../hooks/queries';
import { useCan } from '../../hooks/permissions';
import { useLayout } from '../../hooks/useLayout';
import { LabelView } from '../labels/LabelView';
import { displayText } from '../../shared/labelDisplay';
import { signalPanelColors } from '../../shared/safetyColors';
import { colors, fonts, radius, space, touch } from '../theme';
import { Button, Card, Choice, Notice, ProgressBar, Screen, T } from '../ui';
import { apiPath } from '../../hooks/api';
import { contract } from '../../shared/api';

type Filter = 'all' | 'not-printed' | 'not-installed';

function Row({
  l,
  selected,
  onToggle,
  onPreview,
}: {
  l: LabelDto;
  selected: boolean;
  onToggle: () => void;
  onPreview: () => void;
}) {
  const panel = signalPanelColors(l.content.signalWord);
  return (
    <View style={styles.row} testID={`label-row-${l.equipmentTag}`}>
      <Pressable
        accessibilityRole="checkbox"
        aria-checked={selected}
        accessibilityLabel={`Select ${l.equipmentTag}`}
        onPress={onToggle}
        testID={`select-${l.equipmentTag}`}
        style={styles.checkboxTarget}
      >
        <View style={[styles.checkbox, selected && styles.checkboxOn]}>
          {selected ? <T style={styles.checkMark}>✓</T> : null}
        </View>
      </Pressable>
      <Pressable onPress={onPreview} style={styles.rowSummary} accessibilityRole="button">
        <View style={styles.rowHead}>
          <T style={styles.tag}>{l.equipmentTag}</T>
          <View style={[styles.signalWord, { backgroundColor: panel.background }]}>
            <T style={[styles.signalWordText, { color: panel.text }]}>{l.content.signalWord}</T>
          </View>
          <T style={styles.energy}>{displayText(l.display.incidentEnergy)}</T>
        </View>
        <T variant="small" numberOfLines={1}>
          {l.content.equipmentName} · {LABEL_STATUS_LABELS[l.status]} ·{' '}
          {l.printedAt ? `printed ${l.printedAt.slice(0, 10)}` : 'not printed'} ·{' '}
          {l.installedAt ? `installed ${l.installedAt.slice(0, 10)}` : 'not installed'}
        </T>
      </Pressable>
      <Link href={`/labels/${l.code}`} style={styles.openLink}>
        Open
      </Link>
    </View>
  );
}

/** Labels of a site: preview, choose, and print them as one PDF (with progress for large batches). */
export function LabelsScreen() {
  const can = useCan();
  const { wide } = useLayout();
  const sites = useSites();
  // `/labels?site=<id>` opens one site's labels (links from the dashboard and the site screen).
  const params = useLocalSearchParams<{ site?: string }>();
  const [chosenSiteId, setSiteId] = useState<string | null>(
    typeof params.site === 'string' && params.site ? params.site : null,
  );
  // Until one is chosen, the first site is shown.
  const siteId = chosenSiteId ?? sites.data?.[0]?.id ?? null;
  const labels = useSiteLabels(siteId);
  const [filter, setFilter] = useState<Filter>('all');
  const [selected, setSelected] = useState<Set<string>>(new Set());
  const [chosenPreview, setPreview] = useState<LabelDto | null>(null);
  const [size, setSize] = useState<LabelSize>('4x6');
  const create = useCreateBatch();
  const [batchId, setBatchId] = useState<string | null>(null);
  const batch = useBatch(batchId);
  const [error, setError] = useState<string | null>(null);
  const canPrint = can('printLabels');

  const shown = useMemo(
    () =>
      (labels.data ?? []).filter((l) =>
        filter === 'not-printed' ? !l.printedAt : filter === 'not-installed' ? !l.installedAt : true,
      ),
    [labels.data, filter],
  );
  // Until one is chosen, the first label shown is previewed.
  const preview = chosenPreview ?? shown[0] ?? null;

  const toggle = (id: string) =>
    setSelected((s) => {
      const n = new Set(s);
      if (n.has(id)) n.delete(id);
      else n.add(id);
      return n;
    });

  const print = () => {
    setError(null);
    create.mutate(
      { labelIds: [...selected], size },
      { onSuccess: (b) => setBatchId(b.id), onError: (e) => setError(serverErrors(e).message) },
    );
  };

  const b = batch.data;
  const list = (
    <View style={styles.list}>
      <Choice
        value={filter}
        onChange={setFilter}
        testID="label-filter"
        options={[
          { value: 'all', label: 'All current' },
          { value: 'not-printed', label: 'Not printed' },
          { value: 'not-installed', label: 'Not installed' },
        ]}
      />
      <View style={styles.buttonRow}>
        <Button
          title="Select all shown"
          kind="secondary"
          testID="select-all"
          onPress={() => setSelected(new Set(shown.map((l) => l.id)))}
        />
        <Button title="Clear" kind="quiet" onPress={() => setSelected(new Set())} />
      </View>
      <View style={styles.table}>
        {shown.map((l) => (
          <Row
            key={l.id}
            l={l}
            selected={selected.has(l.id)}
            onToggle={() => toggle(l.id)}
            onPreview={() => setPreview(l)}
          />
        ))}
        {labels.data && shown.length === 0 ? (
          <T style={styles.empty} variant="small">
            No labels here.
          </T>
        ) : null}
      </View>
    </View>
  );

  const queue = canPrint ? (
    <Card testID="print-queue">
      <T variant="subheading">Print</T>
      <T variant="small">
        {selected.size} label{selected.size === 1 ? '' : 's'} chosen.
      </T>
      <Choice
        label="Size"
        value={size}
        onChange={setSize}
        testID="label-size"
        options={[
          { value: '4x6', label: '4 × 6 in' },
          { value: '4x4', label: '4 × 4 in' },
          { value: 'letter', label: 'Letter sheet' },
          { value: 'a4', label: 'A4 sheet' },
        ]}
      />
      {error ? <Notice tone="error">{error}</Notice> : null}
      <Button
        title="Make the PDF"
        testID="make-pdf"
        disabled={!selected.size}
        busy={create.isPending || (!!b && (b.status === 'queued' || b.status === 'running'))}
        onPress={print}
      />
      {b ? (
        <View style={styles.batch} testID="batch">
          <T>{b.message}</T>
          {b.status !== 'done' ? <ProgressBar value={b.progress} testID="batch-progress" /> : null}
          {b.status === 'done' ? (
            <Button
              title={`Download ${b.total} label${b.total === 1 ? '' : 's'} (PDF)`}
              testID="download-pdf"
              kind="secondary"
              onPress={() =>
                void downloadFile(apiPath(contract.labelBatches.file, { params: { batchId: b.id } }), 'labels.pdf')
                  // Downloading the batch is what marks its labels printed: show it.
                  .then(() => labels.refetch())
                  .catch((e) => setError(serverErrors(e).message))
              }
            />
          ) : null}
          {b.status === 'failed' ? <Notice tone="error">{b.message}</Notice> : null}
        </View>
      ) : null}
    </Card>
  ) : null;

  return (
    <Screen
      title="Labels"
      subtitle="Current labels of the approved studies: preview, print, and follow their installation."
    >
      <Choice
        label="Site"
        value={siteId ?? ''}
        onChange={(id) => {
          setSiteId(id);
          setSelected(new Set());
          setPreview(null);
        }}
        options={(sites.data ?? []).map((s) => ({ value: s.id, label: s.name }))}
        testID="label-site"
      />
      {labels.error ? <Notice tone="error">{labels.error.message}</Notice> : null}
      {wide ? (
        <View style={styles.split}>
          <View style={styles.listColumn}>
            {queue}
            {list}
          </View>
          <View style={styles.previewColumn}>
            <T variant="label">PREVIEW</T>
            {preview ? (
              <LabelView content={preview.content} code={preview.code} width={400} />
            ) : (
              <T variant="small">Choose a label to preview it.</T>
            )}
          </View>
        </View>
      ) : (
        <>
          {queue}
          {list}
          {preview ? (
            <View style={styles.preview}>
              <T variant="label">PREVIEW · {preview.equipmentTag}</T>
              <LabelView content={preview.content} code={preview.code} />
            </View>
          ) : null}
        </>
      )}
    </Screen>
  );
}

const styles = StyleSheet.create({
  row: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.sm,
    minHeight: touch.min + 8,
    paddingHorizontal: space.md,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  checkboxTarget: { width: touch.min, height: touch.min, alignItems: 'center', justifyContent: 'center' },
  checkbox: {
    width: 24,
    height: 24,
    borderRadius: 4,
    borderWidth: 2,
    borderColor: colors.ink,
    backgroundColor: colors.surface,
    alignItems: 'center',
    justifyContent: 'center',
  },
  checkboxOn: { backgroundColor: colors.ink },
  checkMark: { color: '#fff', fontFamily: fonts.textBold },
  rowSummary: { flex: 1, gap: 2, paddingVertical: 6 },
  rowHead: { flexDirection: 'row', gap: space.sm, alignItems: 'center', flexWrap: 'wrap' },
  tag: { fontFamily: fonts.numbersBold },
  signalWord: { paddingHorizontal: 5, borderRadius: 3 },
  signalWordText: { fontSize: 11, fontFamily: fonts.textBold },
  energy: { fontFamily: fonts.numbers, fontSize: 14 },
  openLink: { color: colors.accent, fontSize: 15, padding: space.sm },
  list: { gap: space.md },
  buttonRow: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  table: {
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.lineSoft,
  },
  empty: { padding: space.lg },
  batch: { gap: space.xs },
  split: { flexDirection: 'row', gap: space.xl, alignItems: 'flex-start' },
  listColumn: { flex: 1.2, gap: space.lg },
  previewColumn: { flex: 1, gap: space.sm },
  preview: { gap: space.sm },
});
