import React, { useMemo, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import type { StudyDto } from '../../shared/schemas/studies';
import type { BusChange, ElementChange } from '../../shared/schemas/compare';
import {
  comparisonSummary,
  elementHeading,
  fieldChangeText,
  hazardEnergyText,
  labelChangeTexts,
  riseText,
} from '../../shared/revisionCompare';
import { useRevisionComparison } from '../../hooks/compare';
import { useStudies } from '../../hooks/studies';
import { colors, fonts, radius, space } from '../theme';
import { Button, Card, Choice, Notice, Pill, QueryError, T } from '../ui';

/** Rows shown before "Show all". */
const FIRST_ROWS = 8;

/**
 * The revision to compare with by default: the site's approved revision when this is another one, else the revision
 * this one was started from.
 */
function defaultBaseline(study: StudyDto, revisions: StudyDto[]): string | null {
  const approved = revisions.find((s) => s.status === 'approved' && s.id !== study.id);
  return approved?.id ?? study.parentStudyId ?? null;
}

function BusRow({ c }: { c: BusChange }) {
  const rose = (c.energyRiseCalPerCm2 ?? 0) > 0 || c.after?.status === 'error';
  const labelChanges = labelChangeTexts(c);
  return (
    <View style={styles.row} testID={`compare-bus-${c.busId}`}>
      <View style={styles.rowHead}>
        <T style={styles.busId}>{c.busId}</T>
        <T variant="small" style={styles.grow} numberOfLines={1}>
          {c.busName}
        </T>
        {rose ? <Pill label="higher" tone="danger" /> : null}
      </View>
      <T>
        {hazardEnergyText(c.before)} → {hazardEnergyText(c.after)}{' '}
        <T style={rose ? styles.rise : styles.fall}>{riseText(c)}</T>
      </T>
      {labelChanges.length ? <T variant="small">{labelChanges.join(' · ')}</T> : null}
    </View>
  );
}

function ElementRow({ e }: { e: ElementChange }) {
  return (
    <View style={styles.row} testID={`compare-element-${e.kind}-${e.id}`}>
      <T style={styles.elementHeading}>{elementHeading(e)}</T>
      {e.fields.map((f) => (
        <T key={f.field} variant="small" style={styles.field}>
          {fieldChangeText(f)}
        </T>
      ))}
    </View>
  );
}

/**
 * What changed since another revision of the site (by default the approved one): the model's elements and, bus by
 * bus, the hazard, the largest rise first. Read before approving.
 */
export function ComparePanel({ study }: { study: StudyDto }) {
  const revisions = useStudies(study.siteId);
  const others = useMemo(() => (revisions.data ?? []).filter((s) => s.id !== study.id), [revisions.data, study.id]);
  const [chosen, setChosen] = useState<string | null>(null);
  const baseline = chosen ?? defaultBaseline(study, revisions.data ?? []);
  const comparison = useRevisionComparison(study.id, baseline);
  const [allBuses, setAllBuses] = useState(false);
  const [allElements, setAllElements] = useState(false);
  if (!others.length) return null;
  const c = comparison.data;
  const buses = c ? c.buses.filter((b) => b.change !== 'unchanged') : [];
  const unchanged = c ? c.buses.length - buses.length : 0;
  return (
    <Card testID="compare-panel">
      <T variant="subheading">Changes from another revision</T>
      <Choice
        label="Compare with"
        value={baseline ?? ''}
        options={others.map((s) => ({ value: s.id, label: `Revision ${s.revision} (${s.status})` }))}
        onChange={setChosen}
        testID="compare-with"
      />
      {comparison.error ? <QueryError error={comparison.error} /> : null}
      {comparison.isLoading && baseline ? <T variant="small">Comparing…</T> : null}
      {c ? (
        <View style={styles.body}>
          <T testID="compare-summary">{comparisonSummary(c)}</T>
          {c.notes.map((n) => (
            <Notice key={n} tone="warning">
              {n}
            </Notice>
          ))}
          {c.buses.length ? (
            <View style={styles.section}>
              <T variant="label">HAZARD BY BUS, LARGEST RISE FIRST</T>
              {buses.length === 0 ? <T variant="small">No bus changed.</T> : null}
              {(allBuses ? buses : buses.slice(0, FIRST_ROWS)).map((b) => (
                <BusRow key={b.busId} c={b} />
              ))}
              {buses.length > FIRST_ROWS && !allBuses ? (
                <Button
                  title={`Show all ${buses.length} changed buses`}
                  kind="secondary"
                  onPress={() => setAllBuses(true)}
                />
              ) : null}
              {unchanged ? (
                <T variant="small">
                  {unchanged} {unchanged === 1 ? 'bus' : 'buses'} unchanged.
                </T>
              ) : null}
            </View>
          ) : null}
          <View style={styles.section}>
            <T variant="label">MODEL</T>
            {c.model.elements.length === 0 ? <T variant="small">The models are the same.</T> : null}
            {(allElements ? c.model.elements : c.model.elements.slice(0, FIRST_ROWS)).map((e) => (
              <ElementRow key={`${e.kind}:${e.id}`} e={e} />
            ))}
            {c.model.elements.length > FIRST_ROWS && !allElements ? (
              <Button
                title={`Show all ${c.model.elements.length} model changes`}
                kind="secondary"
                onPress={() => setAllElements(true)}
              />
            ) : null}
          </View>
        </View>
      ) : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  body: { gap: space.md },
  section: { gap: space.sm },
  row: {
    gap: space.xs,
    paddingVertical: space.sm,
    paddingHorizontal: space.md,
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.line,
  },
  rowHead: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  grow: { flex: 1 },
  busId: { fontFamily: fonts.textBold },
  elementHeading: { fontFamily: fonts.textMedium },
  field: { fontFamily: fonts.numbers },
  rise: { color: colors.danger, fontFamily: fonts.textBold },
  fall: { color: colors.inkSoft },
});
