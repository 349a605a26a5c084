/**
 * What a label says, as printed: the exact value and unit strings of every field, in one place for the PDF label,
 * the on-screen label, the public check page, the results table and the study report.
 *
 * Rounding rules of the trade, all here:
 * - hazard values (incident energy, arc-flash boundary, minimum arc rating) are rounded UP at the shown precision,
 *   so a printed hazard is never below the computed one (conservative rounding, common practice, no source);
 * - shock approach boundaries are printed as the NFPA 70E table gives them (both systems as in the table);
 * - thresholds that change what the label says (1.2 cal/cm² arc-rated clothing, 40 cal/cm² no adequate PPE) are
 *   judged so that the label never contradicts itself: the arc-rating threshold on the value as printed (a printed
 *   "1.20" is not below 1.2), the 40 cal/cm² rule on the computed value (either way, the higher hazard wins).
 */
import { NO_ADEQUATE_PPE_CAL_PER_CM2 } from './cautions';
import { formatSig } from './numberFormat';
import type { LabelContent, LabelStatus } from './schemas/labels';

export type UnitOrder = 'us-first' | 'si-first';
export const UNIT_ORDERS: readonly UnitOrder[] = ['us-first', 'si-first'];
export const DEFAULT_UNIT_ORDER: UnitOrder = 'si-first';

/** One printed field: the value string, its unit string, and the line under it (the other unit system, a note). */
export interface DisplayValue {
  value: string;
  unit: string;
  secondary?: string;
}

/** Below this incident energy arc-rated clothing is not required by the energy (NFPA 70E: 1.2 cal/cm², 5.0 J/cm²). */
export const ARC_RATED_CLOTHING_THRESHOLD_CAL_PER_CM2 = 1.2;

const MM_PER_IN = 25.4;
const SLACK = 1e-9;

// ---------------------------------------------------------------------------------------------
// Rounding

/** Rounds up to `decimals` places (guarding against float noise such as 4.2000000001). */
export function ceilTo(value: number, decimals: number): number {
  const f = 10 ** decimals;
  return Math.ceil(value * f - SLACK) / f;
}

/** Decimals shown for an incident energy in cal/cm²: two below 1.2 (so the 1.2 threshold reads), one from there. */
export function calPerCm2Decimals(value: number): number {
  return value < ARC_RATED_CLOTHING_THRESHOLD_CAL_PER_CM2 ? 2 : 1;
}

/** Incident energy in cal/cm², rounded up at the shown precision: "18.2", "1.19", "0.46". */
export function formatCalPerCm2(value: number): string {
  if (!Number.isFinite(value)) return '—';
  const up = ceilTo(value, calPerCm2Decimals(value));
  // Rounding 1.199 up gives 1.20: print it at the precision of its new range.
  return up.toFixed(calPerCm2Decimals(up));
}

/** Incident energy in J/cm², one decimal, rounded up: "75.9". */
export function formatJPerCm2(value: number): string {
  if (!Number.isFinite(value)) return '—';
  return ceilTo(value, 1).toFixed(1);
}

/** Feet and inches of a hazard distance, inches rounded up: "25 ft 8 in"; "11 in" below a foot. */
export function feetInchesUp(mm: number): string {
  if (!Number.isFinite(mm)) return '—';
  const totalIn = Math.max(0, Math.ceil(mm / MM_PER_IN - SLACK));
  const ft = Math.floor(totalIn / 12);
  const inches = totalIn - ft * 12;
  return ft === 0 ? `${inches} in` : `${ft} ft ${inches} in`;
}

/** Metres of a hazard distance, rounded up to the centimetre: "7.83". */
export function metresUp(mm: number): string {
  if (!Number.isFinite(mm)) return '—';
  return ceilTo(mm / 1000, 2).toFixed(2);
}

/** A hazard distance with its unit, metres rounded up: "7.83 m". */
export function formatMetresUp(mm: number): string {
  return Number.isFinite(mm) ? `${metresUp(mm)} m` : '—';
}

/** A hazard distance in both systems, each rounded up, in the organization's order: "7.83 m (25 ft 8 in)". */
export function formatBoundary(mm: number, order: UnitOrder = DEFAULT_UNIT_ORDER): string {
  if (!Number.isFinite(mm)) return '—';
  return order === 'us-first'
    ? `${feetInchesUp(mm)} (${formatMetresUp(mm)})`
    : `${formatMetresUp(mm)} (${feetInchesUp(mm)})`;
}

