/**
 * Label values (docs/ARCHITECTURE.md, Label values) from an incident-energy result, the nominal voltage and the
 * organization's settings: minimum arc rating of clothing, site-specific PPE level, NFPA 70E shock approach boundaries,
 * voltage-rated glove class, signal word and the "no adequate PPE" flag. Facts and their sources:
 * server/engine/data/label-facts.json.
 */
import { CAUTIONS, NO_ADEQUATE_PPE_CAL_PER_CM2, NO_ADEQUATE_PPE_CAUTION } from '../../shared/cautions';
import facts from './data/label-facts.json';
import { EngineError } from './errors';
import { DEFAULT_PPE_LEVELS, type PpeLevel } from '../../shared/schemas/organization';
import type { IncidentEnergyResult } from './ieee1584/compute';

export type { PpeLevel } from '../../shared/schemas/organization';
export { DEFAULT_PPE_LEVELS } from '../../shared/schemas/organization';

export type SignalWord = 'DANGER' | 'WARNING';

/**
 * Signal-word rule of the organization: DANGER above `dangerAboveCalPerCm2` (and, if set, above
 * `dangerAboveVoltageV`), otherwise WARNING. The default (DANGER above 40 cal/cm²) is common practice, no source.
 */
export interface SignalWordRule {
  dangerAboveCalPerCm2: number;
  dangerAboveVoltageV?: number;
}

export const DEFAULT_SIGNAL_WORD_RULE: SignalWordRule = {
  dangerAboveCalPerCm2: facts.signalWords.defaultDangerAboveCalPerCm2,
};

export interface LabelSettings {
  ppeLevels?: readonly PpeLevel[];
  signalWordRule?: SignalWordRule;
}

export interface ApproachDistance {
  /** Metric value as printed, m; absent where the table gives text only ("Not specified", "Avoid contact"). */
  m?: number;
  /** Imperial value as printed, e.g. "3 ft 6 in". */
  ftIn?: string;
  /** The imperial value in mm (what the label uses when it shows feet and inches). */
  imperialMm?: number;
  text: string;
}

export interface ShockApproachBoundaries {
  /** The NFPA 70E table row, e.g. "151 V-750 V". */
  range: string;
  limitedApproachMovable: ApproachDistance;
  limitedApproachFixed: ApproachDistance;
  restrictedApproach: ApproachDistance;
  source: string;
  status: string;
}

export interface GloveClass {
  class: string;
  maxUseVoltageAcV: number;
  source: string;
  status: string;
}

export interface LabelValues {
  nominalVoltageV: number;
  incidentEnergyCalPerCm2: number;
  incidentEnergyJPerCm2: number;
  workingDistanceMm: number;
  arcFlashBoundaryMm: number;
  governingCase: IncidentEnergyResult['governingCase'];
  /** Incident energy rounded up to the next whole cal/cm² (common practice, no source). */
  minimumArcRatingCalPerCm2: number;
  minimumArcRatingBasis: string;
  /** True below 1.2 cal/cm² (5.0 J/cm²), the arc-flash boundary threshold. */
  belowArcFlashThreshold: boolean;
  /** The organization's level for this energy; null when the energy is above every level. */
  ppeLevel: PpeLevel | null;
  ppeLevelBasis: string;
  shockApproach: ShockApproachBoundaries | null;
  gloveClass: GloveClass | null;
  signalWord: SignalWord;
  /** ANSI Z535.4 safety colour of the signal-word panel. */
  signalColor: string;
  signalWordBasis: string;
  /** Above 40 cal/cm²: no arc-rated PPE is adequate (common practice, no source). */
  noAdequatePpe: boolean;
  cautions: string[];
}

/** Tolerance for floating noise when rounding up (an energy of 4.000000000001 cal/cm² stays 4). */
const ROUNDING_SLACK = 1e-9;

function requirePositive(value: number, field: string): number {
  if (!Number.isFinite(value) || value <= 0) {
    throw new EngineError('invalid-input', 'INVALID_INPUT', `${field} must be a positive, finite number.`, field);
  }
  return value;
}

