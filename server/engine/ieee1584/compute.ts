/**
 * The IEEE Std 1584-2018 calculation in its published order: arcing currents (Eqs. 1, 16-18, 25), variation factor
 * and reduced arcing current (Eq. 2), enclosure correction (Eqs. 11-15), incident energy and arc-flash boundary for
 * the full and the reduced arcing current, each with its own arc duration (Eqs. 3-10, 19-24). The larger energy
 * governs. Range checks are never silent: an input outside the model gives a warning, or an error where the model
 * cannot be applied at all.
 */
import { ELECTRODE_CONFIGS, type ElectrodeConfig, type EnclosureSizeMm } from '../../../shared/equipmentClasses';
import { formatSig } from '../../../shared/numberFormat';
import { EngineError, type EngineWarning } from '../errors';
import { lowVoltageArcFlashBoundaryMm, intermediateArcFlashBoundaryMm } from './arcFlashBoundary';
import { intermediateArcingCurrentKa, lowVoltageArcingCurrentKa } from './arcingCurrent';
import { CONSTANTS, RANGE_OF_MODEL, TABLE6 } from './coefficients';
import { enclosureCorrectionFactor, isOpenAir } from './enclosure';
import type { EnergyTermsInput } from './energyTerms';
import { intermediateIncidentEnergyJPerCm2, lowVoltageIncidentEnergyJPerCm2 } from './incidentEnergy';
import { interpolateByVoltage } from './interpolation';
import { arcingCurrentVariationFactor, reducedArcingCurrentKa } from './variationFactor';

export type ArcCase = 'full' | 'reduced';
export type VoltageRegime = 'low-voltage' | 'medium-voltage';

/** Values at the three model voltages 600, 2700 and 14300 V (the last two only above 600 V). */
export interface LevelValues {
  at600V: number;
  at2700V?: number;
  at14300V?: number;
}

export interface ArcingCurrentInput {
  voltageV: number;
  boltedFaultKa: number;
  electrodeConfig: ElectrodeConfig;
  gapMm: number;
}

export interface ArcingCurrents {
  voltageV: number;
  voltageRegime: VoltageRegime;
  electrodeConfig: ElectrodeConfig;
  boltedFaultKa: number;
  gapMm: number;
  /** Final arcing currents: full (Eq. 25 or Eqs. 16-18) and reduced (Eq. 2), kA. */
  arcingCurrentKa: { full: number; reduced: number };
  /** Arcing current variation correction factor, Eq. (2). */
  varCf: number;
  /** Intermediate arcing currents of Eq. (1), full and (above 600 V) reduced by Eq. (2), kA. */
  intermediateArcingCurrentKa: { full: LevelValues; reduced: LevelValues };
  warnings: EngineWarning[];
}

export interface CaseResult {
  arcingCurrentKa: number;
  /** Arc duration used, ms (after the cap). */
  arcDurationMs: number;
  /** Arc duration asked for (clearing time), ms. */
  requestedArcDurationMs: number;
  arcDurationCapped: boolean;
  incidentEnergyJPerCm2: number;
  incidentEnergyCalPerCm2: number;
  arcFlashBoundaryMm: number;
  /** Intermediate E (Eqs. 3-5) and AFB (Eqs. 7-9) above 600 V, before interpolation (Eqs. 19-24). */
  intermediate?: { incidentEnergyJPerCm2: Required<LevelValues>; arcFlashBoundaryMm: Required<LevelValues> };
}

export interface EnclosureTrace {
  enclosureType: 'typical' | 'shallow' | 'open-air';
  /** Enclosure used, mm (the default 508 mm box where none was given for VCB, VCBB, HCB; null in open air). */
  enclosureMm: EnclosureSizeMm | null;
  enclosureDefaulted: boolean;
  height1In?: number;
  width1In?: number;
  equivalentEnclosureSizeIn?: number;
}

