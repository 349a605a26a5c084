import React from 'react';
import { Image, View } from 'react-native';
import type { LabelContent } from '../../shared/schemas/labels';
import {
  NO_ADEQUATE_PPE_TEXT,
  NO_PPE_LEVEL_TEXT,
  clearedByCaption,
  clearedByText,
  displayText,
  labelDisplay,
  type DisplayValue,
} from '../../shared/labelDisplay';
import { groupLabelCode } from '../../shared/labelCode';
import { HazardMark } from '../Cautions';
import { signalPanelColors } from '../../shared/safetyColors';
import { apiBaseUrl } from '../../hooks/api';
import { fonts } from '../theme';
import { T } from '../ui';

const INK = '#000000';
const RULE = { borderColor: INK, borderWidth: 1 } as const;

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

const Big = ({ children, size = 16, testID }: { children: React.ReactNode; size?: number; testID?: string }) => (
  <T style={{ fontFamily: fonts.numbersBold, fontSize: size, color: INK }} testID={testID}>
    {children}
  </T>
);
const Small = ({ children, testID }: { children: React.ReactNode; testID?: string }) => (
  <T style={{ fontFamily: fonts.numbers, fontSize: 11, lineHeight: 14, color: INK }} testID={testID}>
    {children}
  </T>
);
const Row = ({ children }: { children: React.ReactNode }) => (
  <View style={{ flexDirection: 'row', borderTopWidth: 1, borderColor: INK }}>{children}</View>
);

/**
 * What a printed label says, drawn on screen in the layout of the PDF label (server/pdf/labels.ts): the signal-word
 * panel, the hazard line, energy and boundary, arc rating and PPE, voltage and approach boundaries, the equipment with
 * the QR code, the clearing device, dates and approval. Every string comes from `labelDisplay` (shared/labelDisplay.ts),
 * the one source the PDF and the public check use too; nothing here formats a number.
 */
