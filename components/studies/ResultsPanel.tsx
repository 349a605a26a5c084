import { Link } from 'expo-router';
import React, { useMemo, useState } from 'react';
import { Pressable, ScrollView, View } from 'react-native';
import type { StudyDto } from '../../shared/schemas/studies';
import type { BusResult } from '../../shared/schemas/studyResults';
import { useResults } from '../../hooks/studies';
import { useLayout } from '../../hooks/useLayout';
import { fmt } from '../../hooks/units';
import { formatBoundary, formatCalPerCm2 } from '../../shared/labelDisplay';
import { Cautions } from '../Cautions';
import { signalPanelColors } from '../../shared/safetyColors';
import { colors, fonts, radius, space, touch } from '../theme';
import { Card, Choice, Notice, Num, T } from '../ui';

type Sort = 'bus' | 'energy' | 'boundary' | 'time';
type Show = 'all' | 'warnings' | 'errors';
type Band = 'all' | 'le1.2' | 'le8' | 'le40' | 'gt40';

const BANDS: { value: Band; label: string; test: (e: number) => boolean }[] = [
  { value: 'all', label: 'Any energy', test: () => true },
  { value: 'le1.2', label: '≤ 1.2 cal/cm²', test: (e) => e <= 1.2 },
  { value: 'le8', label: '1.2–8', test: (e) => e > 1.2 && e <= 8 },
  { value: 'le40', label: '8–40', test: (e) => e > 8 && e <= 40 },
  { value: 'gt40', label: '> 40', test: (e) => e > 40 },
];

function SignalChip({ b }: { b: BusResult }) {
  if (!b.labelValues) return <T style={{ color: colors.danger, fontFamily: fonts.textBold }}>ERROR</T>;
  const p = signalPanelColors(b.labelValues.signalWord);
  return (
    <View
      style={{
        backgroundColor: p.background,
        borderRadius: 4,
        paddingHorizontal: 6,
        paddingVertical: 2,
        alignSelf: 'flex-start',
      }}
    >
      <T style={{ color: p.text, fontFamily: fonts.textBold, fontSize: 12 }}>{b.labelValues.signalWord}</T>
    </View>
  );
}

const COLS: { key: string; label: string; flex: number }[] = [
  { key: 'bus', label: 'BUS', flex: 1.1 },
  { key: 'name', label: 'EQUIPMENT', flex: 1.8 },
  { key: 'kv', label: 'kV', flex: 0.6 },
  { key: 'ibf', label: 'I bf kA', flex: 0.8 },
  { key: 'iarc', label: 'I arc kA', flex: 0.8 },
  { key: 'dev', label: 'CLEARED BY', flex: 1.2 },
  { key: 't', label: 'TIME s', flex: 0.8 },
  { key: 'e', label: 'cal/cm²', flex: 0.9 },
  { key: 'afb', label: 'BOUNDARY', flex: 1 },
  { key: 'ppe', label: 'PPE', flex: 1 },
  { key: 'sig', label: 'SIGNAL', flex: 0.9 },
  { key: 'w', label: '!', flex: 0.4 },
];

function governingIarc(b: BusResult): number | undefined {
  return b.cases.find((c) => c.arcCase === b.governing?.arcCase && c.location === b.governing?.location)
    ?.arcingCurrentKa;
}

