import React from 'react';
import { Image, View } from 'react-native';
import type { LabelContent } from '../../shared/schemas/labels';
import { fmt, fmtLength } from '../../hooks/units';
import { HazardMark } from '../Cautions';
import { signalPanelColors } from '../../shared/safetyColors';
import { fonts } from '../theme';
import { T } from '../ui';

const INK = '#000000';
const RULE = { borderColor: INK, borderWidth: 1 } as const;
const volts = (v: number) => (v >= 1000 ? `${fmt(v / 1000)} kV` : `${Math.round(v)} V`);
const metres = (mm: number) => `${(Math.ceil(mm / 10) / 100).toFixed(2)} m`;
const group = (code: string) => code.replace(/(.{4})(?=.)/g, '$1 ');

function Cell({ title, children, flex = 1 }: { title: string; children: React.ReactNode; flex?: number }) {
  return (
    <View style={{ flex, padding: 6, gap: 1 }}>
      <T style={{ fontFamily: fonts.textBold, fontSize: 9, lineHeight: 12, color: INK, letterSpacing: 0.4 }}>
        {title.toUpperCase()}
      </T>
      {children}
    </View>
  );
}

const Big = ({ children, size = 16 }: { children: React.ReactNode; size?: number }) => (
  <T style={{ fontFamily: fonts.numbersBold, fontSize: size, color: INK }}>{children}</T>
);
const Small = ({ children }: { children: React.ReactNode }) => (
  <T style={{ fontFamily: fonts.numbers, fontSize: 11, lineHeight: 14, color: INK }}>{children}</T>
);
const Row = ({ children }: { children: React.ReactNode }) => (
  <View style={{ flexDirection: 'row', borderTopWidth: 1, borderColor: INK }}>{children}</View>
);

/**
 * What a printed label says, drawn on screen in the layout of the PDF label (server/pdf/labels.ts): the signal-word
 * panel, the hazard line, energy and boundary, arc rating and PPE, voltage and approach boundaries, the equipment with
 * the QR code, the clearing device, dates and approval.
 */