export interface IncidentEnergyResult {
  method: 'IEEE 1584-2018';
  voltageV: number;
  voltageRegime: VoltageRegime;
  electrodeConfig: ElectrodeConfig;
  boltedFaultKa: number;
  gapMm: number;
  workingDistanceMm: number;
  maxArcDurationMs: number;
  arcingCurrentKa: { full: number; reduced: number };
  varCf: number;
  enclosureCorrectionFactor: number;
  enclosure: EnclosureTrace;
  intermediateArcingCurrentKa: { full: LevelValues; reduced: LevelValues };
  cases: { full: CaseResult; reduced: CaseResult };
  governingCase: ArcCase;
  incidentEnergyCalPerCm2: number;
  incidentEnergyJPerCm2: number;
  arcFlashBoundaryMm: number;
  warnings: EngineWarning[];
}

export interface IncidentEnergyInput extends ArcingCurrentInput {
  workingDistanceMm: number;
  enclosureMm?: EnclosureSizeMm;
  /** One arc duration for both cases, ms. Give this or `clearingMs`, not both. */
  arcDurationMs?: number;
  /** Clearing times read at the full and at the reduced arcing current, ms. */
  clearingMs?: { full: number; reduced: number };
  /** Cap of the arc duration, ms (default 2000: the IEEE 1584 2 s guidance). */
  maxArcDurationMs?: number;
}

export interface EnergyGeometry {
  workingDistanceMm: number;
  enclosureMm?: EnclosureSizeMm;
}

/** The 20 in (508 mm) reference box of Table 6/7, used when no enclosure is given for VCB, VCBB or HCB. */
export const DEFAULT_ENCLOSURE_MM: EnclosureSizeMm = { height: 508, width: 508, depth: 508 };
export const DEFAULT_MAX_ARC_DURATION_MS: number = RANGE_OF_MODEL.arcDurationGuidance.defaultMaxMs;

const MODEL = 'IEEE 1584-2018';

const fmt = (value: number) => formatSig(value, 4);

function requirePositive(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new EngineError('invalid-input', 'INVALID_INPUT', `${field} must be a positive, finite number.`, field);
  }
  return value;
}

function requireConfig(value: unknown): ElectrodeConfig {
  if (typeof value !== 'string' || !(ELECTRODE_CONFIGS as readonly string[]).includes(value)) {
    throw new EngineError(
      'invalid-input',
      'INVALID_INPUT',
      `electrodeConfig must be one of ${ELECTRODE_CONFIGS.join(', ')}.`,
      'electrodeConfig',
    );
  }
  return value as ElectrodeConfig;
}

/** Voltage within 208 V-15 kV, or an 'out-of-range' EngineError: the model does not apply outside it. */
function checkVoltage(voltageV: number): void {
  const { min, max } = RANGE_OF_MODEL.voltageV;
  if (voltageV < min || voltageV > max) {
    throw new EngineError(
      'out-of-range',
      'VOLTAGE_OUT_OF_RANGE',
      `The ${MODEL} model does not apply at ${fmt(voltageV)} V: its range is ${min} V to ${max} V (three-phase).`,
      'voltageV',
    );
  }
}

function regimeOf(voltageV: number): VoltageRegime {
  return voltageV <= RANGE_OF_MODEL.lowVoltageMaxV ? 'low-voltage' : 'medium-voltage';
}

function rangeWarnings(input: ArcingCurrentInput, regime: VoltageRegime): EngineWarning[] {
  const warnings: EngineWarning[] = [];
  const key = regime === 'low-voltage' ? 'lowVoltage' : 'mediumVoltage';
  const span = regime === 'low-voltage' ? '208-600 V' : '601 V-15 kV';
  const ibf = RANGE_OF_MODEL.boltedFaultKa[key];
  if (input.boltedFaultKa < ibf.min || input.boltedFaultKa > ibf.max) {
    warnings.push({
      code: 'BOLTED_CURRENT_OUT_OF_RANGE',
      message:
        `Bolted fault current ${fmt(input.boltedFaultKa)} kA is outside the ${MODEL} model range of ` +
        `${ibf.min}-${ibf.max} kA for ${span}; the result is an extrapolation of the model.`,
    });
  }
  const gap = RANGE_OF_MODEL.gapMm[key];
  if (input.gapMm < gap.min || input.gapMm > gap.max) {
    warnings.push({
      code: 'GAP_OUT_OF_RANGE',
      message:
        `Gap ${fmt(input.gapMm)} mm is outside the ${MODEL} model range of ${gap.min}-${gap.max} mm for ${span}; ` +
        'the result is an extrapolation of the model.',
    });
  }
  const note = RANGE_OF_MODEL.sustainableArcNote;
  if (input.voltageV <= note.maxVoltageV && input.boltedFaultKa < note.maxBoltedFaultKa) {
    warnings.push({ code: 'SUSTAINABLE_ARC_UNLIKELY', message: note.text });
  }
  return warnings;
}