/** The working distance as entered, to the millimetre and the inch (not a hazard value): "610 mm (24 in)". */
export function formatWorkingDistance(mm: number, order: UnitOrder = DEFAULT_UNIT_ORDER): string {
  const d = workingDistanceDisplay(mm, order);
  return `${d.value} ${d.unit} (${d.secondary})`;
}

function workingDistanceDisplay(mm: number, order: UnitOrder): DisplayValue {
  const metric = { value: String(Math.round(mm)), unit: 'mm' };
  const imperial = { value: String(Math.round(mm / MM_PER_IN)), unit: 'in' };
  const [a, b] = order === 'us-first' ? [imperial, metric] : [metric, imperial];
  return { ...a, secondary: `${b.value} ${b.unit}` };
}

/** Nominal voltage: "480 V", "4.16 kV", "12.47 kV". */
export function formatVoltage(volts: number): string {
  const d = voltageDisplay(volts);
  return d.unit ? `${d.value} ${d.unit}` : d.value;
}

function voltageDisplay(volts: number): DisplayValue {
  if (!Number.isFinite(volts)) return { value: '—', unit: '' };
  if (volts < 1000) return { value: String(Math.round(volts)), unit: 'V' };
  return { value: Number((volts / 1000).toFixed(3)).toString(), unit: 'kV' };
}

/**
 * Minimum arc rating of clothing as printed: the printed incident energy rounded up to the next whole cal/cm²
 * (common practice, no source). Above 40 cal/cm² no arc-rated PPE is adequate and no number is printed; below
 * 1.2 cal/cm² (as printed) arc-rated clothing is not required by the energy.
 */
export function minimumArcRatingDisplay(incidentEnergyCalPerCm2: number): DisplayValue {
  if (incidentEnergyCalPerCm2 > NO_ADEQUATE_PPE_CAL_PER_CM2) return { value: 'No arc-rated PPE is adequate', unit: '' };
  if (belowArcRatedClothingThreshold(incidentEnergyCalPerCm2)) return { value: 'Not required by the energy', unit: '' };
  const shown = Number(formatCalPerCm2(incidentEnergyCalPerCm2));
  return { value: String(Math.ceil(shown - SLACK)), unit: 'cal/cm²' };
}

/** True when the energy as printed is below 1.2 cal/cm². */
export function belowArcRatedClothingThreshold(incidentEnergyCalPerCm2: number): boolean {
  return Number(formatCalPerCm2(incidentEnergyCalPerCm2)) < ARC_RATED_CLOTHING_THRESHOLD_CAL_PER_CM2;
}

/** "Text" or "value unit". */
export function displayText(d: DisplayValue): string {
  return d.unit ? `${d.value} ${d.unit}` : d.value;
}

// ---------------------------------------------------------------------------------------------
// Cautions: one text per signal word and status

export const HAZARD_STATEMENT = 'ARC FLASH AND SHOCK HAZARD';
export const HAZARD_CAUTION_PPE = 'Qualified persons only. Use the protection below inside the arc-flash boundary.';
export const HAZARD_CAUTION_NO_PPE =
  'Qualified persons only. Do not work on this equipment while it is energized: no arc-rated PPE is adequate.';
export const HAZARD_CAUTION_NO_LEVEL =
  'Qualified persons only. Do not work on this equipment while it is energized: no PPE level of the organization covers this energy.';
export const HAZARD_CAUTION_BELOW_THRESHOLD =
  'Qualified persons only. Arc-rated clothing is not required by the incident energy; use the shock protection below.';
export const NO_ADEQUATE_PPE_TEXT = 'NO ARC-RATED PPE IS ADEQUATE — DE-ENERGIZE';
export const NO_PPE_LEVEL_TEXT = 'NO PPE LEVEL COVERS THIS ENERGY — DE-ENERGIZE';