/**
 * Minimum arc rating of clothing, cal/cm²: the incident energy at the working distance rounded up to the next whole
 * cal/cm² (common practice, no source).
 */
export function minimumArcRatingCalPerCm2(incidentEnergyCalPerCm2: number): number {
  requirePositive(incidentEnergyCalPerCm2, 'incidentEnergyCalPerCm2');
  // At least 1 cal/cm² (guards the slack against vanishingly small energies).
  return Math.max(1, Math.ceil(incidentEnergyCalPerCm2 - ROUNDING_SLACK));
}

/** Checks a PPE-level table and returns it sorted by its upper limit. */
export function normalizePpeLevels(levels: readonly PpeLevel[]): PpeLevel[] {
  if (levels.length === 0) {
    throw new EngineError('invalid-input', 'INVALID_INPUT', 'The PPE level table is empty.', 'ppeLevels');
  }
  levels.forEach((level, i) => {
    requirePositive(level.maxCalPerCm2, `ppeLevels[${i}].maxCalPerCm2`);
    if (level.name.trim() === '') {
      throw new EngineError('invalid-input', 'INVALID_INPUT', 'Every PPE level needs a name.', `ppeLevels[${i}].name`);
    }
  });
  return [...levels].sort((a, b) => a.maxCalPerCm2 - b.maxCalPerCm2);
}

/**
 * The organization's site-specific PPE level for an incident energy: the lowest level whose upper limit is at or
 * above the energy; null when the energy is above every level (common practice, no source).
 */
export function sitePpeLevel(
  incidentEnergyCalPerCm2: number,
  levels: readonly PpeLevel[] = DEFAULT_PPE_LEVELS,
): PpeLevel | null {
  return normalizePpeLevels(levels).find((level) => incidentEnergyCalPerCm2 <= level.maxCalPerCm2) ?? null;
}

type FactDistance = { m?: number; ftIn?: string; imperialMm?: number; text: string };

function approach(d: FactDistance): ApproachDistance {
  return d.m !== undefined ? { m: d.m, ftIn: d.ftIn, imperialMm: d.imperialMm, text: d.text } : { text: d.text };
}

/**
 * Shock approach boundaries by nominal voltage (phase to phase), NFPA 70E Table 130.4(E)(a), AC systems: limited
 * approach (exposed movable conductor, exposed fixed circuit part) and restricted approach. A voltage between two
 * table rows takes the higher row. Null above the table (800 kV). Row status in label-facts.json.
 */
export function shockApproachBoundaries(nominalVoltageV: number): ShockApproachBoundaries | null {
  requirePositive(nominalVoltageV, 'nominalVoltageV');
  const table = facts.shockApproachBoundaries;
  const row = table.rows.find((r) => nominalVoltageV <= r.maxV);
  if (!row) return null;
  return {
    range: row.range,
    limitedApproachMovable: approach(row.limitedApproachMovable),
    limitedApproachFixed: approach(row.limitedApproachFixed),
    restrictedApproach: approach(row.restrictedApproach),
    source: table._source,
    status: row.status,
  };
}

/**
 * Voltage-rated glove class for a nominal voltage (phase to phase, AC): the lowest ASTM D120 class whose maximum use
 * voltage is at or above it (from memory, unverified). Null above class 4 (36 kV).
 */
export function gloveClass(nominalVoltageV: number): GloveClass | null {
  requirePositive(nominalVoltageV, 'nominalVoltageV');
  const table = facts.gloveClasses;
  const row = table.rows.find((r) => nominalVoltageV <= r.maxUseVoltageAcV);
  if (!row) return null;
  return { class: row.class, maxUseVoltageAcV: row.maxUseVoltageAcV, source: table._source, status: table._status };
}

/**
 * Signal word by the organization's rule: DANGER above the rule's energy (or voltage, if set), otherwise WARNING;
 * always DANGER above 40 cal/cm², where no arc-rated PPE is adequate, even under a higher organization threshold.
 * Default rule: DANGER above 40 cal/cm² (common practice, no source). Colours per ANSI Z535.4.
 */
