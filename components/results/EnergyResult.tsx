import React from 'react';
import { StyleSheet, View } from 'react-native';
import type { IncidentEnergyResult } from '../../hooks/queries';
import { fmt, fmtLength, type LengthUnit } from '../../hooks/units';
import { HazardMark } from '../Cautions';
import { signalPanelColors } from '../../shared/safetyColors';
import { colors, fonts, radius, space } from '../theme';
import { Card, Notice, Num, T, ValueRow } from '../ui';
import { ArcRating } from '../labels/ArcRating';

/** Why the governing case governs, in one sentence. */
function governingSentence(r: IncidentEnergyResult): string {
  const g = r.cases[r.governingCase];
  const o = r.cases[r.governingCase === 'full' ? 'reduced' : 'full'];
  const name = (c: 'full' | 'reduced') => (c === 'full' ? 'full arcing current' : 'reduced arcing current');
  return (
    `The ${name(r.governingCase)} case governs: ${fmt(g.incidentEnergyCalPerCm2)} cal/cm² at ${fmt(g.arcingCurrentKa)} kA for ` +
    `${fmt(g.arcDurationMs)} ms, against ${fmt(o.incidentEnergyCalPerCm2)} cal/cm² at ${fmt(o.arcingCurrentKa)} kA for ${fmt(o.arcDurationMs)} ms.`
  );
}