export function LabelView({ content, code, width = 380 }: { content: LabelContent; code?: string; width?: number }) {
  const panel = signalPanelColors(content.signalWord);
  return (
    <View
      testID="label-view"
      style={{ width: '100%', maxWidth: width, alignSelf: 'center', backgroundColor: '#fff', ...RULE, borderWidth: 2 }}
    >
      <View
        style={{
          backgroundColor: panel.background,
          flexDirection: 'row',
          alignItems: 'center',
          justifyContent: 'center',
          gap: 10,
          paddingVertical: 8,
        }}
      >
        <HazardMark size={34} />
        <T
          style={{ color: panel.text, fontFamily: fonts.textBold, fontSize: 36, lineHeight: 47, letterSpacing: 1 }}
          testID="label-signal-word"
        >
          {content.signalWord}
        </T>
      </View>
      <View style={{ alignItems: 'center', paddingVertical: 4, paddingHorizontal: 6 }}>
        <T style={{ fontFamily: fonts.textBold, fontSize: 19, lineHeight: 25, color: INK }}>
          ARC FLASH AND SHOCK HAZARD
        </T>
        <T style={{ fontSize: 10, lineHeight: 13, color: INK, textAlign: 'center' }}>
          Qualified persons only. Do not work on this equipment while it is energized.
        </T>
      </View>
      <Row>
        <Cell title="Incident energy" flex={1.2}>
          <View style={{ flexDirection: 'row', alignItems: 'baseline', gap: 4 }}>
            <Big size={36}>
              <T
                testID="label-energy"
                style={{ fontFamily: fonts.numbersBold, fontSize: 36, lineHeight: 47, color: INK }}
              >
                {fmt(content.incidentEnergyCalPerCm2)}
              </T>
            </Big>
            <T style={{ fontSize: 15, lineHeight: 20, color: INK }}>cal/cm²</T>
          </View>
          <Small>{fmt(content.incidentEnergyJPerCm2)} J/cm²</Small>
          <T style={{ fontSize: 10, lineHeight: 13, color: INK }}>
            at a working distance of {Math.round(content.workingDistanceMm)} mm (
            {fmtLength(content.workingDistanceMm, 'in')})
          </T>
        </Cell>
        <View style={{ width: 1, backgroundColor: INK }} />
        <Cell title="Arc-flash boundary">
          <Big size={22}>{metres(content.arcFlashBoundaryMm)}</Big>
          <Small>{fmtLength(content.arcFlashBoundaryMm, 'in')}</Small>
        </Cell>
      </Row>
      <Row>
        <Cell title="Minimum arc rating">
          <Big>{content.minimumArcRatingCalPerCm2} cal/cm²</Big>
        </Cell>
        <View style={{ flex: 1.2, padding: 6, justifyContent: 'center' }}>
          <View style={{ ...RULE, borderWidth: 2, padding: 4, alignItems: 'center' }}>
            {content.noAdequatePpe ? (
              <T style={{ fontFamily: fonts.textBold, fontSize: 12, lineHeight: 16, color: INK, textAlign: 'center' }}>
                NO ARC-RATED PPE IS ADEQUATE — DE-ENERGIZE
              </T>
            ) : (
              <>
                <T style={{ fontFamily: fonts.textBold, fontSize: 9, lineHeight: 12, color: INK }}>PPE LEVEL</T>
                <T style={{ fontFamily: fonts.textBold, fontSize: 15, lineHeight: 20, color: INK }}>
                  {content.ppeLevel}
                </T>
              </>
            )}
          </View>
        </View>
      </Row>
      <Row>
        <Cell title="Nominal voltage">
          <Big>{volts(content.nominalVoltageV)}</Big>
        </Cell>
        <Cell title="Glove class" flex={0.7}>
          <Big>{content.gloveClass?.replace(/^Class /, '') ?? '—'}</Big>
        </Cell>
        <Cell title="Restricted approach">
          <Small>{content.restrictedApproach ?? '—'}</Small>
        </Cell>
      </Row>
      <Row>
        <Cell title="Limited approach, movable conductor">
          <Small>{content.limitedApproachMovable ?? '—'}</Small>
        </Cell>
        <Cell title="Limited approach, fixed circuit part">
          <Small>{content.limitedApproachFixed ?? '—'}</Small>
        </Cell>
      </Row>
      <Row>
        <View style={{ flex: 1 }}>
          <Cell title="Equipment">
            <T style={{ fontFamily: fonts.numbersBold, fontSize: 16, lineHeight: 21, color: INK }}>
              {content.equipmentTag}
            </T>
            <T style={{ fontFamily: fonts.textBold, fontSize: 13, lineHeight: 17, color: INK }}>
              {content.equipmentName}
            </T>
            <T style={{ fontSize: 11, lineHeight: 14, color: INK }}>{content.siteName}</T>
          </Cell>
          <Cell title="Cleared by">
            <T style={{ fontSize: 11, lineHeight: 14, color: INK }}>
              {content.clearingDevice ?? 'no device before the duration cap'} — {content.governingCase}
            </T>
          </Cell>
        </View>
        {code ? (
          <View style={{ width: 112, padding: 6, alignItems: 'center', gap: 2 }}>
            <Image
              source={{ uri: `/api/labels/${code}/qr.png` }}
              style={{ width: 96, height: 96 }}
              accessibilityLabel="QR code of the label check address"
            />
            <T style={{ fontFamily: fonts.numbersBold, fontSize: 10, lineHeight: 13, color: INK }}>{group(code)}</T>
          </View>
        ) : null}
      </Row>
      <Row>
        <Cell title="Study date">
          <Small>{content.studyDate}</Small>
        </Cell>
        <Cell title="Review by">
          <Small>{content.reviewByDate}</Small>
        </Cell>
        <Cell title="Revision" flex={0.6}>
          <Small>{content.studyRevision}</Small>
        </Cell>
      </Row>
      <View style={{ borderTopWidth: 1, borderColor: INK, padding: 6, gap: 2 }}>
        <T style={{ fontSize: 10, lineHeight: 13, color: INK }}>Study: {content.studyTitle}</T>
        <T style={{ fontSize: 10, lineHeight: 13, color: INK }}>Approved by {content.approvedBy}</T>
        <T style={{ fontSize: 10, lineHeight: 13, color: INK }}>{content.caution}</T>
      </View>
    </View>
  );
}
