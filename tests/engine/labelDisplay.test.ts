/**
 * What a label prints (shared/labelDisplay.ts) at the edges of its rules, and label codes as people type them.
 *
 * Sources: NFPA 70E (1.2 cal/cm² arc-flash boundary threshold; 5.0 J/cm²); the thermochemical calorie, 4.184 J,
 * and the international inch, 25.4 mm, exact by definition. Rules of thumb, marked where used: hazard values round
 * up at the shown precision (conservative rounding, common practice, no source); above 40 cal/cm² no arc-rated PPE
 * is adequate (common practice, no source); the minimum arc rating is the energy rounded up to a whole cal/cm²
 * (common practice, no source).
 */
import {
  busArcDurationCapS,
  clearedByDisplay,
  clearedByText,
  feetInchesUp,
  formatBoundary,
  formatCalPerCm2,
  formatJPerCm2,
  hazardCaution,
  HAZARD_CAUTION_BELOW_THRESHOLD,
  HAZARD_CAUTION_NO_PPE,
  HAZARD_CAUTION_PPE,
  labelDisplay,
  metresUp,
  minimumArcRatingDisplay,
  noDeviceClearsText,
} from '../../shared/labelDisplay';
import { normalizeLabelCode, parseLabelCode } from '../../shared/labelCode';
import type { LabelContent } from '../../shared/schemas/labels';

const base: LabelContent = {
  signalWord: 'WARNING',
  equipmentTag: 'MCC-2',
  equipmentName: 'Motor control centre 2',
  siteName: 'Larkspur Valley Water Reclamation Facility',
  nominalVoltageV: 480,
  incidentEnergyCalPerCm2: 18.13,
  incidentEnergyJPerCm2: 75.86,
  workingDistanceMm: 457.2,
  arcFlashBoundaryMm: 7800,
  minimumArcRatingCalPerCm2: 19,
  ppeLevel: 'PPE level 3',
  noAdequatePpe: false,
  limitedApproachMovable: '3.0 m (10 ft 0 in)',
  limitedApproachFixed: '1.0 m (3 ft 6 in)',
  restrictedApproach: '0.3 m (1 ft 0 in)',
  gloveClass: 'Class 00',
  clearingDevice: 'CB-MCC2 (MCC 2 feeder breaker)',
  governingCase: 'reduced arcing current',
  studyTitle: 'Plant-wide study',
  studyRevision: 2,
  studyDate: '2026-03-14',
  reviewByDate: '2031-03-14',
  approvedBy: 'Dana Okafor, licence PE-40921 (Oregon)',
  caution: 'Values from an engineering study.',
};

describe('hazard values round up at the shown precision (conservative rounding, common practice, no source)', () => {
  it('incident energy at the 1.2 and 40 cal/cm² edges', () => {
    expect(formatCalPerCm2(1.19)).toBe('1.19'); // two decimals below 1.2, so the threshold reads
    expect(formatCalPerCm2(1.199)).toBe('1.2'); // rounds up to 1.20 — no longer below 1.2, printed as such
    expect(formatCalPerCm2(1.2)).toBe('1.2');
    expect(formatCalPerCm2(1.21)).toBe('1.3');
    expect(formatCalPerCm2(39.99)).toBe('40.0');
    expect(formatCalPerCm2(40.0)).toBe('40.0');
    expect(formatCalPerCm2(40.01)).toBe('40.1');
    expect(formatCalPerCm2(18.13)).toBe('18.2');
    expect(formatJPerCm2(1.2 * 4.184)).toBe('5.1'); // 5.0208 J/cm² rounds up
    expect(formatJPerCm2(75.86)).toBe('75.9');
  });

  it('minimum arc rating: not required below 1.2, whole cal/cm² rounded up, none adequate above 40', () => {
    expect(minimumArcRatingDisplay(1.19)).toEqual({ value: 'Not required by the energy', unit: '' });
    expect(minimumArcRatingDisplay(0.5).value).not.toMatch(/\d/); // never a rounded "1 cal/cm²"
    expect(minimumArcRatingDisplay(1.199)).toEqual({ value: '2', unit: 'cal/cm²' }); // printed 1.2 → 2
    expect(minimumArcRatingDisplay(1.2)).toEqual({ value: '2', unit: 'cal/cm²' });
    expect(minimumArcRatingDisplay(1.21)).toEqual({ value: '2', unit: 'cal/cm²' });
    expect(minimumArcRatingDisplay(39.99)).toEqual({ value: '40', unit: 'cal/cm²' });
    expect(minimumArcRatingDisplay(40.0)).toEqual({ value: '40', unit: 'cal/cm²' });
    expect(minimumArcRatingDisplay(40.01)).toEqual({ value: 'No arc-rated PPE is adequate', unit: '' });
    expect(minimumArcRatingDisplay(18.13)).toEqual({ value: '19', unit: 'cal/cm²' });
  });

  it('boundary: metres up to the centimetre, feet and inches up to the inch, at the inch edges', () => {
    expect(feetInchesUp(12 * 25.4)).toBe('1 ft 0 in'); // exactly 12 in
    expect(feetInchesUp(12 * 25.4 + 0.01)).toBe('1 ft 1 in'); // a hair over → next inch
    expect(feetInchesUp(12 * 25.4 - 0.01)).toBe('1 ft 0 in');
    expect(feetInchesUp(7800)).toBe('25 ft 8 in'); // 307.09 in → 308 in
    expect(feetInchesUp(11 * 25.4 + 0.5)).toBe('1 ft 0 in'); // 11.02 in → 12 in = 1 ft 0 in, never "0 ft 12 in"
    expect(metresUp(7800)).toBe('7.80');
    expect(metresUp(7801)).toBe('7.81');
    expect(formatBoundary(7800)).toBe('7.80 m (25 ft 8 in)');
    expect(formatBoundary(7800, 'us-first')).toBe('25 ft 8 in (7.80 m)');
  });
});