/** The full result of one incident-energy calculation: both cases, the governing one, label values and warnings. */
export function EnergyResult({ result, unit }: { result: IncidentEnergyResult; unit: LengthUnit }) {
  const lv = result.labelValues;
  const panel = signalPanelColors(lv.signalWord);
  return (
    <View style={styles.result} testID="energy-result">
      <View style={styles.panel}>
        <View style={[styles.signalPanel, { backgroundColor: panel.background }]}>
          <HazardMark size={26} />
          <T style={[styles.signalWord, { color: panel.text }]} testID="signal-word">
            {lv.signalWord}
          </T>
          <T style={[styles.preliminary, { color: panel.text }]}>PRELIMINARY</T>
        </View>
        <View style={styles.energy}>
          <T variant="label">INCIDENT ENERGY AT {fmtLength(result.workingDistanceMm, unit).toUpperCase()}</T>
          <View style={styles.energyFigures}>
            <Num value={fmt(result.incidentEnergyCalPerCm2)} unit="cal/cm²" size={34} bold testID="energy-cal" />
            <Num value={fmt(result.incidentEnergyJPerCm2)} unit="J/cm²" size={18} />
          </View>
          <T variant="small">{governingSentence(result)}</T>
        </View>
      </View>

      {lv.noAdequatePpe ? (
        <Notice tone="error" title="No arc-rated PPE is adequate">
          Above 40 cal/cm² energized work should not be done: de-energize the equipment (common practice).
        </Notice>
      ) : null}
      {result.warnings.length ? (
        <Notice
          tone="warning"
          title={`${result.warnings.length} warning${result.warnings.length > 1 ? 's' : ''}`}
          testID="energy-warnings"
        >
          <View style={styles.warnings}>
            {result.warnings.map((w) => (
              <T key={w.code + w.message} testID={`warning-${w.code}`} style={styles.warning}>
                {w.message}
              </T>
            ))}
          </View>
        </Notice>
      ) : null}

      <Card>
        <T variant="subheading">Label values</T>
        <ValueRow label="Arc-flash boundary" testID="row-boundary">
          <Num value={fmtLength(result.arcFlashBoundaryMm, unit)} />
        </ValueRow>
        <ValueRow label="Minimum arc rating of clothing">
          <ArcRating calPerCm2={lv.incidentEnergyCalPerCm2} />
        </ValueRow>
        <ValueRow label="PPE level (organization)">
          <T style={styles.ppeLevel}>{lv.ppeLevel ? lv.ppeLevel.name : 'Above every level'}</T>
        </ValueRow>
        <ValueRow label="Nominal voltage">
          <Num value={lv.nominalVoltageV.toLocaleString('en-US')} unit="V" />
        </ValueRow>
        {lv.shockApproach ? (
          <>
            <ValueRow label="Limited approach, movable conductor">
              <T>{lv.shockApproach.limitedApproachMovable.text}</T>
            </ValueRow>
            <ValueRow label="Limited approach, fixed part">
              <T>{lv.shockApproach.limitedApproachFixed.text}</T>
            </ValueRow>
            <ValueRow label="Restricted approach">
              <T>{lv.shockApproach.restrictedApproach.text}</T>
            </ValueRow>
          </>
        ) : null}
        <ValueRow label="Voltage-rated gloves">
          <T>{lv.gloveClass ? `Class ${lv.gloveClass.class}` : '—'}</T>
        </ValueRow>
        <T variant="small">{lv.signalWordBasis}</T>
      </Card>

      <Card>
        <T variant="subheading">Both cases (IEEE 1584-2018)</T>
        <View style={styles.cases}>
          {(['full', 'reduced'] as const).map((c) => {
            const k = result.cases[c];
            const gov = result.governingCase === c;
            return (
              <View key={c} testID={`case-${c}`} style={[styles.case, gov && styles.caseGoverning]}>
                <T variant="label">
                  {c === 'full' ? 'FULL ARCING CURRENT' : 'REDUCED ARCING CURRENT'}
                  {gov ? ' · GOVERNS' : ''}
                </T>
                <Num value={fmt(k.arcingCurrentKa)} unit="kA" size={20} bold />
                <T variant="small">
                  Arc duration <T style={styles.figures}>{fmt(k.arcDurationMs)} ms</T>
                  {k.arcDurationCapped ? ` (capped from ${fmt(k.requestedArcDurationMs)} ms)` : ''}
                </T>
                <T variant="small">
                  Energy <T style={styles.figures}>{fmt(k.incidentEnergyCalPerCm2)} cal/cm²</T> · boundary{' '}
                  <T style={styles.figures}>{fmtLength(k.arcFlashBoundaryMm, unit)}</T>
                </T>
              </View>
            );
          })}
        </View>
        <ValueRow label="Arcing-current variation factor (VarCf)">
          <Num value={fmt(result.varCf, 4)} />
        </ValueRow>
        <ValueRow label="Enclosure correction factor (CF)">
          <Num value={fmt(result.enclosureCorrectionFactor, 4)} />
        </ValueRow>
        <ValueRow label="Enclosure type">
          <T>{result.enclosure.enclosureType}</T>
        </ValueRow>
        <ValueRow label="Bolted fault current">
          <Num value={fmt(result.boltedFaultKa)} unit="kA" />
        </ValueRow>
      </Card>
    </View>
  );
}

const styles = StyleSheet.create({
  result: { gap: space.md },
  panel: { borderRadius: radius.md, overflow: 'hidden', borderWidth: 2, borderColor: '#000' },
  signalPanel: { flexDirection: 'row', alignItems: 'center', gap: space.sm, padding: space.md },
  signalWord: { fontFamily: fonts.textBold, fontSize: 22, letterSpacing: 1 },
  preliminary: { fontFamily: fonts.textMedium, fontSize: 13, marginLeft: 'auto' },
  energy: { backgroundColor: colors.surface, padding: space.md, gap: space.xs },
  energyFigures: { flexDirection: 'row', alignItems: 'baseline', gap: space.md, flexWrap: 'wrap' },
  warnings: { gap: space.xs },
  warning: { color: colors.caution },
  ppeLevel: { fontFamily: fonts.textBold },
  cases: { flexDirection: 'row', gap: space.md, flexWrap: 'wrap' },
  case: {
    flexGrow: 1,
    flexBasis: 200,
    padding: space.md,
    borderRadius: radius.sm,
    borderWidth: 1,
    borderColor: colors.line,
    gap: space.xs,
  },
  /** The case that governs the result. */
  caseGoverning: { borderWidth: 2, borderColor: colors.ink },
  figures: { fontFamily: fonts.numbers },
});
