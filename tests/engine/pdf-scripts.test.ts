/**
 * Non-Latin text on labels: accents and Greek print with the shipped fonts (Inter has Greek; where the mono face
 * has no glyph the text face of the same weight is used) instead of "?".
 */
import type { LabelContent } from '../../shared/schemas/labels';
import { renderLabels } from '../../server/pdf/labels';
import { readPdf } from '../helpers/pdfText';

const content: LabelContent = {
  signalWord: 'WARNING',
  equipmentTag: 'ΠΙΝ-Ω1',
  equipmentName: 'Πίνακας διανομής — Tableau général',
  siteName: 'Station d’épuration de Ærøskøbing',
  nominalVoltageV: 480,
  incidentEnergyCalPerCm2: 6.2,
  incidentEnergyJPerCm2: 25.95,
  workingDistanceMm: 457.2,
  arcFlashBoundaryMm: 1500,
  minimumArcRatingCalPerCm2: 7,
  ppeLevel: 'PPE level 2',
  noAdequatePpe: false,
  limitedApproachMovable: '3.0 m (10 ft 0 in)',
  limitedApproachFixed: '1.0 m (3 ft 6 in)',
  restrictedApproach: '0.3 m (1 ft 0 in)',
  gloveClass: 'Class 00',
  clearingDevice: 'Q-Δ1 (Διακόπτης)',
  governingCase: 'full arcing current',
  studyTitle: 'Μελέτη ενέργειας τόξου',
  studyRevision: 1,
  studyDate: '2026-03-14',
  reviewByDate: '2031-03-14',
  approvedBy: 'Zoë Ångström, licence PE-1 (Oregon)',
  caution: 'Values from an engineering study.',
};

it.each(['4x6', '4x4', 'letter'] as const)('prints Greek and accented names on a %s label', async (size) => {
  const bytes = await renderLabels([{ content, checkUrl: 'https://emberline.example/l/7K3M9QXW2R4TBH6N' }], size);
  const text = readPdf(bytes).text;
  for (const s of ['ΠΙΝ-Ω1', 'Πίνακας διανομής', 'Ærøskøbing', 'Q-Δ1 (Διακόπτης)', 'Zoë Ångström'])
    expect(text).toContain(s);
  expect(text).not.toContain('?');
});
