import { Link } from 'expo-router';
import React, { useState } from 'react';
import { Pressable, ScrollView, StyleSheet, View } from 'react-native';
import {
  DEFAULT_ORDER,
  RESULTS_PAGE_SIZE_DEFAULT,
  type BusResultRow,
  type ResultsPageParams,
  type ResultsSort,
} from '../../shared/schemas/resultsPage';
import type { StudyDto } from '../../shared/schemas/studies';
import { useResultsPage } from '../../hooks/results';
import { useLayout } from '../../hooks/useLayout';
import { fmt } from '../../hooks/units';
import { useUnitSystem } from '../../hooks/unitSystem';
import {
  busArcDurationCapS,
  clearedByDisplay,
  clearedByLine,
  clearedByText,
  formatBoundary,
  formatCalPerCm2,
} from '../../shared/labelDisplay';
import { Cautions } from '../Cautions';
import { signalPanelColors } from '../../shared/safetyColors';
import { colors, fonts, radius, space, touch } from '../theme';
import { Button, Card, Choice, Notice, Num, T } from '../ui';

type Show = 'all' | 'warnings' | 'errors';
type Band = 'all' | 'le1.2' | 'le8' | 'le40' | 'gt40';

/** Energy bands as the server filters them: more than `minCal`, at most `maxCal` (cal/cm²). */
const BANDS: { value: Band; label: string; minCal?: number; maxCal?: number }[] = [
  { value: 'all', label: 'Any energy' },
  { value: 'le1.2', label: '≤ 1.2 cal/cm²', maxCal: 1.2 },
  { value: 'le8', label: '1.2–8', minCal: 1.2, maxCal: 8 },
  { value: 'le40', label: '8–40', minCal: 8, maxCal: 40 },
  { value: 'gt40', label: '> 40', minCal: 40 },
];

const SORTS: { value: ResultsSort; label: string }[] = [
  { value: 'busId', label: 'Bus' },
  { value: 'energy', label: 'Energy' },
  { value: 'boundary', label: 'Boundary' },
  { value: 'duration', label: 'Arc duration' },
  { value: 'kv', label: 'kV' },
];

const PAGE_SIZES = [String(RESULTS_PAGE_SIZE_DEFAULT), '100', '200'] as const;

function SignalChip({ b }: { b: BusResultRow }) {
  if (!b.labelValues) return <T style={styles.errorWord}>ERROR</T>;
  const p = signalPanelColors(b.labelValues.signalWord);
  return (
    <View style={[styles.signalChip, { backgroundColor: p.background }]}>
      <T style={[styles.signalWord, { color: p.text }]}>{b.labelValues.signalWord}</T>
    </View>
  );
}

/**
 * What ends the bus's governing arc, in the label's words: the device, or "No device clears within 2 s — arc
 * duration limited to 2 s" (the cap that applied at the bus).
 */
