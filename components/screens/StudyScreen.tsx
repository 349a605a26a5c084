import { useLocalSearchParams, useRouter } from 'expo-router';
import React from 'react';
import { StyleSheet, View } from 'react-native';
import { useConfirmLeavingStudy } from '../../hooks/modelDrafts';
import { useStudy } from '../../hooks/studies';
import { OneLinePanel } from '../oneLine/OneLinePanel';
import { ModelPanel } from '../studies/ModelPanel';
import { OverviewPanel } from '../studies/OverviewPanel';
import { ResultsPanel } from '../studies/ResultsPanel';
import { StatusBadges } from '../studies/StatusBadge';
import { space } from '../theme';
import { Choice, Notice, Screen, T } from '../ui';

type Tab = 'overview' | 'model' | 'one-line' | 'results';
const TABS: { value: Tab; label: string }[] = [
  { value: 'overview', label: 'Overview and review' },
  { value: 'model', label: 'Model' },
  { value: 'one-line', label: 'One-line' },
  { value: 'results', label: 'Results' },
];

/** The study workspace: overview (run, review, approval), the model, the results. */
export function StudyScreen({ studyId }: { studyId: string }) {
  const router = useRouter();
  const params = useLocalSearchParams<{ tab?: string }>();
  const tab: Tab = TABS.some((t) => t.value === params.tab) ? (params.tab as Tab) : 'overview';
  const study = useStudy(studyId);
  useConfirmLeavingStudy(studyId);
  if (study.error)
    return (
      <Screen title="Study">
        <Notice tone="error">{study.error.message}</Notice>
      </Screen>
    );
  if (!study.data)
    return (
      <Screen title="Study">
        <T variant="small">Loading…</T>
      </Screen>
    );
  const s = study.data;
  return (
    <Screen title={`${s.title} · rev ${s.revision}`} subtitle={s.siteName} maxWidth={1400}>
      <StatusBadges study={s} />
      <View style={styles.tabs}>
        <Choice value={tab} options={TABS} onChange={(t) => router.setParams({ tab: t })} testID="study-tab" />
      </View>
      {tab === 'overview' ? <OverviewPanel study={s} /> : null}
      {tab === 'model' ? <ModelPanel study={s} /> : null}
      {tab === 'one-line' ? <OneLinePanel study={s} /> : null}
      {tab === 'results' ? <ResultsPanel study={s} /> : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  tabs: { gap: space.sm },
});
