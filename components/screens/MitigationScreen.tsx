import { Link, useRouter } from 'expo-router';
import React, { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { ApiClientError } from '../../hooks/api';
import { applyServerErrors, serverErrors, useZodForm } from '../../hooks/forms';
import { useApplyMitigation, useMitigationOptions } from '../../hooks/mitigation';
import { useBusResult } from '../../hooks/results';
import { useStudies, useStudy, useStudyModel } from '../../hooks/studies';
import { useLayout } from '../../hooks/useLayout';
import { fmt, fmtLength, lengthUnitOf, parseNumberText } from '../../hooks/units';
import { useUnitSystem } from '../../hooks/unitSystem';
import { formatCalPerCm2, hazardCaution } from '../../shared/labelDisplay';
import { signalPanelColors } from '../../shared/safetyColors';
import {
  mitigateRequestSchema,
  type MitigationHazard,
  type MitigationOption,
  type MitigationResponse,
  type Selectivity,
} from '../../shared/schemas/mitigation';
import type { StudyDto } from '../../shared/schemas/studies';
import { REGION_LABELS } from '../../shared/tripRegions';
import { Cautions, HazardMark } from '../Cautions';
import { FormNumberField } from '../form';
import { OptionPlot } from '../mitigation/OptionPlot';
import { colors, fonts, radius, space } from '../theme';
import { Button, Card, Loading, Notice, Num, Pill, type PillTone, Screen, T, ValueRow } from '../ui';

/** The target offered first, cal/cm² (a common arc rating of everyday PPE; common practice, no source). */
export const DEFAULT_TARGET_CAL_PER_CM2 = 8;

const KIND_LABELS: Record<MitigationOption['kind'], string> = {
  'instantaneous-setting': 'Instantaneous setting',
  'short-time-delay': 'Short-time delay',
  'maintenance-mode': 'Maintenance switch',
  'arc-flash-relay': 'Arc-flash relay',
  'current-limiting-fuse': 'Current-limiting fuse',
  'line-side-isolation': 'Isolated main',
};

const VERDICTS: Record<Selectivity['verdict'], { label: string; tone: PillTone }> = {
  kept: { label: 'Selectivity kept', tone: 'ok' },
  lost: { label: 'Selectivity lost', tone: 'danger' },
  'already-lost': { label: 'Overlapped before too', tone: 'caution' },
  'while-on': { label: 'Selectivity given up while on', tone: 'caution' },
  'not-affected': { label: 'Selectivity not affected', tone: 'ok' },
  'no-downstream': { label: 'No downstream device', tone: 'neutral' },
};

const CURRENT_WORDS = {
  bolted: 'bolted fault',
  'arcing-full': 'full arcing',
  'arcing-reduced': 'reduced arcing',
} as const;

const energyText = (calPerCm2: number) => `${formatCalPerCm2(calPerCm2)} cal/cm²`;
const seconds = (s: number | null) => (s === null ? '—' : `${fmt(s)} s`);
const marginText = (s: number | null) =>
  s === null ? 'no margin to compare' : `${s >= 0 ? '+' : '−'}${fmt(Math.abs(s))} s`;
const ppeText = (h: MitigationHazard) => h.ppeLevel ?? 'none adequate';

/** "CB-MAIN (Main breaker), instantaneous region" or "no device clears before the cap". */
function clearingText(h: MitigationHazard): string {
  if (!h.clearingDeviceId) return 'no device clears: arc duration limited by the cap';
  const name = h.clearingDeviceName && h.clearingDeviceName !== h.clearingDeviceId ? ` (${h.clearingDeviceName})` : '';
  return `${h.clearingDeviceId}${name}${h.clearingRegion ? `, ${REGION_LABELS[h.clearingRegion]}` : ''}`;
}

function caseText(h: MitigationHazard): string {
  return `${h.governing.arcCase === 'full' ? 'full' : 'reduced'} arcing current${h.governing.location === 'line-side' ? ', line side of the main' : ''}${h.scenarioId ? ` · scenario ${h.scenarioId}` : ''}`;
}

/** The signal word as a label shows it: the word itself on its safety colour, with the line under it. */
function SignalWord({ h, testID }: { h: MitigationHazard; testID?: string }) {
  return (
    <View style={styles.signalRow}>
      <View style={[styles.signalPanel, h.signalWord === 'DANGER' ? styles.danger : styles.warning]} testID={testID}>
        <HazardMark size={16} />
        <T style={[styles.signalWord, h.signalWord === 'DANGER' ? styles.dangerText : styles.warningText]}>
          {h.signalWord}
        </T>
      </View>
      <T variant="small" style={styles.shrink}>
        {hazardCaution({
          incidentEnergyCalPerCm2: h.incidentEnergyCalPerCm2,
          noAdequatePpe: h.ppeLevel === null,
          ppeLevel: h.ppeLevel,
        })}
      </T>
    </View>
  );
}

/** The hazard at the bus as it is now. */
function PresentHazard({ r }: { r: MitigationResponse }) {
  const { system } = useUnitSystem();
  const h = r.before;
  return (
    <Card testID="mitigation-before">
      <T variant="subheading">Now</T>
      <SignalWord h={h} testID="before-signal-word" />
      <View style={styles.energyRow}>
        <Num value={formatCalPerCm2(h.incidentEnergyCalPerCm2)} unit="cal/cm²" size={30} bold testID="before-energy" />
        <T variant="small">target {energyText(r.targetCalPerCm2)}</T>
      </View>
      <ValueRow label="PPE level">
        <T style={styles.strong}>{ppeText(h)}</T>
      </ValueRow>
      <ValueRow label="Arc-flash boundary">
        <Num value={fmtLength(h.arcFlashBoundaryMm, lengthUnitOf(system))} size={14} />
      </ValueRow>
      <ValueRow label="Arc duration">
        <Num value={`${fmt(h.arcDurationS)} s${h.arcDurationCapped ? ' (capped)' : ''}`} size={14} />
      </ValueRow>
      <ValueRow label="Cleared by">
        <T style={styles.valueText} testID="before-clearing">
          {clearingText(h)}
        </T>
      </ValueRow>
      <T variant="small">Governing: {caseText(h)}.</T>
    </Card>
  );
}

function SelectivityBlock({ s, testID }: { s: Selectivity; testID: string }) {
  const v = VERDICTS[s.verdict];
  return (
    <View style={styles.section} testID={testID}>
      <View style={styles.headRow}>
        <T variant="label">SELECTIVITY</T>
        <Pill label={v.label} tone={v.tone} testID={`${testID}-verdict`} />
      </View>
      <T testID={`${testID}-sentence`}>{s.sentence}</T>
      {s.checks.map((c) => (
        <View key={`${c.downstreamDeviceId}:${c.faultBusId}`} style={styles.check}>
          <T style={styles.strong}>
            {c.upstreamDeviceId} over {c.downstreamDeviceId} ({c.downstreamDeviceName}), fault at {c.faultBusId}:{' '}
            {c.selective ? 'selective' : 'bands overlap'}, margin {marginText(c.marginS)} (before:{' '}
            {c.selectiveBefore ? 'selective' : 'overlapping'}, {marginText(c.marginBeforeS)})
          </T>
          {c.points.map((p) => (
            <T key={p.current} variant="small" style={styles.mono}>
              {CURRENT_WORDS[p.current]}: {c.upstreamDeviceId} minimum {seconds(p.upstreamMinimumS)} at{' '}
              {fmt(p.upstreamA / 1000)} kA · {c.downstreamDeviceId} clears {seconds(p.downstreamClearingS)} at{' '}
              {fmt(p.downstreamA / 1000)} kA · margin {marginText(p.marginS)}
              {p.selective ? '' : ' · overlap'}
            </T>
          ))}
        </View>
      ))}
    </View>
  );
}

function OptionCard({
  option,
  rank,
  r,
  busKv,
  arcingKa,
  model,
  study,
}: {
  option: MitigationOption;
  rank: number;
  r: MitigationResponse;
  busKv: number;
  arcingKa: { full?: number; reduced?: number };
  model: Parameters<typeof OptionPlot>[0]['model'];
  study: StudyDto;
}) {
  const router = useRouter();
  const apply = useApplyMitigation(study.id);
  const revisions = useStudies(study.siteId);
  const before = r.before;
  const after = option.result;
  const id = `option-${option.kind}`;
  const conflict = apply.error instanceof ApiClientError && apply.error.status === 409;
  const open = (revisions.data ?? []).find((s) => s.status === 'draft' || s.status === 'in-review');
  const onApply = () =>
    apply.mutate(
      { busId: r.busId, targetCalPerCm2: r.targetCalPerCm2, optionId: option.id },
      { onSuccess: (res) => router.push(`/studies/${res.study.id}`) },
    );
  const gap = after.incidentEnergyCalPerCm2 - r.targetCalPerCm2;
  return (
    <Card testID={id}>
      <View style={styles.headRow}>
        <T variant="label">
          OPTION {rank}
          {rank === 1 ? ' · BEST' : ''} · {KIND_LABELS[option.kind].toUpperCase()}
        </T>
        <Pill
          label={option.reachesTarget ? 'Reaches the target' : `Comes within ${energyText(Math.max(0, gap))}`}
          tone={option.reachesTarget ? 'ok' : 'caution'}
          testID={`${id}-reaches`}
        />
      </View>
      <T variant="subheading" testID={`${id}-title`}>
        {option.title}
      </T>
      <View style={styles.energyRow}>
        <Num value={formatCalPerCm2(before.incidentEnergyCalPerCm2)} size={18} />
        <T style={styles.arrow}>→</T>
        <Num
          value={formatCalPerCm2(after.incidentEnergyCalPerCm2)}
          unit="cal/cm²"
          size={26}
          bold
          testID={`${id}-after`}
        />
      </View>
      {!option.reachesTarget ? (
        <T variant="small" testID={`${id}-gap`}>
          Does not reach {energyText(r.targetCalPerCm2)}: comes within {energyText(Math.max(0, gap))} of it.
        </T>
      ) : null}
      <SignalWord h={after} testID={`${id}-signal-word`} />
      <ValueRow label="PPE level">
        <T style={styles.valueText}>
          {ppeText(before)} → <T style={styles.strong}>{ppeText(after)}</T>
        </T>
      </ValueRow>
      <ValueRow label="Signal word">
        <T style={styles.valueText}>
          {before.signalWord} → <T style={styles.strong}>{after.signalWord}</T>
        </T>
      </ValueRow>
      <ValueRow label="Arc duration">
        <Num
          value={`${fmt(before.arcDurationS)} → ${fmt(after.arcDurationS)} s${after.arcDurationCapped ? ' (capped)' : ''}`}
          size={14}
        />
      </ValueRow>
      <ValueRow label="Cleared by">
        <T style={styles.valueText}>{clearingText(after)}</T>
      </ValueRow>
      {option.changes.length ? (
        <View style={styles.section}>
          <T variant="label">WHAT CHANGES</T>
          {option.changes.map((c) => (
            <T key={c.setting} variant="small" style={styles.ink}>
              {c.setting}: {c.before} → {c.after}
            </T>
          ))}
        </View>
      ) : null}
      <View style={styles.section} testID={`${id}-other-buses`}>
        <T variant="label">OTHER BUSES</T>
        {option.otherBuses.length ? (
          option.otherBuses.map((b) => (
            <T key={b.busId} variant="small" style={styles.ink}>
              {b.busId} ({b.busName}): {b.beforeCalPerCm2 === null ? '—' : energyText(b.beforeCalPerCm2)} →{' '}
              {b.afterCalPerCm2 === null ? '—' : energyText(b.afterCalPerCm2)}
            </T>
          ))
        ) : (
          <T variant="small">No other bus changes.</T>
        )}
      </View>
      <SelectivityBlock s={option.selectivity} testID={`${id}-selectivity`} />
      {option.notes.length ? (
        <View style={styles.section} testID={`${id}-notes`}>
          <T variant="label">NOTES</T>
          {option.notes.map((n) => (
            <T key={n} variant="small" style={styles.ink}>
              • {n}
            </T>
          ))}
        </View>
      ) : null}
      <OptionPlot model={model} option={option} busKv={busKv} arcingKa={arcingKa} testID={`${id}-plot`} />
      {apply.error ? (
        <Notice tone="error" title={conflict ? 'Another revision is open' : undefined} testID={`${id}-apply-error`}>
          <T style={styles.errorText}>{serverErrors(apply.error).message}</T>
          {conflict && open ? (
            <Link href={`/studies/${open.id}`} style={styles.link} testID={`${id}-open-revision`}>
              Go to revision {open.revision} ({open.status})
            </Link>
          ) : null}
        </Notice>
      ) : null}
      <Button
        title="Apply to a new revision"
        kind={rank === 1 ? 'primary' : 'secondary'}
        busy={apply.isPending}
        onPress={onApply}
        testID={`${id}-apply`}
        accessibilityLabel={`Apply to a new revision: option ${rank}, ${option.title}`}
      />
    </Card>
  );
}

/** The mitigation view of one bus: a target, the options that bring the bus's energy to or under it, and applying one. */
export function MitigationScreen({ studyId, busId }: { studyId: string; busId: string }) {
  const { wide } = useLayout();
  const study = useStudy(studyId);
  const busResult = useBusResult(studyId, busId);
  const model = useStudyModel(studyId);
  const find = useMitigationOptions(studyId);
  const [message, setMessage] = useState<string | null>(null);
  const form = useZodForm<typeof mitigateRequestSchema, { targetCalPerCm2: string }>(mitigateRequestSchema, {
    defaultValues: { targetCalPerCm2: String(DEFAULT_TARGET_CAL_PER_CM2) },
    toInput: (v) => ({ busId, targetCalPerCm2: parseNumberText(v.targetCalPerCm2) }),
  });
  const submit = () => {
    setMessage(null);
    void form.handleSubmit((data) => find.mutate(data, { onError: (e) => setMessage(applyServerErrors(form, e)) }))();
  };

  const bus = busResult.data?.bus;
  const title = bus ? `${bus.busId} · ${bus.busName}` : busId;
  const r = find.data;
  const location = r?.before.governing.location ?? 'load-side';
  const arcingKa = {
    full: bus?.cases.find((c) => c.arcCase === 'full' && c.location === location)?.arcingCurrentKa,
    reduced: bus?.cases.find((c) => c.arcCase === 'reduced' && c.location === location)?.arcingCurrentKa,
  };

  const head = (
    <>
      <Link href={`/studies/${studyId}/bus/${encodeURIComponent(busId)}`} style={styles.link} testID="back-to-trace">
        ← Clearing trace
      </Link>
      <Notice tone="warning" title="Model results for an engineer's review" testID="mitigation-caution">
        <View style={styles.section}>
          {(
            r?.cautions ?? [
              'Each option is a model result: it must be reviewed, coordinated and sealed by a qualified (licensed) engineer before any setting or device is changed.',
            ]
          ).map((c) => (
            <T key={c} style={styles.cautionText}>
              {c}
            </T>
          ))}
        </View>
      </Notice>
      <Card testID="mitigation-form">
        <T variant="subheading">Target</T>
        <T variant="small">
          Each candidate setting or device is run through the study engine at every operating scenario; the options are
          listed best first.
        </T>
        {message ? <Notice tone="error">{message}</Notice> : null}
        <View style={wide ? styles.formRowWide : styles.formRow}>
          <FormNumberField
            control={form.control}
            name="targetCalPerCm2"
            label="Target incident energy"
            unit="cal/cm²"
            testID="mitigation-target"
            containerStyle={wide ? styles.targetField : undefined}
            onSubmitEditing={submit}
          />
          <Button title="Find options" busy={find.isPending} onPress={submit} testID="mitigation-find" />
        </View>
        {find.isPending ? (
          <Loading
            what="Computing the options: each candidate is run through the study engine…"
            testID="mitigation-progress"
          />
        ) : null}
      </Card>
    </>
  );

  const options = r ? (
    <View style={styles.options} testID="mitigation-options">
      {r.options.length === 0 ? (
        <Notice tone="info" title="No option found">
          No change the search knows brings this bus down; see the reasons below.
        </Notice>
      ) : null}
      {r.options.map((o, i) => (
        <OptionCard
          key={o.id}
          option={o}
          rank={i + 1}
          r={r}
          busKv={bus?.nominalKv ?? 1}
          arcingKa={arcingKa}
          model={model.data?.model}
          study={study.data!}
        />
      ))}
    </View>
  ) : null;

  const skipped =
    r && r.skipped.length ? (
      <Card testID="mitigation-skipped">
        <T variant="subheading">Not proposed</T>
        {r.skipped.map((s) => (
          <T key={s.kind} variant="small" style={styles.ink}>
            <T style={styles.strongSmall}>{KIND_LABELS[s.kind]}:</T> {s.reason}
          </T>
        ))}
      </Card>
    ) : null;

  if (study.isLoading || busResult.isLoading)
    return (
      <Screen title={title} subtitle="Bring this down" documentTitle={`Bring this down · ${busId}`}>
        <Loading what="Loading the bus…" />
      </Screen>
    );

  return (
    <Screen
      title={title}
      subtitle={`Bring this down${study.data ? ` · revision ${study.data.revision} (${study.data.status})` : ''}${bus ? ` · ${fmt(bus.nominalKv)} kV` : ''}`}
      documentTitle={`Bring this down · ${busId}`}
    >
      {study.error || !study.data ? (
        <Notice tone="error">{study.error ? serverErrors(study.error).message : 'No such study.'}</Notice>
      ) : wide && r ? (
        <View style={styles.wideRow}>
          <View style={styles.wideSide}>
            {head}
            <PresentHazard r={r} />
            <Cautions incidentEnergyCalPerCm2={r.before.incidentEnergyCalPerCm2} />
          </View>
          <View style={styles.wideMain}>
            {options}
            {skipped}
          </View>
        </View>
      ) : (
        <>
          {head}
          {r ? <PresentHazard r={r} /> : null}
          {options}
          {skipped}
          <Cautions incidentEnergyCalPerCm2={r?.before.incidentEnergyCalPerCm2 ?? bus?.incidentEnergyCalPerCm2} />
        </>
      )}
    </Screen>
  );
}

const styles = StyleSheet.create({
  link: { color: colors.accent, fontSize: 16, fontFamily: fonts.textMedium },
  section: { gap: space.xs },
  options: { gap: space.lg },
  headRow: {
    flexDirection: 'row',
    justifyContent: 'space-between',
    alignItems: 'center',
    gap: space.sm,
    flexWrap: 'wrap',
  },
  energyRow: { flexDirection: 'row', alignItems: 'baseline', gap: space.sm, flexWrap: 'wrap' },
  arrow: { fontSize: 18, color: colors.inkSoft },
  strong: { fontFamily: fonts.textBold },
  strongSmall: { fontFamily: fonts.textBold, fontSize: 14, color: colors.ink },
  valueText: { fontSize: 14, textAlign: 'right', flexShrink: 1 },
  ink: { color: colors.ink },
  mono: { fontFamily: fonts.numbers, fontSize: 12, color: colors.inkSoft },
  shrink: { flexShrink: 1 },
  cautionText: { color: colors.caution, fontFamily: fonts.textBold },
  errorText: { color: colors.danger },
  check: {
    gap: 2,
    padding: space.sm,
    borderRadius: radius.sm,
    borderWidth: 1,
    borderColor: colors.lineSoft,
  },
  signalRow: { flexDirection: 'row', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' },
  signalPanel: {
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.xs,
    paddingHorizontal: space.sm,
    paddingVertical: space.xs,
    borderRadius: radius.sm,
    borderWidth: 1.5,
    borderColor: '#000',
  },
  signalWord: { fontFamily: fonts.textBold, fontSize: 15, letterSpacing: 1 },
  // ANSI Z535.4 colours on the signal word only, as the label prints it (shared/safetyColors.ts).
  danger: { backgroundColor: signalPanelColors('DANGER').background },
  dangerText: { color: signalPanelColors('DANGER').text },
  warning: { backgroundColor: signalPanelColors('WARNING').background },
  warningText: { color: signalPanelColors('WARNING').text },
  formRow: { gap: space.md },
  formRowWide: { flexDirection: 'row', alignItems: 'flex-end', gap: space.md },
  targetField: { flexGrow: 1, flexBasis: 200 },
  wideRow: { flexDirection: 'row', gap: space.xl, alignItems: 'flex-start' },
  wideMain: { flex: 1.4, gap: space.lg },
  wideSide: { flex: 1, gap: space.lg },
});
