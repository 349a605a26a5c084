import { useQueries } from '@tanstack/react-query';
import { Link, useRouter } from 'expo-router';
import React, { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import type { ArcCaseTrace, BusResult } from '../../shared/schemas/studyResults';
import { REGION_LABELS } from '../../shared/tripRegions';
import { ONLY_AT_CAUTIONS } from '../../shared/cautions';
import {
  busArcDurationCapS,
  clearedByCaption,
  clearedByDisplay,
  clearedByText,
  formatBoundary,
  formatCalPerCm2,
  formatJPerCm2,
} from '../../shared/labelDisplay';
import { callApi } from '../../hooks/api';
import { contract } from '../../shared/api';
import { queryKeys } from '../../hooks/queryKeys';
import { useCan } from '../../hooks/permissions';
import { useBusResult } from '../../hooks/results';
import { useStudy } from '../../hooks/studies';
import { useLayout } from '../../hooks/useLayout';
import { fmt, fmtLength, lengthUnitOf } from '../../hooks/units';
import { useUnitSystem } from '../../hooks/unitSystem';
import { Cautions, HazardMark } from '../Cautions';
import { signalPanelColors } from '../../shared/safetyColors';
import { TimeCurrentPlot } from '../plot/TimeCurrentPlot';
import { colors, fonts, radius, space } from '../theme';
import { Button, Card, Choice, Notice, Num, Screen, T, ValueRow } from '../ui';
import { ArcRating } from '../labels/ArcRating';
import { ScenarioSwitch, scenarioBasisSentence } from '../results/ScenarioSwitch';

const caseKey = (c: Pick<ArcCaseTrace, 'arcCase' | 'location'>) => `${c.location}:${c.arcCase}`;
const caseTitle = (c: Pick<ArcCaseTrace, 'arcCase' | 'location'>) =>
  `${c.arcCase === 'full' ? 'Full' : 'Reduced'} arcing current${c.location === 'line-side' ? ', line side of the main' : ''}`;

/**
 * The bus's clearing in the label's words: "Cleared by" the device that ends the governing arc (with its name and
 * the governing case), or "Arc clearing: No device clears within 2 s — arc duration limited to 2 s".
 */
function clearingOf(b: BusResult, studyMaxArcDurationMs: number): { caption: string; text: string } {
  const governing = b.governing ? b.cases.find((c) => caseKey(c) === caseKey(b.governing!)) : undefined;
  const deviceName = (id: string) => {
    const name = governing?.devices.find((d) => d.deviceId === id)?.name;
    return name && name !== id ? `${id} (${name})` : id;
  };
  const clearingDevice = b.clearingDeviceId ? deviceName(b.clearingDeviceId) : null;
  // With several sources, the devices that cut off the other sources (as on the label).
  const others = new Set<string>();
  for (const src of governing?.sources ?? [])
    if (src.reason === 'device' && src.cutByDeviceId && src.cutByDeviceId !== governing?.clearingDeviceId)
      others.add(src.cutByDeviceId);
  const governingCase = b.governing ? caseTitle(b.governing).replace(/^./, (ch) => ch.toLowerCase()) : '';
  const display = clearedByDisplay({
    clearingDevice,
    governingCase,
    otherSourcesClearedBy: [...others].map(deviceName),
    arcDurationCapS: busArcDurationCapS(b, studyMaxArcDurationMs),
  });
  return { caption: clearedByCaption({ clearingDevice }), text: clearedByText(display) };
}

/** The label values of the governing case, as on the label (exported for tests/web). */
export function LabelPreview({ b, studyMaxArcDurationMs }: { b: BusResult; studyMaxArcDurationMs: number }) {
  const lv = b.labelValues!;
  const panel = signalPanelColors(lv.signalWord);
  const clearing = clearingOf(b, studyMaxArcDurationMs);
  return (
    <View style={styles.labelValues} testID="bus-label-values">
      <View style={[styles.signalPanel, { backgroundColor: panel.background }]}>
        <HazardMark size={24} />
        <T style={[styles.signalWord, { color: panel.text }]}>{lv.signalWord}</T>
      </View>
      <View style={styles.labelBody}>
        <T variant="label">INCIDENT ENERGY AT {fmtLength(lv.workingDistanceMm, 'in').toUpperCase()}</T>
        <View style={styles.energyFigures}>
          <Num
            value={formatCalPerCm2(lv.incidentEnergyCalPerCm2)}
            unit="cal/cm²"
            size={32}
            bold
            testID="trace-energy"
          />
          <Num value={formatJPerCm2(lv.incidentEnergyJPerCm2)} unit="J/cm²" size={16} />
        </View>
        <ValueRow label="Arc-flash boundary">
          <Num value={formatBoundary(lv.arcFlashBoundaryMm)} size={14} />
        </ValueRow>
        <ValueRow label="Minimum arc rating">
          <ArcRating calPerCm2={lv.incidentEnergyCalPerCm2} size={14} />
        </ValueRow>
        <ValueRow label="PPE level">
          <T style={styles.strong}>{lv.ppeLevel?.name ?? 'None adequate'}</T>
        </ValueRow>
        {lv.shockApproach ? (
          <>
            <ValueRow label="Limited approach (movable / fixed)">
              <T>
                {lv.shockApproach.limitedApproachMovable.text} / {lv.shockApproach.limitedApproachFixed.text}
              </T>
            </ValueRow>
            <ValueRow label="Restricted approach">
              <T>{lv.shockApproach.restrictedApproach.text}</T>
            </ValueRow>
          </>
        ) : null}
        <ValueRow label="Gloves">
          <T>{lv.gloveClass ? `Class ${lv.gloveClass.class}` : '—'}</T>
        </ValueRow>
        <ValueRow label={clearing.caption}>
          <T style={styles.strong} testID="bus-cleared-by">
            {clearing.text}
          </T>
        </ValueRow>
        {/* A condition of the energy (a maintenance switch, an arc-flash relay): the words the label prints. */}
        {Object.values(ONLY_AT_CAUTIONS)
          .filter((c) => lv.cautions.includes(c))
          .map((c) => (
            <T key={c} style={styles.energyCondition} testID="bus-energy-condition">
              {c}
            </T>
          ))}
      </View>
    </View>
  );
}

/** When the device operates over the arc's changing current (null: not before the arc ends; older results: none). */
const operatedAt = (d: ArcCaseTrace['devices'][number]): number | null => d.operatedAtS ?? null;

/** The arc's stretches (same sources feeding) and, on demand, the time steps inside each one. */
function IntervalList({ c }: { c: ArcCaseTrace }) {
  const [open, setOpen] = useState<number | null>(null);
  const stepped = c.intervals.some((i) => (i.steps ?? []).length > 1);
  if (c.intervals.length <= 1 && !stepped) return null;
  return (
    <View style={styles.intervals} testID="intervals">
      <T variant="label">ENERGY BY INTERVAL (SOURCES CUT OFF ONE BY ONE, CURRENTS FOLLOWED IN TIME)</T>
      {c.intervals.map((i, n) => {
        const steps = i.steps ?? [];
        const opened = i.openedDeviceIds ?? [];
        return (
          <View key={i.fromS} style={styles.interval}>
            <T variant="small" style={styles.intervalText}>
              {fmt(i.fromS)}–{fmt(i.toS)} s · {i.sourceIds.join(', ')} · Ibf {fmt(i.boltedFaultKa)} kA · Iarc{' '}
              {fmt(i.arcingCurrentKa)} kA{steps.length > 1 ? ' at first' : ''} · {fmt(i.incidentEnergyJPerCm2 / 4.184)}{' '}
              cal/cm²{opened.length ? ` · ${opened.join(', ')} opens` : ''}
            </T>
            {steps.length > 1 ? (
              <T
                variant="small"
                accessibilityRole="button"
                onPress={() => setOpen(open === n ? null : n)}
                style={styles.toggle}
                testID={`interval-steps-toggle-${n}`}
              >
                {open === n ? 'Hide' : 'Show'} the {steps.length} time steps (the current changes within this interval)
              </T>
            ) : null}
            {open === n
              ? steps.map((s) => (
                  <T key={s.fromS} variant="small" style={styles.stepText}>
                    {fmt(s.fromS)}–{fmt(s.toS)} s · Ibf {fmt(s.boltedFaultKa)} kA · Iarc {fmt(s.arcingCurrentKa)} kA ·{' '}
                    {fmt(s.incidentEnergyJPerCm2 / 4.184)} cal/cm²
                    {(s.openedDeviceIds ?? []).length ? ` · ${s.openedDeviceIds.join(', ')} opens` : ''}
                  </T>
                ))
              : null}
          </View>
        );
      })}
    </View>
  );
}

function DeviceTable({ c, busKv }: { c: ArcCaseTrace; busKv: number }) {
  const sorted = [...c.devices].sort((a, b) => (a.clearingTimeS ?? Infinity) - (b.clearingTimeS ?? Infinity));
  return (
    <View style={styles.devices} testID={`devices-${caseKey(c)}`}>
      {sorted.map((d) => {
        const decides = c.sources.some((s) => s.cutByDeviceId === d.deviceId);
        return (
          <View key={d.deviceId} style={[styles.device, d.deviceId === c.clearingDeviceId && styles.clearingDevice]}>
            <View style={styles.deviceHead}>
              <T style={styles.deviceId}>
                {d.deviceId}
                {d.deviceId === c.clearingDeviceId ? ' · clears the arc' : decides ? ' · cuts off a source' : ''}
              </T>
              <T style={styles.figures}>
                {operatedAt(d) !== null
                  ? `operates at ${fmt(operatedAt(d) as number)} s`
                  : d.clearingTimeS === null
                    ? 'does not clear'
                    : `${fmt(d.clearingTimeS)} s at the first-cycle current`}
              </T>
            </View>
            <T variant="small">
              {d.name} · {d.location}
            </T>
            <T variant="small">
              Sees <T style={styles.current}>{fmt(d.currentA / 1000)} kA</T>
              {d.kv !== busKv ? ` at ${fmt(d.kv)} kV` : ''} ({fmt(d.share * 100)} % of the fault) ·{' '}
              {REGION_LABELS[d.region]}
              {d.minimumTimeS !== null ? ` · minimum ${fmt(d.minimumTimeS)} s` : ''}
              {operatedAt(d) !== null && d.clearingTimeS !== null && operatedAt(d) !== d.clearingTimeS
                ? ` · band at the first-cycle current ${fmt(d.clearingTimeS)} s`
                : ''}
            </T>
            {operatedAt(d) !== null && d.operatingElement ? (
              <T variant="small">
                Operates by its {d.operatingElement} element
                {d.operatingRegion ? ` (${REGION_LABELS[d.operatingRegion]})` : ''}: ∫ dt / t(I) reaches 1 over the
                current it sees during the arc (IEEE C37.112).
              </T>
            ) : null}
            {(d.dropouts ?? []).map((x) => (
              <T key={`${x.element}-${x.atS}`} variant="small">
                Its {x.element} element stopped timing at {fmt(x.atS)} s: the current fell below its pickup.
              </T>
            ))}
          </View>
        );
      })}
    </View>
  );
}

/** The clearing trace of one bus: every number on its label traced to the device, the region of its band and the current. */
export function BusTraceScreen({ studyId, busId }: { studyId: string; busId: string }) {
  const { wide } = useLayout();
  const { system } = useUnitSystem();
  const can = useCan();
  const router = useRouter();
  const study = useStudy(studyId);
  // The governing scenario's trace (the label's basis) always; another scenario's when one is chosen.
  const [scenario, setScenario] = useState<string | undefined>(undefined);
  const governingResult = useBusResult(studyId, busId);
  const scenarioResult = useBusResult(studyId, busId, scenario, scenario !== undefined);
  const results = scenario === undefined ? governingResult : scenarioResult;
  const bus = results.data?.bus;
  const [selected, setSelected] = useState<string | null>(null);
  const governingId = governingResult.data?.governingScenarioId;
  const scenarioList = governingResult.data?.bus.scenarios;
  const chooseScenario = (id: string) => {
    setSelected(null);
    setScenario(id === governingId ? undefined : id);
  };
  const current =
    bus && bus.governing
      ? (bus.cases.find((c) => caseKey(c) === (selected ?? caseKey(bus.governing!))) ?? bus.cases[0])
      : undefined;

  // Devices of the selected case that clear, fastest first (at most six on the plot).
  const plotted = current
    ? current.devices
        .filter((d) => d.clearingTimeS !== null)
        .sort((a, b) => (a.clearingTimeS as number) - (b.clearingTimeS as number))
        .slice(0, 6)
    : [];
  const modelDevices = results.data?.devices ?? [];
  const curves = useQueries({
    queries: plotted.map((d) => {
      const device = modelDevices.find((m) => m.id === d.deviceId)?.device;
      const json = JSON.stringify(device ?? null);
      return {
        queryKey: queryKeys.bandCurves(json),
        queryFn: () => {
          if (!device) throw new Error('No device to plot');
          return callApi(contract.calc.bandCurves, { body: { device } });
        },
        enabled: !!device,
        staleTime: Infinity,
      };
    }),
  });

  if (governingResult.isLoading || study.isLoading)
    return (
      <Screen title={busId}>
        <T variant="small">Loading…</T>
      </Screen>
    );
  if (governingResult.error && (governingResult.error as { status?: number }).status !== 404)
    return (
      <Screen title={busId}>
        <Notice tone="error">{governingResult.error.message}</Notice>
      </Screen>
    );
  if (!governingResult.data)
    return (
      <Screen title={busId}>
        <Notice tone="error">This bus has no result in the study.</Notice>
      </Screen>
    );

  const reviewed = study.data?.status === 'approved';
  const labelBus = governingResult.data.bus;
  // The cautions follow the label (the governing scenario), or the trace shown when it is higher.
  const cautionEnergy = Math.max(labelBus.incidentEnergyCalPerCm2 ?? 0, bus?.incidentEnergyCalPerCm2 ?? 0) || undefined;
  const shownScenario = scenario ?? governingId ?? '';
  const scenarioError = scenario !== undefined ? scenarioResult.error : null;
  const scenarioBlock =
    scenarioList && governingId ? (
      <Card testID="trace-scenarios">
        <T testID="scenario-basis" style={styles.scenarioBasis}>
          {scenarioBasisSentence(scenarioList, governingId, shownScenario)}
        </T>
        <ScenarioSwitch
          scenarios={scenarioList}
          governingId={governingId}
          value={shownScenario}
          onChange={chooseScenario}
        />
        {scenario !== undefined && scenarioResult.isFetching ? (
          <T variant="small" testID="scenario-loading">
            Computing the trace of this scenario…
          </T>
        ) : null}
        {scenarioError ? <Notice tone="error">{scenarioError.message}</Notice> : null}
      </Card>
    ) : null;

  if (!bus)
    return (
      <Screen title={`${labelBus.busId} · ${labelBus.busName}`} subtitle="Clearing trace">
        <Link href={`/studies/${studyId}?tab=results`} style={styles.backLink}>
          ← All results
        </Link>
        {scenarioBlock}
        <Cautions reviewed={reviewed} incidentEnergyCalPerCm2={cautionEnergy} />
      </Screen>
    );

  const busKv = bus.nominalKv;
  // With scenarios, the one this trace is of (the bolted fault current and everything below are that scenario's).
  const shownName = scenarioList?.find((x) => x.scenarioId === shownScenario)?.name;
  const isLabelBasis = scenario === undefined;
  const labelPart = isLabelBasis ? (
    bus.labelValues ? (
      <LabelPreview b={bus} studyMaxArcDurationMs={results.data!.study.maxArcDurationMs} />
    ) : null
  ) : (
    <Notice tone="info" title="Not the label" testID="trace-not-label">
      This trace is of another operating scenario. The label and its values come from the governing scenario: choose it
      above to see them.
    </Notice>
  );
  const refer = (a: number, kv: number) => (a * kv) / busKv;
  const iarc = (arcCase: 'full' | 'reduced') =>
    bus.cases.find((c) => c.arcCase === arcCase && c.location === (current?.location ?? 'load-side'))?.arcingCurrentKa;

  const plot = current ? (
    <Card testID="trace-plot">
      <T variant="subheading">Trip bands at {fmt(busKv)} kV</T>
      <T variant="small">
        Device currents referred to the bus voltage. Vertical lines: the bus arcing currents; dots: where each device
        clears the current it sees.
      </T>
      <TimeCurrentPlot
        testID="trace-tcc"
        currentUnit="A"
        series={plotted.flatMap((d, i) => {
          const data = curves[i]?.data;
          return data
            ? [
                {
                  id: d.deviceId,
                  label: `${d.deviceId} (${d.name})`,
                  min: data.min.map(([a, t]) => [refer(a, d.kv), t] as const),
                  max: data.max.map(([a, t]) => [refer(a, d.kv), t] as const),
                },
              ]
            : [];
        })}
        verticals={[
          ...(iarc('full') ? [{ currentA: iarc('full')! * 1000, label: 'Full arcing', tone: 'full' as const }] : []),
          ...(iarc('reduced')
            ? [{ currentA: iarc('reduced')! * 1000, label: 'Reduced arcing', tone: 'reduced' as const }]
            : []),
        ]}
        marks={plotted.map((d) => ({
          currentA: refer(d.currentA, d.kv),
          timeS: d.clearingTimeS as number,
          label: d.deviceId,
          seriesId: d.deviceId,
        }))}
        emptyMessage={plotted.length ? 'Loading the bands…' : 'No device clears in this case.'}
      />
    </Card>
  ) : null;

  const detail = current ? (
    <View style={styles.detail}>
      <Card>
        <T variant="subheading">Cases</T>
        <Choice
          value={caseKey(current)}
          onChange={setSelected}
          testID="case"
          options={bus.cases.map((c) => ({
            value: caseKey(c),
            label: `${caseTitle(c)}${bus.governing && caseKey(c) === caseKey(bus.governing) ? ' · governs' : ''}`,
          }))}
        />
        <T testID="trace-sentence" style={styles.sentence}>
          {current.sentence}
        </T>
        <ValueRow label="Arcing current at the bus">
          <Num value={fmt(current.arcingCurrentKa)} unit="kA" size={14} />
        </ValueRow>
        <ValueRow label="Arc duration">
          <Num value={`${fmt(current.arcDurationS)} s${current.arcDurationCapped ? ' (capped)' : ''}`} size={14} />
        </ValueRow>
        {bus.arcDurationCap ? (
          <ValueRow label="Arc-duration cap">
            <T testID="trace-cap" style={styles.cap}>
              {bus.arcDurationCap.source === 'study'
                ? `${fmt(bus.arcDurationCap.capS as number)} s (the study's)`
                : `${bus.arcDurationCap.capS === null ? 'none: the clearing time stands' : `${fmt(bus.arcDurationCap.capS)} s at this bus`} — ${bus.arcDurationCap.reason ?? 'no reason given'}`}
            </T>
          </ValueRow>
        ) : null}
        <ValueRow label="Incident energy">
          <Num value={fmt(current.incidentEnergyCalPerCm2)} unit="cal/cm²" size={14} />
        </ValueRow>
        <ValueRow label="Arc-flash boundary">
          <Num value={fmtLength(current.arcFlashBoundaryMm, lengthUnitOf(system))} size={14} />
        </ValueRow>
        <IntervalList c={current} />
      </Card>
      <Card>
        <T variant="subheading">Devices carrying fault current</T>
        <DeviceTable c={current} busKv={busKv} />
      </Card>
    </View>
  ) : null;

  return (
    <Screen
      title={`${bus.busId} · ${bus.busName}`}
      subtitle={`Clearing trace${shownName ? ` · ${shownName}` : ''} · ${fmt(busKv)} kV · bolted fault ${fmt(bus.boltedFaultKa)} kA (X/R ${fmt(bus.xr)})`}
      actions={
        // Options that bring the label's energy down (an engineer's; the mitigation view computes them).
        can('mitigate') && labelBus.incidentEnergyCalPerCm2 !== undefined ? (
          <Button
            title="Bring this down"
            kind="secondary"
            testID="bring-down"
            accessibilityLabel={`Bring this down: mitigation options for ${labelBus.busId}`}
            onPress={() => router.push(`/studies/${studyId}/mitigate/${encodeURIComponent(labelBus.busId)}`)}
          />
        ) : undefined
      }
    >
      <Link href={`/studies/${studyId}?tab=results`} style={styles.backLink}>
        ← All results
      </Link>
      {!reviewed ? (
        <Notice tone="warning" title="Preliminary">
          Not reviewed or approved: do not use for labels or work planning.
        </Notice>
      ) : null}
      {scenarioBlock}
      {bus.status === 'error' ? (
        <Notice tone="error" title="This bus could not be evaluated">
          {bus.error?.message ?? ''}
        </Notice>
      ) : null}
      {bus.warnings.length ? (
        <Notice
          tone="warning"
          title={`${bus.warnings.length} warning${bus.warnings.length > 1 ? 's' : ''}`}
          testID="trace-warnings"
        >
          <View style={styles.warnings}>
            {bus.warnings.map((w) => (
              <T key={w.code + w.message} variant="small" testID={`warning-${w.code}`} style={styles.warning}>
                {w.message}
              </T>
            ))}
          </View>
        </Notice>
      ) : null}
      {wide ? (
        <View style={styles.columns}>
          <View style={styles.mainColumn}>
            {plot}
            {detail}
          </View>
          <View style={styles.sideColumn}>
            {labelPart}
            <Cautions reviewed={reviewed} incidentEnergyCalPerCm2={cautionEnergy} />
          </View>
        </View>
      ) : (
        <>
          {labelPart}
          {plot}
          {detail}
          <Cautions reviewed={reviewed} incidentEnergyCalPerCm2={cautionEnergy} />
        </>
      )}
    </Screen>
  );
}

const styles = StyleSheet.create({
  labelValues: { borderRadius: radius.md, overflow: 'hidden', borderWidth: 2, borderColor: '#000' },
  signalPanel: { flexDirection: 'row', alignItems: 'center', gap: space.sm, padding: space.md },
  signalWord: { fontFamily: fonts.textBold, fontSize: 20, letterSpacing: 1 },
  labelBody: { backgroundColor: colors.surface, padding: space.md, gap: 2 },
  energyFigures: { flexDirection: 'row', alignItems: 'baseline', gap: space.md, flexWrap: 'wrap' },
  strong: { fontFamily: fonts.textBold },
  energyCondition: { fontFamily: fonts.textBold, color: colors.danger },
  intervals: { gap: space.xs, marginTop: space.sm },
  interval: { gap: 2 },
  intervalText: { fontFamily: fonts.numbers, fontSize: 13 },
  toggle: { color: colors.accent },
  stepText: { fontFamily: fonts.numbers, fontSize: 12, paddingLeft: space.md },
  devices: { gap: space.xs },
  device: { padding: space.sm, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.lineSoft, gap: 2 },
  /** The device that clears the arc. */
  clearingDevice: { borderWidth: 2, borderColor: colors.ink },
  deviceHead: { flexDirection: 'row', justifyContent: 'space-between', gap: space.sm, flexWrap: 'wrap' },
  deviceId: { fontFamily: fonts.numbersBold },
  figures: { fontFamily: fonts.numbers },
  current: { fontFamily: fonts.numbers, fontSize: 14 },
  scenarioBasis: { fontSize: 16, lineHeight: 23 },
  backLink: { color: colors.accent, fontSize: 16 },
  detail: { gap: space.lg },
  sentence: { fontSize: 17, lineHeight: 25 },
  cap: { fontSize: 14, textAlign: 'right', flexShrink: 1 },
  warnings: { gap: 3 },
  warning: { color: colors.caution },
  columns: { flexDirection: 'row', gap: space.xl, alignItems: 'flex-start' },
  mainColumn: { flex: 1.3, gap: space.lg },
  sideColumn: { flex: 1, gap: space.lg },
});