/** Results of the latest run (or the approved run): sortable, filterable; each bus opens its clearing trace. */
export function ResultsPanel({ study }: { study: StudyDto }) {
  const { wide } = useLayout();
  const results = useResults(study.id);
  const [sort, setSort] = useState<Sort>('bus');
  const [show, setShow] = useState<Show>('all');
  const [band, setBand] = useState<Band>('all');
  const [ppe, setPpe] = useState<string>('all');

  const data = results.data;
  const ppeNames = useMemo(() => {
    const names = new Set<string>();
    for (const b of data?.results.buses ?? [])
      names.add(b.labelValues ? (b.labelValues.ppeLevel?.name ?? 'Above every level') : 'Error');
    return [...names];
  }, [data]);
  const rows = useMemo(() => {
    if (!data) return [];
    const bandTest = BANDS.find((b) => b.value === band)!.test;
    const out = data.results.buses.filter((b) => {
      if (show === 'warnings' && !b.warnings.length) return false;
      if (show === 'errors' && b.status !== 'error') return false;
      if (band !== 'all' && !(b.incidentEnergyCalPerCm2 !== undefined && bandTest(b.incidentEnergyCalPerCm2)))
        return false;
      if (ppe !== 'all') {
        const name = b.labelValues ? (b.labelValues.ppeLevel?.name ?? 'Above every level') : 'Error';
        if (name !== ppe) return false;
      }
      return true;
    });
    const key = (b: BusResult): number | string =>
      sort === 'energy'
        ? -(b.incidentEnergyCalPerCm2 ?? -1)
        : sort === 'boundary'
          ? -(b.arcFlashBoundaryMm ?? -1)
          : sort === 'time'
            ? -(b.arcDurationS ?? -1)
            : b.busId;
    return [...out].sort((a, b) => (key(a) < key(b) ? -1 : key(a) > key(b) ? 1 : 0));
  }, [data, sort, show, band, ppe]);

  if (results.isLoading) return <T variant="small">Loading results…</T>;
  if (results.error) return <Notice tone="error">{results.error.message}</Notice>;
  if (!data) return <Notice>No results yet: run the study from the Overview.</Notice>;

  const reviewed = study.status === 'approved';
  const stale = data.run.modelVersion !== study.modelVersion && study.status === 'draft';
  return (
    <View style={{ gap: space.lg }}>
      {!reviewed ? (
        <Notice tone="warning" title="Preliminary results">
          Not reviewed or approved: do not use for labels or work planning.
        </Notice>
      ) : null}
      {stale ? (
        <Notice tone="warning">
          These results are from model version {data.run.modelVersion}; the model is now version {study.modelVersion}.
          Run again.
        </Notice>
      ) : null}
      {data.results.warnings.length ? (
        <Notice tone="warning" title="Short-circuit warnings">
          <View style={{ gap: 2 }}>
            {data.results.warnings.map((w) => (
              <T key={w.code + w.message} variant="small" style={{ color: colors.caution }}>
                {w.code}: {w.message}
              </T>
            ))}
          </View>
        </Notice>
      ) : null}
      <Card style={{ gap: space.sm, flexDirection: wide ? 'row' : 'column', flexWrap: 'wrap', columnGap: space.xl }}>
        <Choice
          label="Sort by"
          value={sort}
          onChange={setSort}
          testID="sort"
          options={[
            { value: 'bus', label: 'Bus' },
            { value: 'energy', label: 'Energy' },
            { value: 'boundary', label: 'Boundary' },
            { value: 'time', label: 'Arc duration' },
          ]}
        />
        <Choice
          label="Show"
          value={show}
          onChange={setShow}
          testID="show"
          options={[
            { value: 'all', label: 'All buses' },
            { value: 'warnings', label: 'With warnings' },
            { value: 'errors', label: 'With errors' },
          ]}
        />
        <Choice
          label="Incident energy"
          value={band}
          onChange={setBand}
          testID="band"
          options={BANDS.map(({ value, label }) => ({ value, label }))}
        />
        <Choice
          label="PPE level"
          value={ppe}
          onChange={setPpe}
          testID="ppe"
          options={[{ value: 'all', label: 'Any' }, ...ppeNames.map((n) => ({ value: n, label: n }))]}
        />
        <T variant="small" style={{ flexBasis: '100%' }}>
          {rows.length} of {data.results.buses.length} buses · arc duration capped at{' '}
          {fmt(data.results.maxArcDurationMs / 1000)} s · run {data.run.finishedAt?.slice(0, 16).replace('T', ' ')}
        </T>
      </Card>

      {wide ? (
        <ScrollView horizontal contentContainerStyle={{ minWidth: '100%' }}>
          <View
            style={{
              minWidth: 940,
              flex: 1,
              backgroundColor: colors.surface,
              borderRadius: radius.lg,
              borderWidth: 1,
              borderColor: colors.lineSoft,
            }}
            testID="results-table"
          >
            <View
              style={{
                flexDirection: 'row',
                paddingHorizontal: space.md,
                paddingVertical: space.sm,
                borderBottomWidth: 1,
                borderBottomColor: colors.line,
              }}
            >
              {COLS.map((c) => (
                <T key={c.key} variant="label" style={{ flex: c.flex }}>
                  {c.label}
                </T>
              ))}
            </View>
            {rows.map((b) => (
              <Link key={b.busId} href={`/studies/${study.id}/bus/${encodeURIComponent(b.busId)}`} asChild>
                <Pressable
                  accessibilityRole="link"
                  testID={`result-${b.busId}`}
                  style={{
                    flexDirection: 'row',
                    alignItems: 'center',
                    minHeight: touch.min,
                    paddingHorizontal: space.md,
                    borderBottomWidth: 1,
                    borderBottomColor: colors.lineSoft,
                  }}
                >
                  <T style={{ flex: 1.1, fontFamily: fonts.numbersBold, fontSize: 14 }}>{b.busId}</T>
                  <T style={{ flex: 1.8, fontSize: 14, paddingRight: 6 }} numberOfLines={2}>
                    {b.busName}
                  </T>
                  <T style={{ flex: 0.6, fontFamily: fonts.numbers, fontSize: 14 }}>{fmt(b.nominalKv)}</T>
                  <T style={{ flex: 0.8, fontFamily: fonts.numbers, fontSize: 14 }}>{fmt(b.boltedFaultKa)}</T>
                  <T style={{ flex: 0.8, fontFamily: fonts.numbers, fontSize: 14 }}>{fmt(governingIarc(b))}</T>
                  <T style={{ flex: 1.2, fontFamily: fonts.numbers, fontSize: 14 }}>
                    {b.status === 'error' ? '—' : (b.clearingDeviceId ?? 'none (capped)')}
                  </T>
                  <T style={{ flex: 0.8, fontFamily: fonts.numbers, fontSize: 14 }}>{fmt(b.arcDurationS)}</T>
                  <T style={{ flex: 0.9, fontFamily: fonts.numbersBold, fontSize: 15 }}>
                    {b.incidentEnergyCalPerCm2 !== undefined ? formatCalPerCm2(b.incidentEnergyCalPerCm2) : '—'}
                  </T>
                  <T style={{ flex: 1, fontFamily: fonts.numbers, fontSize: 14 }}>
                    {b.arcFlashBoundaryMm !== undefined ? formatBoundary(b.arcFlashBoundaryMm) : '—'}
                  </T>
                  <T style={{ flex: 1, fontSize: 13 }}>
                    {b.labelValues ? (b.labelValues.ppeLevel?.name ?? 'None adequate') : '—'}
                  </T>
                  <View style={{ flex: 0.9 }}>
                    <SignalChip b={b} />
                  </View>
                  <T
                    style={{
                      flex: 0.4,
                      color: b.warnings.length ? colors.caution : colors.muted,
                      fontFamily: fonts.numbersBold,
                    }}
                  >
                    {b.warnings.length || ''}
                  </T>
                </Pressable>
              </Link>
            ))}
          </View>
        </ScrollView>
      ) : (
        <View style={{ gap: space.sm }}>
          {rows.map((b) => (
            <Link key={b.busId} href={`/studies/${study.id}/bus/${encodeURIComponent(b.busId)}`} asChild>
              <Pressable accessibilityRole="link" testID={`result-${b.busId}`}>
                <Card style={{ gap: 6 }}>
                  <View
                    style={{
                      flexDirection: 'row',
                      justifyContent: 'space-between',
                      alignItems: 'center',
                      gap: space.sm,
                    }}
                  >
                    <T style={{ fontFamily: fonts.numbersBold }}>{b.busId}</T>
                    <SignalChip b={b} />
                  </View>
                  <T variant="small">{b.busName}</T>
                  {b.status === 'error' ? (
                    <T style={{ color: colors.danger }}>{b.error?.message}</T>
                  ) : (
                    <View
                      style={{
                        flexDirection: 'row',
                        justifyContent: 'space-between',
                        alignItems: 'baseline',
                        flexWrap: 'wrap',
                        gap: space.sm,
                      }}
                    >
                      <Num
                        value={
                          b.incidentEnergyCalPerCm2 !== undefined ? formatCalPerCm2(b.incidentEnergyCalPerCm2) : '—'
                        }
                        unit="cal/cm²"
                        size={24}
                        bold
                      />
                      <T variant="small">
                        {b.clearingDeviceId ?? 'capped'} · {fmt(b.arcDurationS)} s ·{' '}
                        {b.arcFlashBoundaryMm !== undefined ? formatBoundary(b.arcFlashBoundaryMm) : ''}
                      </T>
                    </View>
                  )}
                  {b.warnings.length ? (
                    <T variant="small" style={{ color: colors.caution }}>
                      {b.warnings.length} warning{b.warnings.length > 1 ? 's' : ''}
                    </T>
                  ) : null}
                </Card>
              </Pressable>
            </Link>
          ))}
        </View>
      )}
      <Cautions
        reviewed={reviewed}
        incidentEnergyCalPerCm2={Math.max(0, ...data.results.buses.map((b) => b.incidentEnergyCalPerCm2 ?? 0))}
      />
    </View>
  );
}