function notApplicable(what: string): EngineError {
  return new EngineError(
    'out-of-range',
    'MODEL_NOT_APPLICABLE',
    `The ${MODEL} model gives no finite, positive ${what} for these inputs; it cannot be applied here.`,
    'boltedFaultKa',
  );
}

function checkFinitePositive(value: number, what: string): number {
  if (!Number.isFinite(value) || value <= 0) throw notApplicable(what);
  return value;
}

/**
 * Full and reduced arcing currents for a voltage, bolted fault current, electrode configuration and gap:
 * IEEE Std 1584-2018 Eq. (1) at 600/2700/14300 V, then Eq. (25) (≤ 600 V) or Eqs. (16)-(18) (> 600 V), and Eq. (2).
 * The study runner reads each clearing time at these currents before the energy is computed.
 * Throws EngineError 'invalid-input' for non-finite or non-positive values, 'out-of-range' outside 208 V-15 kV.
 */
export function computeArcingCurrents(input: ArcingCurrentInput): ArcingCurrents {
  const voltageV = requirePositive(input.voltageV, 'voltageV');
  const boltedFaultKa = requirePositive(input.boltedFaultKa, 'boltedFaultKa');
  const gapMm = requirePositive(input.gapMm, 'gapMm');
  const config = requireConfig(input.electrodeConfig);
  checkVoltage(voltageV);

  const regime = regimeOf(voltageV);
  const voltageKv = voltageV / 1000;
  const warnings = rangeWarnings({ voltageV, boltedFaultKa, gapMm, electrodeConfig: config }, regime);
  const varCf = arcingCurrentVariationFactor(config, voltageKv);
  const reduce = (currentKa: number) => reducedArcingCurrentKa(currentKa, varCf);
  const iarc600 = checkFinitePositive(
    intermediateArcingCurrentKa(config, 600, boltedFaultKa, gapMm),
    'arcing current (Eq. 1)',
  );

  if (regime === 'low-voltage') {
    const full = checkFinitePositive(
      lowVoltageArcingCurrentKa(voltageKv, iarc600, boltedFaultKa),
      'arcing current (Eq. 25)',
    );
    const reduced = checkFinitePositive(reduce(full), 'reduced arcing current (Eq. 2)');
    return {
      voltageV,
      voltageRegime: regime,
      electrodeConfig: config,
      boltedFaultKa,
      gapMm,
      arcingCurrentKa: { full, reduced },
      varCf,
      intermediateArcingCurrentKa: { full: { at600V: iarc600 }, reduced: { at600V: iarc600 } },
      warnings,
    };
  }

  const iarc2700 = checkFinitePositive(
    intermediateArcingCurrentKa(config, 2700, boltedFaultKa, gapMm),
    'arcing current (Eq. 1)',
  );
  const iarc14300 = checkFinitePositive(
    intermediateArcingCurrentKa(config, 14300, boltedFaultKa, gapMm),
    'arcing current (Eq. 1)',
  );
  const fullLevels = { at600V: iarc600, at2700V: iarc2700, at14300V: iarc14300 };
  const reducedLevels = { at600V: reduce(iarc600), at2700V: reduce(iarc2700), at14300V: reduce(iarc14300) };
  const interpolate = (l: Required<LevelValues>) =>
    interpolateByVoltage(l.at600V, l.at2700V, l.at14300V, voltageKv).value;
  return {
    voltageV,
    voltageRegime: regime,
    electrodeConfig: config,
    boltedFaultKa,
    gapMm,
    arcingCurrentKa: {
      full: checkFinitePositive(interpolate(fullLevels), 'arcing current (Eqs. 16-18)'),
      reduced: checkFinitePositive(interpolate(reducedLevels), 'reduced arcing current (Eqs. 2, 16-18)'),
    },
    varCf,
    intermediateArcingCurrentKa: { full: fullLevels, reduced: reducedLevels },
    warnings,
  };
}