/** The line under the hazard statement, by what the label says (the signal word follows the same values). */
export function hazardCaution(c: Pick<LabelContent, 'incidentEnergyCalPerCm2' | 'noAdequatePpe' | 'ppeLevel'>): string {
  if (c.incidentEnergyCalPerCm2 > NO_ADEQUATE_PPE_CAL_PER_CM2) return HAZARD_CAUTION_NO_PPE;
  if (c.noAdequatePpe || c.ppeLevel === null) return HAZARD_CAUTION_NO_LEVEL;
  if (belowArcRatedClothingThreshold(c.incidentEnergyCalPerCm2)) return HAZARD_CAUTION_BELOW_THRESHOLD;
  return HAZARD_CAUTION_PPE;
}

/** What the public check page says about a label's status. Labels come from approved studies only. */
export const LABEL_STATUS_NOTICES: Record<LabelStatus, string> = {
  current: 'This label is current.',
  superseded:
    'This label was replaced by a later approved study: its values are no longer valid. The current values of this equipment are shown below; replace the label.',
  'past-review': 'This label is past its review date: the study must be reviewed before relying on it.',
};

// ---------------------------------------------------------------------------------------------
// Cleared by

/** When no device clears before the arc-duration cap: "No device clears within 2 s — arc duration limited to 2 s". */
export function noDeviceClearsText(capS: number | null | undefined): string {
  // null: the bus has no cap (such a bus gets an error, not a label, when nothing clears); undefined: a label issued
  // before the cap was recorded on it.
  if (capS === null) return 'No device clears the arc, and no arc-duration limit applies';
  if (capS === undefined || !Number.isFinite(capS))
    return "No device clears within the study's arc-duration limit — arc duration limited to that limit";
  const cap = `${formatSig(capS, 3)} s`;
  return `No device clears within ${cap} — arc duration limited to ${cap}`;
}

/** "Cleared by" of a label, the same words everywhere. */
export function clearedByDisplay(
  c: Pick<LabelContent, 'clearingDevice' | 'governingCase'> & {
    otherSourcesClearedBy?: string[] | null;
    arcDurationCapS?: number | null;
  },
): DisplayValue {
  const others = (c.otherSourcesClearedBy ?? []).filter((d) => d && d !== c.clearingDevice);
  const notes = [c.governingCase, ...(others.length ? [`other sources cut off by ${others.join(', ')}`] : [])];
  if (c.clearingDevice) return { value: c.clearingDevice, unit: '', secondary: notes.join('; ') };
  return { value: noDeviceClearsText(c.arcDurationCapS), unit: '', secondary: notes.join('; ') };
}

/** The caption over the clearing line: "Cleared by" only when a device clears (never "Cleared by No device…"). */
export function clearedByCaption(c: Pick<LabelContent, 'clearingDevice'>): string {
  return c.clearingDevice ? 'Cleared by' : 'Arc clearing';
}

/** The clearing line with its caption in running text: "Cleared by CB-2 (Main) — …" or "No device clears …". */
export function clearedByLine(c: Pick<LabelContent, 'clearingDevice'>, d: DisplayValue): string {
  return c.clearingDevice ? `Cleared by ${clearedByText(d)}` : clearedByText(d);
}

/** The clearing line as one text: "CB-2 (Main) — full arcing current". */
export function clearedByText(d: DisplayValue): string {
  return d.secondary ? `${d.value} — ${d.secondary}` : d.value;
}

/**
 * The arc-duration cap that applied at a bus, s: the one its result records (the study's or the bus's own; null
 * where the bus has none), else — results from before the record — the study's.
 */
export function busArcDurationCapS(
  b: { arcDurationCap?: { capS: number | null } | null },
  studyMaxArcDurationMs: number,
): number | null {
  return b.arcDurationCap ? b.arcDurationCap.capS : studyMaxArcDurationMs / 1000;
}

// ---------------------------------------------------------------------------------------------
// Whole label

export const LABEL_DISPLAY_FIELDS = [
  'signalWord',
  'hazardStatement',
  'hazardCaution',
  'incidentEnergy',
  'workingDistance',
  'arcFlashBoundary',
  'minimumArcRating',
  'ppeLevel',
  'nominalVoltage',
  'gloveClass',
  'restrictedApproach',
  'limitedApproachMovable',
  'limitedApproachFixed',
  'equipmentTag',
  'equipmentName',
  'siteName',
  'clearedBy',
  'studyTitle',
  'studyDate',
  'reviewByDate',
  'studyRevision',
  'approvedBy',
  'caution',
] as const;
export type LabelDisplayField = (typeof LABEL_DISPLAY_FIELDS)[number];
export type LabelDisplay = Record<LabelDisplayField, DisplayValue>;