export function signalWord(
  incidentEnergyCalPerCm2: number,
  nominalVoltageV: number,
  rule: SignalWordRule = DEFAULT_SIGNAL_WORD_RULE,
): SignalWord {
  requirePositive(rule.dangerAboveCalPerCm2, 'signalWordRule.dangerAboveCalPerCm2');
  // Above 40 cal/cm² no arc-rated PPE is adequate: DANGER whatever the organization's threshold (the higher hazard).
  if (incidentEnergyCalPerCm2 > NO_ADEQUATE_PPE_CAL_PER_CM2) return 'DANGER';
  if (incidentEnergyCalPerCm2 > rule.dangerAboveCalPerCm2) return 'DANGER';
  if (rule.dangerAboveVoltageV !== undefined && nominalVoltageV > rule.dangerAboveVoltageV) return 'DANGER';
  return 'WARNING';
}

/** True above 40 cal/cm²: no arc-rated PPE is adequate; energized work should not be done (common practice, no source). */
export function noAdequatePpe(incidentEnergyCalPerCm2: number): boolean {
  return incidentEnergyCalPerCm2 > NO_ADEQUATE_PPE_CAL_PER_CM2;
}

/** All label values of one equipment (docs/ARCHITECTURE.md, Label values). */
export function computeLabelValues(
  result: Pick<
    IncidentEnergyResult,
    'incidentEnergyCalPerCm2' | 'incidentEnergyJPerCm2' | 'arcFlashBoundaryMm' | 'workingDistanceMm' | 'governingCase'
  >,
  nominalVoltageV: number,
  settings: LabelSettings = {},
): LabelValues {
  requirePositive(nominalVoltageV, 'nominalVoltageV');
  const energy = requirePositive(result.incidentEnergyCalPerCm2, 'incidentEnergyCalPerCm2');
  const rule = settings.signalWordRule ?? DEFAULT_SIGNAL_WORD_RULE;
  const word = signalWord(energy, nominalVoltageV, rule);
  const flagged = noAdequatePpe(energy);
  const ruleText =
    `DANGER above ${rule.dangerAboveCalPerCm2} cal/cm²` +
    (rule.dangerAboveVoltageV !== undefined ? ` or above ${rule.dangerAboveVoltageV} V` : '') +
    ', otherwise WARNING';
  return {
    nominalVoltageV,
    incidentEnergyCalPerCm2: energy,
    incidentEnergyJPerCm2: result.incidentEnergyJPerCm2,
    workingDistanceMm: result.workingDistanceMm,
    arcFlashBoundaryMm: result.arcFlashBoundaryMm,
    governingCase: result.governingCase,
    minimumArcRatingCalPerCm2: minimumArcRatingCalPerCm2(energy),
    minimumArcRatingBasis: facts.arcRating.minimumArcRatingRounding,
    belowArcFlashThreshold: energy < facts.arcRating.arcFlashBoundaryCalPerCm2,
    ppeLevel: sitePpeLevel(energy, settings.ppeLevels ?? DEFAULT_PPE_LEVELS),
    ppeLevelBasis: settings.ppeLevels
      ? "The organization's site-specific PPE levels."
      : 'Default levels at the NFPA 70E Table 130.7(C)(15)(c) arc-rating steps of 4, 8, 25 and 40 cal/cm² (common practice, no source).',
    shockApproach: shockApproachBoundaries(nominalVoltageV),
    gloveClass: gloveClass(nominalVoltageV),
    signalWord: word,
    signalColor: facts.signalWords[word].color,
    signalWordBasis: `${ruleText} (organization rule; ANSI Z535.4 signal words; the 40 cal/cm² default is common practice, no source).`,
    noAdequatePpe: flagged,
    cautions: [...CAUTIONS, ...(flagged ? [NO_ADEQUATE_PPE_CAUTION] : [])],
  };
}