/**
 * Enclosure correction for the configuration (Eqs. 11-15), with its warnings: the default 508 mm box where none is
 * given for VCB, VCBB or HCB; height or width above 1244.6 mm limited; width not above 4 × gap.
 */
export function resolveEnclosure(
  arcing: Pick<ArcingCurrents, 'electrodeConfig' | 'voltageV' | 'gapMm'>,
  enclosureMm: EnclosureSizeMm | undefined,
): { enclosureCorrectionFactor: number; enclosure: EnclosureTrace; warnings: EngineWarning[] } {
  const config = arcing.electrodeConfig;
  const warnings: EngineWarning[] = [];
  if (enclosureMm) {
    requirePositive(enclosureMm.height, 'enclosureMm.height');
    requirePositive(enclosureMm.width, 'enclosureMm.width');
    requirePositive(enclosureMm.depth, 'enclosureMm.depth');
  }
  if (isOpenAir(config)) {
    return {
      enclosureCorrectionFactor: 1,
      enclosure: { enclosureType: 'open-air', enclosureMm: null, enclosureDefaulted: false },
      warnings,
    };
  }
  const used = enclosureMm ?? DEFAULT_ENCLOSURE_MM;
  if (!enclosureMm) {
    warnings.push({
      code: 'ENCLOSURE_DEFAULTED',
      message:
        `No enclosure size was given for ${config}; the ${MODEL} reference box of 508 × 508 × 508 mm (20 in) was ` +
        'assumed. Enter the enclosure size for a specific result.',
    });
  }
  const correction = enclosureCorrectionFactor(config, arcing.voltageV / 1000, used);
  const limit = TABLE6.upperMm;
  if (correction.heightLimited || correction.widthLimited) {
    const which = [
      correction.heightLimited ? `height ${fmt(used.height)} mm` : '',
      correction.widthLimited ? `width ${fmt(used.width)} mm` : '',
    ]
      .filter(Boolean)
      .join(' and ');
    warnings.push({
      code: 'ENCLOSURE_LIMITED',
      message: `Enclosure ${which} is above the ${MODEL} model limit of ${limit} mm; the limit was used (Table 6).`,
    });
  }
  const minWidthMm = RANGE_OF_MODEL.enclosure.minWidthGapMultiple * arcing.gapMm;
  if (used.width <= minWidthMm) {
    warnings.push({
      code: 'ENCLOSURE_WIDTH_BELOW_MODEL',
      message: `Enclosure width ${fmt(used.width)} mm is not more than 4 × the gap (${fmt(minWidthMm)} mm), below the ${MODEL} model range.`,
    });
  }
  return {
    enclosureCorrectionFactor: checkFinitePositive(
      correction.enclosureCorrectionFactor,
      'enclosure correction factor (Eqs. 14, 15)',
    ),
    enclosure: {
      enclosureType: correction.enclosureType,
      enclosureMm: { ...used },
      enclosureDefaulted: !enclosureMm,
      height1In: correction.height1In,
      width1In: correction.width1In,
      equivalentEnclosureSizeIn: correction.equivalentEnclosureSizeIn,
    },
    warnings,
  };
}

/**
 * Incident energy (J/cm²) at a distance and arc-flash boundary (mm) for one case (full or reduced arcing current)
 * and one arc duration: Eqs. (6), (10) at or below 600 V; Eqs. (3)-(5), (7)-(9) interpolated by Eqs. (19)-(24) above.
 * No cap, no range checks: the building block of computeEnergyForDurations (and of time-stepped sums, where the
 * energy of each interval is added: E is proportional to T for a given current).
 */