function clearedByOf(b: BusResultRow, studyMaxArcDurationMs: number) {
  return clearedByDisplay({
    clearingDevice: b.clearingDeviceId ?? null,
    governingCase: '',
    arcDurationCapS: busArcDurationCapS(b, studyMaxArcDurationMs),
  });
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

/** Previous / page x of y / next. */
function Pager({
  page,
  pages,
  onPage,
  busy,
}: {
  page: number;
  pages: number;
  onPage: (p: number) => void;
  busy: boolean;
}) {
  if (pages <= 1) return null;
  return (
    <View style={styles.pager} testID="results-pager">
      <Button
        title="‹ Previous"
        kind="secondary"
        disabled={page <= 1}
        onPress={() => onPage(page - 1)}
        testID="results-prev"
      />
      <T variant="small" testID="results-page">
        Page {page} of {pages}
        {busy ? ' …' : ''}
      </T>
      <Button
        title="Next ›"
        kind="secondary"
        disabled={page >= pages}
        onPress={() => onPage(page + 1)}
        testID="results-next"
      />
    </View>
  );
}

/**
 * Results of the latest run (or the approved run), a page at a time from the server: sortable, filterable; each bus
 * opens its clearing trace. The counts and the cautions are over the whole study, whatever the page.
 */
export function ResultsPanel({ study }: { study: StudyDto }) {
  const { wide } = useLayout();
  // Boundaries in both units, the user's unit system first.
  const unitOrder = useUnitSystem().system === 'us' ? 'us-first' : 'si-first';
  const [sort, setSortState] = useState<ResultsSort>('busId');
  const [order, setOrder] = useState<'asc' | 'desc'>(DEFAULT_ORDER.busId);
  const [show, setShow] = useState<Show>('all');
  const [band, setBand] = useState<Band>('all');
  const [ppe, setPpe] = useState<string>('all');
  const [scenarioFilter, setScenarioFilter] = useState<string>('all');
  const [pageSize, setPageSize] = useState<(typeof PAGE_SIZES)[number]>(PAGE_SIZES[0]);
  const [page, setPage] = useState(1);
  // On a phone the sort and filter controls fold away behind one button, so the first rows show at once.
  const [filtersOpen, setFiltersOpen] = useState(false);
  const filtered = show !== 'all' || band !== 'all' || ppe !== 'all' || scenarioFilter !== 'all';
  // Any change of sort or filter starts again at the first page.
  const reset =
    <V,>(set: (v: V) => void) =>
    (v: V) => {
      set(v);
      setPage(1);
    };
  const setSort = (v: ResultsSort) => {
    setSortState(v);
    setOrder(DEFAULT_ORDER[v]);
    setPage(1);
  };

  const bandDef = BANDS.find((b) => b.value === band)!;
  const params: ResultsPageParams = {
    sort,
    order,
    ...(bandDef.minCal !== undefined ? { minCal: bandDef.minCal } : {}),
    ...(bandDef.maxCal !== undefined ? { maxCal: bandDef.maxCal } : {}),
    ...(ppe !== 'all' ? { ppe } : {}),
    ...(scenarioFilter !== 'all' ? { scenarioId: scenarioFilter } : {}),
    ...(show === 'warnings' ? { warnings: true } : show === 'errors' ? { errors: true } : {}),
    page,
    pageSize: Number(pageSize),
  };
  const results = useResultsPage(study.id, params);

  const data = results.data;
  if (results.isLoading) return <T variant="small">Loading results…</T>;
  if (results.error) return <Notice tone="error">{results.error.message}</Notice>;
  if (!data) return <Notice>No results yet: run the study from the Overview.</Notice>;
  const rows = data.rows;
  const first = data.total ? (data.page - 1) * data.pageSize + 1 : 0;
  const last = (data.page - 1) * data.pageSize + rows.length;
  const numeric = sort !== 'busId';
  const pager = (
    <Pager
      page={data.page}
      pages={data.pages}
      onPage={setPage}
      busy={results.isFetching && results.isPlaceholderData}
    />
  );

  // With operating scenarios: each row's governing scenario (the one its label takes) by name, and a column for it.
  const scenarios = data.study.scenarios;
  const scenarioName = (id: string | null) => (id ? (scenarios?.find((s) => s.id === id)?.name ?? id) : '—');
  const cols = scenarios
    ? COLS.flatMap((c) => (c.key === 'e' ? [c, { key: 'scn', label: 'SCENARIO', flex: 1.1 }] : [c]))
    : COLS;

  const reviewed = study.status === 'approved';
  const stale = data.run.modelVersion !== study.modelVersion && study.status === 'draft';
  return (
    <View style={styles.panel}>
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
      {data.study.warnings.length ? (
        <Notice tone="warning" title="Short-circuit warnings">
          <View style={styles.warnings}>
            {data.study.warnings.map((w) => (
              <T key={w.code + w.message} variant="small" testID={`warning-${w.code}`} style={styles.warningText}>
                {w.message}
              </T>
            ))}
          </View>
        </Notice>
      ) : null}
      <Card style={[styles.filters, wide && styles.filtersWide]}>
        {wide ? null : (
          <Button
            title={filtersOpen ? 'Hide sort and filters' : `Sort and filter${filtered ? ' (filtered)' : ''}`}
            kind="secondary"
            onPress={() => setFiltersOpen(!filtersOpen)}
            testID="results-filters-toggle"
          />
        )}
        {wide || filtersOpen ? (
          <>
            <Choice label="Sort by" value={sort} onChange={setSort} testID="sort" options={SORTS} />
            <Choice
              label="Order"
              value={order}
              onChange={reset(setOrder)}
              testID="order"
              options={[
                { value: 'asc', label: numeric ? 'Lowest first' : 'A to Z' },
                { value: 'desc', label: numeric ? 'Highest first' : 'Z to A' },
              ]}
            />
            <Choice
              label="Show"
              value={show}
              onChange={reset(setShow)}
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
              onChange={reset(setBand)}
              testID="band"
              options={BANDS.map(({ value, label }) => ({ value, label }))}
            />
            <Choice
              label="PPE level"
              value={ppe}
              onChange={reset(setPpe)}
              testID="ppe"
              options={[
                { value: 'all', label: 'Any' },
                ...data.summary.byPpeLevel.map((p) => ({ value: p.name, label: `${p.name} (${p.count})` })),
              ]}
            />
            {scenarios ? (
              <Choice
                label="Governing scenario"
                value={scenarioFilter}
                onChange={reset(setScenarioFilter)}
                testID="scenario-filter"
                options={[{ value: 'all', label: 'Any' }, ...scenarios.map((s) => ({ value: s.id, label: s.name }))]}
              />
            ) : null}
            <Choice
              label="Rows per page"
              value={pageSize}
              onChange={reset(setPageSize)}
              testID="page-size"
              options={PAGE_SIZES.map((n) => ({ value: n, label: n }))}
            />
          </>
        ) : null}
        <T variant="small" style={wide ? styles.countWide : undefined} testID="results-count">
          {data.total} of {data.summary.buses} buses{data.total ? ` · showing ${first}–${last}` : ''} ·{' '}
          {data.summary.bySignalWord.DANGER} DANGER, {data.summary.bySignalWord.WARNING} WARNING
          {data.summary.errors ? `, ${data.summary.errors} not evaluated` : ''} · arc duration capped at{' '}
          {fmt(data.study.maxArcDurationMs / 1000)} s · motors{' '}
          {data.study.motorDecayModel === 'higher'
            ? 'evaluated both ways (full then stop; decaying), the higher energy kept'
            : data.study.motorDecayModel === 'exponential'
              ? 'decay exponentially'
              : 'full, then stop'}{' '}
          · run {data.run.finishedAt?.slice(0, 16).replace('T', ' ')}
        </T>
      </Card>
      {data.total === 0 ? <Notice>No bus matches these filters.</Notice> : null}

      {wide ? (
        <ScrollView horizontal contentContainerStyle={styles.tableScrollContent}>
          <View style={[styles.table, scenarios ? styles.tableScenarios : null]} testID="results-table">
            <View style={styles.tableHead}>
              {cols.map((c) => (
                <T key={c.key} variant="label" style={{ flex: c.flex }}>
                  {c.label}
                </T>
              ))}
            </View>
            {rows.map((b) => (
              <Link key={b.busId} href={`/studies/${study.id}/bus/${encodeURIComponent(b.busId)}`} asChild>
                <Pressable accessibilityRole="link" testID={`result-${b.busId}`} style={styles.resultRow}>
                  <T style={styles.cellBus}>{b.busId}</T>
                  <T style={styles.cellName} numberOfLines={2}>
                    {b.busName}
                  </T>
                  <T style={styles.cellKv}>{fmt(b.nominalKv)}</T>
                  <T style={styles.cellCurrent}>{fmt(b.boltedFaultKa)}</T>
                  <T style={styles.cellCurrent}>{fmt(b.governingArcingCurrentKa)}</T>
                  <T style={styles.cellClearedBy}>
                    {b.status === 'error' ? '—' : clearedByText(clearedByOf(b, data.study.maxArcDurationMs))}
                  </T>
                  <T style={styles.cellTime}>{fmt(b.arcDurationS)}</T>
                  <T style={styles.cellEnergy}>
                    {b.incidentEnergyCalPerCm2 !== undefined ? formatCalPerCm2(b.incidentEnergyCalPerCm2) : '—'}
                  </T>
                  {scenarios ? (
                    <T style={styles.cellScenario} numberOfLines={2} testID={`result-${b.busId}-scenario`}>
                      {scenarioName(b.scenarioId)}
                    </T>
                  ) : null}
                  <T style={styles.cellBoundary}>
                    {b.arcFlashBoundaryMm !== undefined ? formatBoundary(b.arcFlashBoundaryMm, unitOrder) : '—'}
                  </T>
                  <T style={styles.cellPpe}>
                    {b.labelValues ? (b.labelValues.ppeLevel?.name ?? 'None adequate') : '—'}
                  </T>
                  <View style={styles.cellSignal}>
                    <SignalChip b={b} />
                  </View>
                  <T style={[styles.cellWarnings, b.warnings.length ? styles.cellWarningsSome : null]}>
                    {b.warnings.length || ''}
                  </T>
                </Pressable>
              </Link>
            ))}
          </View>
        </ScrollView>
      ) : (
        <View style={styles.cards}>
          {rows.map((b) => (
            <Link key={b.busId} href={`/studies/${study.id}/bus/${encodeURIComponent(b.busId)}`} asChild>
              <Pressable accessibilityRole="link" testID={`result-${b.busId}`}>
                <Card style={styles.resultCard}>
                  <View style={styles.resultCardHead}>
                    <T style={styles.resultCardBus}>{b.busId}</T>
                    <SignalChip b={b} />
                  </View>
                  <T variant="small">{b.busName}</T>
                  {scenarios ? (
                    <T variant="small" testID={`result-${b.busId}-scenario`}>
                      Scenario: {scenarioName(b.scenarioId)}
                    </T>
                  ) : null}
                  {b.status === 'error' ? (
                    <T style={styles.errorText}>{b.error?.message}</T>
                  ) : (
                    <View style={styles.resultCardEnergy}>
                      <Num
                        value={
                          b.incidentEnergyCalPerCm2 !== undefined ? formatCalPerCm2(b.incidentEnergyCalPerCm2) : '—'
                        }
                        unit="cal/cm²"
                        size={24}
                        bold
                      />
                      <T variant="small">
                        {clearedByLine(
                          { clearingDevice: b.clearingDeviceId ?? null },
                          clearedByOf(b, data.study.maxArcDurationMs),
                        )}{' '}
                        · {fmt(b.arcDurationS)} s ·{' '}
                        {b.arcFlashBoundaryMm !== undefined ? formatBoundary(b.arcFlashBoundaryMm, unitOrder) : ''}
                      </T>
                    </View>
                  )}
                  {b.warnings.length ? (
                    <T variant="small" style={styles.warningText}>
                      {b.warnings.length} warning{b.warnings.length > 1 ? 's' : ''}
                    </T>
                  ) : null}
                </Card>
              </Pressable>
            </Link>
          ))}
        </View>
      )}
      {pager}
      <Cautions reviewed={reviewed} incidentEnergyCalPerCm2={data.summary.maxIncidentEnergyCalPerCm2 ?? 0} />
    </View>
  );
}

const styles = StyleSheet.create({
  errorWord: { color: colors.danger, fontFamily: fonts.textBold },
  signalChip: { borderRadius: 4, paddingHorizontal: 6, paddingVertical: 2, alignSelf: 'flex-start' },
  signalWord: { fontFamily: fonts.textBold, fontSize: 12 },
  filters: { gap: space.sm, flexDirection: 'column', flexWrap: 'wrap', columnGap: space.xl },
  filtersWide: { flexDirection: 'row' },
  /** On a wide screen the count takes a line of its own below the filters. */
  countWide: { flexBasis: '100%' },
  pager: { flexDirection: 'row', alignItems: 'center', justifyContent: 'center', gap: space.md },
  panel: { gap: space.lg },
  warnings: { gap: 2 },
  warningText: { color: colors.caution },
  tableScrollContent: { minWidth: '100%' },
  table: {
    minWidth: 940,
    flex: 1,
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.lineSoft,
  },
  /** The scenario column makes the table wider. */
  tableScenarios: { minWidth: 960 },
  tableHead: {
    flexDirection: 'row',
    paddingHorizontal: space.md,
    paddingVertical: space.sm,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
  },
  resultRow: {
    flexDirection: 'row',
    alignItems: 'center',
    minHeight: touch.min,
    paddingHorizontal: space.md,
    borderBottomWidth: 1,
    borderBottomColor: colors.lineSoft,
  },
  cellBus: { flex: 1.1, fontFamily: fonts.numbersBold, fontSize: 14 },
  cellName: { flex: 1.8, fontSize: 14, paddingRight: 6 },
  cellKv: { flex: 0.6, fontFamily: fonts.numbers, fontSize: 14 },
  cellCurrent: { flex: 0.8, fontFamily: fonts.numbers, fontSize: 14 },
  cellClearedBy: { flex: 1.2, fontFamily: fonts.numbers, fontSize: 14 },
  cellTime: { flex: 0.8, fontFamily: fonts.numbers, fontSize: 14 },
  cellEnergy: { flex: 0.9, fontFamily: fonts.numbersBold, fontSize: 15 },
  cellScenario: { flex: 1.1, fontSize: 13, paddingRight: 6 },
  cellBoundary: { flex: 1, fontFamily: fonts.numbers, fontSize: 14 },
  cellPpe: { flex: 1, fontSize: 13 },
  cellSignal: { flex: 0.9 },
  cellWarnings: { flex: 0.4, color: colors.muted, fontFamily: fonts.numbersBold },
  cellWarningsSome: { color: colors.caution },
  cards: { gap: space.sm },
  resultCard: { gap: 6 },
  resultCardHead: {
    flexDirection: 'row',
    justifyContent: 'space-between',
    alignItems: 'center',
    gap: space.sm,
  },
  resultCardBus: { fontFamily: fonts.numbersBold },
  errorText: { color: colors.danger },
  resultCardEnergy: {
    flexDirection: 'row',
    justifyContent: 'space-between',
    alignItems: 'baseline',
    flexWrap: 'wrap',
    gap: space.sm,
  },
});