const text = (value: string | null | undefined): DisplayValue => ({
  value: value === null || value === undefined || value.trim() === '' ? '—' : value,
  unit: '',
});

/** A table distance "1.0 m (3 ft 6 in)" in the organization's order; text-only rows ("Avoid contact") as they are. */
export function approachDisplay(tableText: string | null, order: UnitOrder = DEFAULT_UNIT_ORDER): DisplayValue {
  if (tableText === null || tableText.trim() === '') return text(null);
  const m = /^([\d.]+)\s*m\s*\((.*)\)\s*$/.exec(tableText.trim());
  if (!m) return text(tableText);
  return order === 'us-first'
    ? { value: m[2], unit: '', secondary: `${m[1]} m` }
    : { value: m[1], unit: 'm', secondary: m[2] };
}

/** The organization's PPE level as printed (with its description under it), or why there is none. */
export function ppeLevelDisplay(
  c: Pick<LabelContent, 'incidentEnergyCalPerCm2' | 'ppeLevel' | 'noAdequatePpe'> & {
    ppeDescription?: string | null;
  },
): DisplayValue {
  if (c.incidentEnergyCalPerCm2 > NO_ADEQUATE_PPE_CAL_PER_CM2) return { value: NO_ADEQUATE_PPE_TEXT, unit: '' };
  if (c.noAdequatePpe || c.ppeLevel === null) return { value: NO_PPE_LEVEL_TEXT, unit: '' };
  return {
    value: c.ppeLevel,
    unit: '',
    ...(c.ppeDescription && c.ppeDescription.trim() !== '' ? { secondary: c.ppeDescription } : {}),
  };
}

/** Every printed field of a label, exactly as printed. */
export function labelDisplay(c: LabelContent): LabelDisplay {
  const order: UnitOrder = c.unitOrder ?? DEFAULT_UNIT_ORDER;
  const boundaryMm = c.arcFlashBoundaryMm;
  const boundary: DisplayValue =
    order === 'us-first'
      ? { value: feetInchesUp(boundaryMm), unit: '', secondary: formatMetresUp(boundaryMm) }
      : { value: metresUp(boundaryMm), unit: 'm', secondary: feetInchesUp(boundaryMm) };
  return {
    // Above 40 cal/cm² a label is DANGER whatever was stored (no arc-rated PPE is adequate; the higher hazard wins).
    signalWord: text(c.incidentEnergyCalPerCm2 > NO_ADEQUATE_PPE_CAL_PER_CM2 ? 'DANGER' : c.signalWord),
    hazardStatement: text(HAZARD_STATEMENT),
    hazardCaution: text(hazardCaution(c)),
    incidentEnergy: {
      value: formatCalPerCm2(c.incidentEnergyCalPerCm2),
      unit: 'cal/cm²',
      secondary: `${formatJPerCm2(c.incidentEnergyJPerCm2)} J/cm²`,
    },
    workingDistance: workingDistanceDisplay(c.workingDistanceMm, order),
    arcFlashBoundary: boundary,
    minimumArcRating: minimumArcRatingDisplay(c.incidentEnergyCalPerCm2),
    ppeLevel: ppeLevelDisplay(c),
    nominalVoltage: voltageDisplay(c.nominalVoltageV),
    gloveClass: text(c.gloveClass === null ? null : c.gloveClass.replace(/^class\s+/i, '')),
    restrictedApproach: approachDisplay(c.restrictedApproach, order),
    limitedApproachMovable: approachDisplay(c.limitedApproachMovable, order),
    limitedApproachFixed: approachDisplay(c.limitedApproachFixed, order),
    equipmentTag: text(c.equipmentTag),
    equipmentName: text(c.equipmentName),
    siteName: text(c.siteName),
    clearedBy: clearedByDisplay(c),
    studyTitle: text(c.studyTitle),
    studyDate: text(c.studyDate),
    reviewByDate: text(c.reviewByDate),
    studyRevision: text(String(c.studyRevision)),
    approvedBy: text(c.approvedBy),
    caution: text(c.caution),
  };
}