export function computeCaseEnergy(
  arcing: ArcingCurrents,
  arcCase: ArcCase,
  enclosureCorrectionFactorValue: number,
  durationMs: number,
  workingDistanceMm: number,
): { incidentEnergyJPerCm2: number; arcFlashBoundaryMm: number; intermediate?: CaseResult['intermediate'] } {
  // Written out rather than spread from a common part: a spread followed by more keys makes a slow object.
  const termsOf = (iarcK3Ka: number, iarcK13Ka: number): EnergyTermsInput => ({
    config: arcing.electrodeConfig,
    gapMm: arcing.gapMm,
    boltedFaultKa: arcing.boltedFaultKa,
    enclosureCorrectionFactor: enclosureCorrectionFactorValue,
    durationMs,
    iarcK3Ka,
    iarcK13Ka,
  });
  const levels = arcing.intermediateArcingCurrentKa[arcCase];
  if (arcing.voltageRegime === 'low-voltage') {
    const terms = termsOf(levels.at600V, arcing.arcingCurrentKa[arcCase]);
    return {
      incidentEnergyJPerCm2: lowVoltageIncidentEnergyJPerCm2(terms, workingDistanceMm),
      arcFlashBoundaryMm: lowVoltageArcFlashBoundaryMm(terms),
    };
  }
  const voltageKv = arcing.voltageV / 1000;
  const at = (levelV: 600 | 2700 | 14300, currentKa: number | undefined) => {
    const iarc = currentKa ?? Number.NaN;
    const terms = termsOf(iarc, iarc);
    return {
      e: intermediateIncidentEnergyJPerCm2(levelV, terms, workingDistanceMm),
      afb: intermediateArcFlashBoundaryMm(levelV, terms),
    };
  };
  const l600 = at(600, levels.at600V);
  const l2700 = at(2700, levels.at2700V);
  const l14300 = at(14300, levels.at14300V);
  return {
    incidentEnergyJPerCm2: interpolateByVoltage(l600.e, l2700.e, l14300.e, voltageKv).value,
    arcFlashBoundaryMm: interpolateByVoltage(l600.afb, l2700.afb, l14300.afb, voltageKv).value,
    intermediate: {
      incidentEnergyJPerCm2: { at600V: l600.e, at2700V: l2700.e, at14300V: l14300.e },
      arcFlashBoundaryMm: { at600V: l600.afb, at2700V: l2700.afb, at14300V: l14300.afb },
    },
  };
}

/**
 * Incident energy and arc-flash boundary for given arc durations of the full and the reduced case (clearing times
 * read at each arcing current), capped at `maxArcDurationMs` (default 2000 ms, the IEEE 1584 2 s guidance) with a
 * warning. The larger energy governs (IEEE Std 1584-2018: report the larger E and its AFB).
 */
