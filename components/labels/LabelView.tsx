import React from 'react';
import { Image, StyleSheet, View } from 'react-native';
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

function Cell({ title, children, flex = 1 }: { title: string; children: React.ReactNode; flex?: number }) {
  return (
    <View style={[styles.cell, { flex }]}>
      <T style={styles.cellTitle}>{title.toUpperCase()}</T>
      {children}
    </View>
  );
}

const Big = ({ children, size = 16, testID }: { children: React.ReactNode; size?: number; testID?: string }) => (
  <T style={[styles.big, { fontSize: size }]} testID={testID}>
    {children}
  </T>
);
const Small = ({ children, testID }: { children: React.ReactNode; testID?: string }) => (
  <T style={styles.small} testID={testID}>
    {children}
  </T>
);
const Row = ({ children }: { children: React.ReactNode }) => <View style={styles.row}>{children}</View>;

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
    <View testID="label-view" style={[styles.label, { maxWidth: width }]}>
      <View style={[styles.signalPanel, { backgroundColor: panel.background }]}>
        <HazardMark size={34} />
        <T style={[styles.signalWord, { color: panel.text }]} testID="label-signal-word">
          {d.signalWord.value}
        </T>
      </View>
      <View style={styles.hazard}>
        <T style={styles.hazardStatement}>{d.hazardStatement.value}</T>
        <T style={styles.fineCentered} testID="label-hazard-caution">
          {d.hazardCaution.value}
        </T>
      </View>
      <Row>
        <Cell title="Incident energy" flex={1.2}>
          <View style={styles.energyLine}>
            <T testID="label-energy" style={styles.energy}>
              {d.incidentEnergy.value}
            </T>
            <T style={styles.energyUnit} testID="label-energy-unit">
              {d.incidentEnergy.unit}
            </T>
          </View>
          <Small testID="label-energy-secondary">{d.incidentEnergy.secondary}</Small>
          <T style={styles.fine} testID="label-working-distance">
            {`at a working distance of ${displayText(d.workingDistance)} (${d.workingDistance.secondary})`}
          </T>
        </Cell>
        <View style={styles.columnRule} />
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
        <View style={styles.ppeCell}>
          <View style={styles.ppeBox}>
            {refused ? (
              <T style={styles.ppeRefused} testID="label-ppe">
                {d.ppeLevel.value}
              </T>
            ) : (
              <>
                <T style={styles.ppeCaption}>PPE LEVEL</T>
                <T style={styles.ppeLevel} testID="label-ppe">
                  {d.ppeLevel.value}
                </T>
                {d.ppeLevel.secondary ? (
                  <T style={styles.fineCentered} testID="label-ppe-description">
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
        <View style={styles.equipmentColumn}>
          <Cell title="Equipment">
            <T style={styles.equipmentTag}>{d.equipmentTag.value}</T>
            <T style={styles.equipmentName}>{d.equipmentName.value}</T>
            <T style={styles.detail}>{d.siteName.value}</T>
          </Cell>
          <Cell title={clearedByCaption(content)}>
            <T style={styles.detail} testID="label-cleared-by">
              {clearedByText(d.clearedBy)}
            </T>
          </Cell>
        </View>
        {code ? (
          <View style={styles.qrColumn}>
            <Image
              source={{ uri: `${apiBaseUrl()}/api/labels/${code}/qr.png` }}
              style={styles.qrImage}
              accessibilityLabel="QR code of the label check address"
            />
            <T style={styles.qrCode}>{groupLabelCode(code)}</T>
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
      <View style={styles.footer}>
        <T style={styles.fine}>{`Study: ${d.studyTitle.value}`}</T>
        <T style={styles.fine}>{`Approved by ${d.approvedBy.value}`}</T>
        <T style={styles.fine}>{d.caution.value}</T>
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

/**
 * The printed label's own layout (the PDF's proportions, black ink on white), not the app's theme: its spacing and type
 * sizes are the label's and stay numbers here.
 */
const styles = StyleSheet.create({
  cell: { padding: 6, gap: 1 },
  cellTitle: { fontFamily: fonts.textBold, fontSize: 9, lineHeight: 12, color: INK, letterSpacing: 0.4 },
  big: { fontFamily: fonts.numbersBold, color: INK },
  small: { fontFamily: fonts.numbers, fontSize: 11, lineHeight: 14, color: INK },
  row: { flexDirection: 'row', borderTopWidth: 1, borderColor: INK },
  /** The label's frame: a 2 px black rule around the white card. */
  label: { width: '100%', alignSelf: 'center', backgroundColor: '#fff', borderColor: INK, borderWidth: 2 },
  signalPanel: { flexDirection: 'row', alignItems: 'center', justifyContent: 'center', gap: 10, paddingVertical: 8 },
  signalWord: { fontFamily: fonts.textBold, fontSize: 36, lineHeight: 47, letterSpacing: 1 },
  hazard: { alignItems: 'center', paddingVertical: 4, paddingHorizontal: 6 },
  hazardStatement: { fontFamily: fonts.textBold, fontSize: 19, lineHeight: 25, color: INK, textAlign: 'center' },
  fineCentered: { fontSize: 10, lineHeight: 13, color: INK, textAlign: 'center' },
  energyLine: { flexDirection: 'row', alignItems: 'baseline', gap: 4, flexWrap: 'wrap' },
  energy: { fontFamily: fonts.numbersBold, fontSize: 36, lineHeight: 47, color: INK },
  energyUnit: { fontSize: 15, lineHeight: 20, color: INK },
  fine: { fontSize: 10, lineHeight: 13, color: INK },
  columnRule: { width: 1, backgroundColor: INK },
  ppeCell: { flex: 1.2, padding: 6, justifyContent: 'center' },
  ppeBox: { borderColor: INK, borderWidth: 2, padding: 4, alignItems: 'center' },
  ppeRefused: { fontFamily: fonts.textBold, fontSize: 12, lineHeight: 16, color: INK, textAlign: 'center' },
  ppeCaption: { fontFamily: fonts.textBold, fontSize: 9, lineHeight: 12, color: INK },
  ppeLevel: { fontFamily: fonts.textBold, fontSize: 15, lineHeight: 20, color: INK },
  equipmentColumn: { flex: 1 },
  equipmentTag: { fontFamily: fonts.numbersBold, fontSize: 16, lineHeight: 21, color: INK },
  equipmentName: { fontFamily: fonts.textBold, fontSize: 13, lineHeight: 17, color: INK },
  detail: { fontSize: 11, lineHeight: 14, color: INK },
  qrColumn: { width: 128, padding: 6, alignItems: 'center', gap: 2 },
  qrImage: { width: 96, height: 96 },
  qrCode: { fontFamily: fonts.numbersBold, fontSize: 10, lineHeight: 13, color: INK },
  footer: { borderTopWidth: 1, borderColor: INK, padding: 6, gap: 2 },
});