export function LabelView({ content, code, width = 380 }: { content: LabelContent; code?: string; width?: number }) {
  const d = labelDisplay(content);
  const panel = signalPanelColors(d.signalWord.value as LabelContent['signalWord']);
  const refused =
    content.noAdequatePpe ||
    content.ppeLevel === null ||
    d.ppeLevel.value === NO_ADEQUATE_PPE_TEXT ||
    d.ppeLevel.value === NO_PPE_LEVEL_TEXT;
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
          {d.signalWord.value}
        </T>
      </View>
      <View style={{ alignItems: 'center', paddingVertical: 4, paddingHorizontal: 6 }}>
        <T style={{ fontFamily: fonts.textBold, fontSize: 19, lineHeight: 25, color: INK, textAlign: 'center' }}>
          {d.hazardStatement.value}
        </T>
        <T style={{ fontSize: 10, lineHeight: 13, color: INK, textAlign: 'center' }} testID="label-hazard-caution">
          {d.hazardCaution.value}
        </T>
      </View>
      <Row>
        <Cell title="Incident energy" flex={1.2}>
          <View style={{ flexDirection: 'row', alignItems: 'baseline', gap: 4, flexWrap: 'wrap' }}>
            <T
              testID="label-energy"
              style={{ fontFamily: fonts.numbersBold, fontSize: 36, lineHeight: 47, color: INK }}
            >
              {d.incidentEnergy.value}
            </T>
            <T style={{ fontSize: 15, lineHeight: 20, color: INK }} testID="label-energy-unit">
              {d.incidentEnergy.unit}
            </T>
          </View>
          <Small testID="label-energy-secondary">{d.incidentEnergy.secondary}</Small>
          <T style={{ fontSize: 10, lineHeight: 13, color: INK }} testID="label-working-distance">
            {`at a working distance of ${displayText(d.workingDistance)} (${d.workingDistance.secondary})`}
          </T>
        </Cell>
        <View style={{ width: 1, backgroundColor: INK }} />
        <Cell title="Arc-flash boundary">
          <Big size={22} testID="label-boundary">
            {displayText(d.arcFlashBoundary)}
          </Big>
          <Small testID="label-boundary-secondary">{d.arcFlashBoundary.secondary}</Small>
        </Cell>
      </Row>
      <Row>
        <Cell title="Minimum arc rating">
          <Big testID="label-arc-rating">{displayText(d.minimumArcRating)}</Big>
          {d.minimumArcRating.secondary ? <Small>{d.minimumArcRating.secondary}</Small> : null}
        </Cell>
        <View style={{ flex: 1.2, padding: 6, justifyContent: 'center' }}>
          <View style={{ ...RULE, borderWidth: 2, padding: 4, alignItems: 'center' }}>
            {refused ? (
              <T
                style={{ fontFamily: fonts.textBold, fontSize: 12, lineHeight: 16, color: INK, textAlign: 'center' }}
                testID="label-ppe"
              >
                {d.ppeLevel.value}
              </T>
            ) : (
              <>
                <T style={{ fontFamily: fonts.textBold, fontSize: 9, lineHeight: 12, color: INK }}>PPE LEVEL</T>
                <T style={{ fontFamily: fonts.textBold, fontSize: 15, lineHeight: 20, color: INK }} testID="label-ppe">
                  {d.ppeLevel.value}
                </T>
                {d.ppeLevel.secondary ? (
                  <T
                    style={{ fontSize: 10, lineHeight: 13, color: INK, textAlign: 'center' }}
                    testID="label-ppe-description"
                  >
                    {d.ppeLevel.secondary}
                  </T>
                ) : null}
              </>
            )}
          </View>
        </View>
      </Row>
      <Row>
        <Cell title="Nominal voltage">
          <Big>{displayText(d.nominalVoltage)}</Big>
        </Cell>
        <Cell title="Glove class" flex={0.7}>
          <Big>{displayText(d.gloveClass)}</Big>
        </Cell>
        <Cell title="Restricted approach">
          <Distance d={d.restrictedApproach} />
        </Cell>
      </Row>
      <Row>
        <Cell title="Limited approach, movable conductor">
          <Distance d={d.limitedApproachMovable} />
        </Cell>
        <Cell title="Limited approach, fixed circuit part">
          <Distance d={d.limitedApproachFixed} />
        </Cell>
      </Row>
      <Row>
        <View style={{ flex: 1 }}>
          <Cell title="Equipment">
            <T style={{ fontFamily: fonts.numbersBold, fontSize: 16, lineHeight: 21, color: INK }}>
              {d.equipmentTag.value}
            </T>
            <T style={{ fontFamily: fonts.textBold, fontSize: 13, lineHeight: 17, color: INK }}>
              {d.equipmentName.value}
            </T>
            <T style={{ fontSize: 11, lineHeight: 14, color: INK }}>{d.siteName.value}</T>
          </Cell>
          <Cell title={clearedByCaption(content)}>
            <T style={{ fontSize: 11, lineHeight: 14, color: INK }} testID="label-cleared-by">
              {clearedByText(d.clearedBy)}
            </T>
          </Cell>
        </View>
        {code ? (
          <View style={{ width: 128, padding: 6, alignItems: 'center', gap: 2 }}>
            <Image
              source={{ uri: `${apiBaseUrl()}/api/labels/${code}/qr.png` }}
              style={{ width: 96, height: 96 }}
              accessibilityLabel="QR code of the label check address"
            />
            <T style={{ fontFamily: fonts.numbersBold, fontSize: 10, lineHeight: 13, color: INK }}>
              {groupLabelCode(code)}
            </T>
          </View>
        ) : null}
      </Row>
      <Row>
        <Cell title="Study date">
          <Small>{d.studyDate.value}</Small>
        </Cell>
        <Cell title="Review by">
          <Small>{d.reviewByDate.value}</Small>
        </Cell>
        <Cell title="Revision" flex={0.6}>
          <Small>{d.studyRevision.value}</Small>
        </Cell>
      </Row>
      <View style={{ borderTopWidth: 1, borderColor: INK, padding: 6, gap: 2 }}>
        <T style={{ fontSize: 10, lineHeight: 13, color: INK }}>{`Study: ${d.studyTitle.value}`}</T>
        <T style={{ fontSize: 10, lineHeight: 13, color: INK }}>{`Approved by ${d.approvedBy.value}`}</T>
        <T style={{ fontSize: 10, lineHeight: 13, color: INK }}>{d.caution.value}</T>
      </View>
    </View>
  );
}

/** A printed distance: the first system, and the other under it. */
function Distance({ d }: { d: DisplayValue }) {
  return (
    <>
      <Small>{displayText(d)}</Small>
      {d.secondary ? <Small>{d.secondary}</Small> : null}
    </>
  );
}