export function computeEnergyForDurations(
  arcing: ArcingCurrents,
  geometry: EnergyGeometry,
  durationsMs: { full: number; reduced: number },
  maxArcDurationMs: number = DEFAULT_MAX_ARC_DURATION_MS,
): IncidentEnergyResult {
  const workingDistanceMm = requirePositive(geometry.workingDistanceMm, 'workingDistanceMm');
  const cap = requirePositive(maxArcDurationMs, 'maxArcDurationMs');
  requirePositive(durationsMs.full, 'clearingMs.full');
  requirePositive(durationsMs.reduced, 'clearingMs.reduced');

  const warnings: EngineWarning[] = [...arcing.warnings];
  if (workingDistanceMm < RANGE_OF_MODEL.workingDistanceMinMm) {
    warnings.push({
      code: 'WORKING_DISTANCE_BELOW_MODEL',
      message:
        `Working distance ${fmt(workingDistanceMm)} mm is below the ${MODEL} model range (at least ` +
        `${RANGE_OF_MODEL.workingDistanceMinMm} mm); the result is an extrapolation of the model.`,
    });
  }
  const enclosure = resolveEnclosure(arcing, geometry.enclosureMm);
  warnings.push(...enclosure.warnings);
  const cf = enclosure.enclosureCorrectionFactor;

  const cappedCases: ArcCase[] = [];
  const evaluate = (arcCase: ArcCase): CaseResult => {
    const requested = durationsMs[arcCase];
    const capped = requested > cap;
    if (capped) cappedCases.push(arcCase);
    const durationMs = capped ? cap : requested;
    const energy = computeCaseEnergy(arcing, arcCase, cf, durationMs, workingDistanceMm);
    const e = checkFinitePositive(energy.incidentEnergyJPerCm2, 'incident energy');
    const afb = checkFinitePositive(energy.arcFlashBoundaryMm, 'arc-flash boundary');
    return {
      arcingCurrentKa: arcing.arcingCurrentKa[arcCase],
      arcDurationMs: durationMs,
      requestedArcDurationMs: requested,
      arcDurationCapped: capped,
      incidentEnergyJPerCm2: e,
      incidentEnergyCalPerCm2: e / CONSTANTS.calToJ,
      arcFlashBoundaryMm: afb,
      ...(energy.intermediate ? { intermediate: energy.intermediate } : {}),
    };
  };
  const full = evaluate('full');
  const reduced = evaluate('reduced');
  if (cappedCases.length > 0) {
    warnings.push({
      code: 'ARC_DURATION_CAPPED',
      message:
        `Arc duration of the ${cappedCases.join(' and ')} arcing-current case capped at ${fmt(cap)} ms: ` +
        `${RANGE_OF_MODEL.arcDurationGuidance.text}`,
    });
  }
  const governingCase: ArcCase = reduced.incidentEnergyJPerCm2 > full.incidentEnergyJPerCm2 ? 'reduced' : 'full';
  const governing = governingCase === 'full' ? full : reduced;
  return {
    method: MODEL,
    voltageV: arcing.voltageV,
    voltageRegime: arcing.voltageRegime,
    electrodeConfig: arcing.electrodeConfig,
    boltedFaultKa: arcing.boltedFaultKa,
    gapMm: arcing.gapMm,
    workingDistanceMm,
    maxArcDurationMs: cap,
    arcingCurrentKa: { ...arcing.arcingCurrentKa },
    varCf: arcing.varCf,
    enclosureCorrectionFactor: cf,
    enclosure: enclosure.enclosure,
    intermediateArcingCurrentKa: arcing.intermediateArcingCurrentKa,
    cases: { full, reduced },
    governingCase,
    incidentEnergyCalPerCm2: governing.incidentEnergyCalPerCm2,
    incidentEnergyJPerCm2: governing.incidentEnergyJPerCm2,
    arcFlashBoundaryMm: governing.arcFlashBoundaryMm,
    warnings,
  };
}

/**
 * Incident energy of one equipment by IEEE Std 1584-2018 (the shape of `POST /api/calc/incident-energy`).
 * Give either one `arcDurationMs` for both cases or `clearingMs: {full, reduced}`.
 */
export function computeIncidentEnergy(input: IncidentEnergyInput): IncidentEnergyResult {
  const hasSingle = input.arcDurationMs !== undefined;
  const hasPair = input.clearingMs !== undefined;
  if (hasSingle === hasPair) {
    throw new EngineError(
      'invalid-input',
      'INVALID_INPUT',
      'Give exactly one of arcDurationMs (one duration for both cases) or clearingMs {full, reduced}.',
      hasSingle ? 'clearingMs' : 'arcDurationMs',
    );
  }
  let durations: { full: number; reduced: number };
  if (input.clearingMs !== undefined) {
    durations = {
      full: requirePositive(input.clearingMs.full, 'clearingMs.full'),
      reduced: requirePositive(input.clearingMs.reduced, 'clearingMs.reduced'),
    };
  } else {
    const single = requirePositive(input.arcDurationMs, 'arcDurationMs');
    durations = { full: single, reduced: single };
  }
  requirePositive(input.workingDistanceMm, 'workingDistanceMm');
  const cap =
    input.maxArcDurationMs === undefined
      ? DEFAULT_MAX_ARC_DURATION_MS
      : requirePositive(input.maxArcDurationMs, 'maxArcDurationMs');
  const arcing = computeArcingCurrents(input);
  return computeEnergyForDurations(
    arcing,
    { workingDistanceMm: input.workingDistanceMm, enclosureMm: input.enclosureMm },
    durations,
    cap,
  );
}
