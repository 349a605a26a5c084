import React from 'react';
import { View } from 'react-native';
import type { LabelContent } from '../../shared/schemas/labels';
import { fmt, fmtLength } from '../../hooks/units';
import { HazardMark } from '../Cautions';
import { signalPanelColors } from '../hazard';
import { fonts, space } from '../theme';
import { T } from '../ui';

function Line({ label, value, strong }: { label: string; value: string; strong?: boolean }) {
  return (
    <View style={{ flexDirection: 'row', justifyContent: 'space-between', gap: space.sm, paddingVertical: 3, borderBottomWidth: 1, borderBottomColor: '#D0D0D0' }}>
      <T style={{ fontSize: 13, color: '#000', flexShrink: 1 }}>{label}</T>
      <T style={{ fontSize: 14, color: '#000', fontFamily: strong ? fonts.numbersBold : fonts.numbers, textAlign: 'right', flexShrink: 1 }}>{value}</T>
    </View>
  );
}

const volts = (v: number) => (v >= 1000 ? `${fmt(v / 1000)} kV` : `${Math.round(v)} V`);

/** What a printed label says, drawn on screen in the same order as the PDF label. */
export function LabelView({ content, code, width = 380 }: { content: LabelContent; code?: string; width?: number }) {
  const panel = signalPanelColors(content.signalWord);
  return (
    <View testID="label-view" style={{ width: '100%', maxWidth: width, borderWidth: 3, borderColor: '#000', backgroundColor: '#fff', alignSelf: 'center' }}>
      <View style={{ backgroundColor: panel.background, flexDirection: 'row', alignItems: 'center', justifyContent: 'center', gap: space.sm, paddingVertical: space.sm }}>
        <HazardMark size={30} />
        <T style={{ color: panel.text, fontFamily: fonts.textBold, fontSize: 30, letterSpacing: 2 }} testID="label-signal-word">
          {content.signalWord}
        </T>
      </View>
      <View style={{ backgroundColor: '#000', paddingVertical: 4 }}>
        <T style={{ color: '#fff', fontFamily: fonts.textBold, fontSize: 14, textAlign: 'center', letterSpacing: 1 }}>ARC FLASH AND SHOCK HAZARD</T>
      </View>
      <View style={{ padding: space.md, gap: 4 }}>
        <T style={{ fontSize: 12, color: '#000' }}>INCIDENT ENERGY AT {fmtLength(content.workingDistanceMm, 'in').toUpperCase()}</T>
        <View style={{ flexDirection: 'row', alignItems: 'baseline', gap: space.sm, flexWrap: 'wrap' }}>
          <T style={{ fontFamily: fonts.numbersBold, fontSize: 34, color: '#000' }} testID="label-energy">
            {fmt(content.incidentEnergyCalPerCm2)}
          </T>
          <T style={{ fontSize: 16, color: '#000' }}>cal/cm²</T>
          <T style={{ fontFamily: fonts.numbers, fontSize: 14, color: '#000' }}>({fmt(content.incidentEnergyJPerCm2)} J/cm²)</T>
        </View>
        {content.noAdequatePpe ? (
          <View style={{ backgroundColor: '#000', padding: 6 }}>
            <T style={{ color: '#fff', fontFamily: fonts.textBold, fontSize: 14 }}>NO ARC-RATED PPE IS ADEQUATE — DE-ENERGIZE BEFORE WORK</T>
          </View>
        ) : null}
        <Line label="Arc-flash boundary" value={fmtLength(content.arcFlashBoundaryMm, 'in')} strong />
        <Line label="Minimum arc rating" value={`${content.minimumArcRatingCalPerCm2} cal/cm²`} />
        <Line label="PPE level" value={content.ppeLevel ?? 'None adequate'} strong />
        <Line label="Nominal voltage" value={volts(content.nominalVoltageV)} strong />
        {content.limitedApproachMovable ? <Line label="Limited approach (movable)" value={content.limitedApproachMovable} /> : null}
        {content.limitedApproachFixed ? <Line label="Limited approach (fixed)" value={content.limitedApproachFixed} /> : null}
        {content.restrictedApproach ? <Line label="Restricted approach" value={content.restrictedApproach} /> : null}
        {content.gloveClass ? <Line label="Voltage-rated gloves" value={content.gloveClass} /> : null}
        <View style={{ marginTop: 6, gap: 2 }}>
          <T style={{ fontFamily: fonts.textBold, fontSize: 15, color: '#000' }}>
            {content.equipmentName} ({content.equipmentTag})
          </T>
          <T style={{ fontSize: 12, color: '#000' }}>{content.siteName}</T>
          <T style={{ fontSize: 12, color: '#000' }}>Clearing device: {content.clearingDevice ?? 'none before the duration cap'}</T>
          <T style={{ fontSize: 12, color: '#000' }}>
            {content.studyTitle}, rev {content.studyRevision} · {content.studyDate} · review by {content.reviewByDate}
          </T>
          <T style={{ fontSize: 12, color: '#000' }}>Approved: {content.approvedBy}</T>
          <T style={{ fontSize: 11, color: '#000', marginTop: 4 }}>{content.caution}</T>
          {code ? <T style={{ fontFamily: fonts.numbers, fontSize: 12, color: '#000', marginTop: 4 }}>Check: /l/{code}</T> : null}
        </View>
      </View>
    </View>
  );
}