describe('the label display', () => {
  it('gives value and unit per field, in the organization unit order', () => {
    const d = labelDisplay(base);
    expect(d.incidentEnergy).toEqual({ value: '18.2', unit: 'cal/cm²', secondary: '75.9 J/cm²' });
    expect(d.arcFlashBoundary).toEqual({ value: '7.80', unit: 'm', secondary: '25 ft 8 in' });
    expect(d.workingDistance).toEqual({ value: '457', unit: 'mm', secondary: '18 in' });
    // Shock approach boundaries as the table gives them.
    expect(d.limitedApproachFixed).toEqual({ value: '1.0', unit: 'm', secondary: '3 ft 6 in' });
    const us = labelDisplay({ ...base, unitOrder: 'us-first' });
    expect(us.arcFlashBoundary).toEqual({ value: '25 ft 8 in', unit: '', secondary: '7.80 m' });
    expect(us.limitedApproachFixed).toEqual({ value: '3 ft 6 in', unit: '', secondary: '1.0 m' });
    expect(us.workingDistance).toEqual({ value: '18', unit: 'in', secondary: '457 mm' });
  });

  it('one caution per case, never "do not work energized" beside the PPE to wear', () => {
    expect(hazardCaution(base)).toBe(HAZARD_CAUTION_PPE);
    expect(hazardCaution({ ...base, incidentEnergyCalPerCm2: 41, noAdequatePpe: true, ppeLevel: null })).toBe(
      HAZARD_CAUTION_NO_PPE,
    );
    expect(hazardCaution({ ...base, incidentEnergyCalPerCm2: 0.8, ppeLevel: 'PPE level 1' })).toBe(
      HAZARD_CAUTION_BELOW_THRESHOLD,
    );
    const danger = labelDisplay({ ...base, incidentEnergyCalPerCm2: 40.01, noAdequatePpe: true, ppeLevel: null });
    // Above 40 cal/cm² the label says DANGER even if the stored word (an organization threshold above 40) did not.
    expect(danger.signalWord.value).toBe('DANGER');
    expect(labelDisplay({ ...base, incidentEnergyCalPerCm2: 40.0 }).signalWord.value).toBe('WARNING');
    expect(danger.minimumArcRating.value).toBe('No arc-rated PPE is adequate');
    expect(danger.ppeLevel.value).toBe('NO ARC-RATED PPE IS ADEQUATE — DE-ENERGIZE');
  });

  it('"Cleared by": the device, the devices cutting off other sources, or that none clears before the cap', () => {
    expect(clearedByText(clearedByDisplay(base))).toBe('CB-MCC2 (MCC 2 feeder breaker) — reduced arcing current');
    expect(
      clearedByText(
        clearedByDisplay({
          ...base,
          clearingDevice: 'CB-MAIN (Main)',
          otherSourcesClearedBy: ['CB-GEN (Generator breaker)'],
        }),
      ),
    ).toBe('CB-MAIN (Main) — reduced arcing current; other sources cut off by CB-GEN (Generator breaker)');
    const none = clearedByDisplay({ ...base, clearingDevice: null, arcDurationCapS: 2 });
    expect(none.value).toBe('No device clears within 2 s — arc duration limited to 2 s');
    expect(clearedByText(none)).not.toMatch(/Cleared by No device/);
  });

  it('says which limit ended the arc: the bus cap in seconds, no limit at all, or the study limit on old labels', () => {
    // The product's wording (no source): the number is the cap recorded at the bus, never another bus's or a guess.
    expect(noDeviceClearsText(5)).toBe('No device clears within 5 s — arc duration limited to 5 s');
    expect(noDeviceClearsText(null)).not.toMatch(/limited to/);
    expect(noDeviceClearsText(undefined)).toMatch(/study's arc-duration limit/);
    expect(noDeviceClearsText(undefined)).not.toMatch(/limited to it$/);
  });

  it('the cap a bus result names: the one the run recorded at the bus (its own, or none), else the study cap', () => {
    expect(busArcDurationCapS({ arcDurationCap: { capS: 0.5 } }, 2000)).toBe(0.5);
    expect(busArcDurationCapS({ arcDurationCap: { capS: null } }, 2000)).toBeNull();
    expect(busArcDurationCapS({}, 2000)).toBe(2);
    expect(
      clearedByText(clearedByDisplay({ ...base, clearingDevice: null, governingCase: '', arcDurationCapS: 0.5 })),
    ).toBe('No device clears within 0.5 s — arc duration limited to 0.5 s');
  });
});

describe('label codes as printed', () => {
  const code = '7K3M9QXW2R4TBH6N';
  it('accepts spaces, dashes, lower case and the misread letters O, I, L', () => {
    expect(parseLabelCode('7K3M 9QXW 2R4T BH6N')).toBe(code);
    expect(parseLabelCode(' 7k3m-9qxw-2r4t-bh6n ')).toBe(code);
    expect(parseLabelCode('https://emberline.example/l/7K3M9QXW2R4TBH6N')).toBe(code);
    expect(parseLabelCode('https://emberline.example/l/7K3M%209QXW%202R4T%20BH6N?x=1')).toBe(code);
    expect(normalizeLabelCode('O1IL')).toBe('0111');
    expect(parseLabelCode('7K3M 9QXW 2R4T BH6O')).toBe('7K3M9QXW2R4TBH60');
    expect(parseLabelCode('7K3M 9QXW 2R4T BH6')).toBeNull(); // too short
    expect(parseLabelCode('7K3M 9QXW 2R4T BH6U')).toBeNull(); // U is not in the alphabet
  });
});
