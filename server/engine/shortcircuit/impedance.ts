/**
 * Impedances of the network elements for a three-phase (positive-sequence) short-circuit study, in per unit
 * on a common base (system MVA, and each bus's nominal kV as its voltage base), or in ohms where noted.
 * One function per formula; the formula and its source are in each doc comment.
 *
 * Sources named here:
 * - per-unit practice of IEEE Std 141 (Red Book) as summarized in engineering guides: Zbase = kV²/MVA,
 *   Ibase = MVA/(√3·kV), change of base, utility Zpu = MVAbase/MVAsc, R and X split by X/R;
 * - transformer short circuit on an infinite bus I = I_FLA × 100/%Z and I_FLA = kVA·1000/(√3·V)
 *   (point-to-point method of short-circuit calculation, published reprint);
 * - cable R and X: NEC (NFPA 70) Chapter 9 Table 9;
 * - induction motor X" = 16.7 % and the first-cycle multipliers 1.2 X" (> 50 hp) and 1.67 X" (< 50 hp) on
 *   low-voltage systems: IEEE Std 551-2006 Table 9-1.
 */
import { EngineError } from '../errors';
import { Complex, complex } from './complex';
import { ConductorMaterial, ConduitKind, necTable9ImpedanceOhmPer1000Ft, TABLE9_FREQUENCY_HZ } from './necTable9';

const SQRT3 = Math.sqrt(3);
const FEET_PER_METRE = 1 / 0.3048;

function requirePositive(value: number, field: string): void {
  if (!(Number.isFinite(value) && value > 0)) {
    throw new EngineError(
      'invalid-input',
      'non-physical-value',
      `${field} must be a positive finite number (got ${value})`,
      field,
    );
  }
}

// ---------------------------------------------------------------------------------------------
// Bases

/** Base impedance: Zbase [Ω] = kVbase² / MVAbase (IEEE 141 per-unit practice). */
export function baseImpedanceOhm(baseKv: number, baseMva: number): number {
  return (baseKv * baseKv) / baseMva;
}

/** Base current: Ibase [A] = MVAbase·1000 / (√3·kVbase) (IEEE 141 per-unit practice). */
export function baseCurrentA(baseKv: number, baseMva: number): number {
  return (baseMva * 1000) / (SQRT3 * baseKv);
}

/** Ohms to per unit: Zpu = Z[Ω] / Zbase (IEEE 141 per-unit practice). */
export function ohmsToPu(impedanceOhm: Complex, baseKv: number, baseMva: number): Complex {
  const zBase = baseImpedanceOhm(baseKv, baseMva);
  return complex(impedanceOhm.re / zBase, impedanceOhm.im / zBase);
}

/**
 * Change of base: Zpu,new = Zpu,old · (MVAnew / MVAold) · (kVold / kVnew)² (IEEE 141 per-unit practice).
 * Used for ratings on the equipment's own kVA and kV.
 */
export function changeOfBaseFactor(oldMva: number, newMva: number, oldKv: number, newKv: number): number {
  return (newMva / oldMva) * (oldKv / newKv) ** 2;
}

/**
 * Splits an impedance magnitude by its X/R ratio: R = |Z| / √(1 + (X/R)²), X = R · (X/R)
 * (IEEE 141 per-unit practice).
 */
export function splitImpedanceByXr(impedanceMagnitude: number, xr: number): Complex {
  const r = impedanceMagnitude / Math.sqrt(1 + xr * xr);
  return complex(r, r * xr);
}

// ---------------------------------------------------------------------------------------------
// Sources

/** Three-phase short-circuit MVA from kA: MVAsc = √3 · kV · kA. */
export function shortCircuitMvaFromKa(voltageKv: number, currentKa: number): number {
  return SQRT3 * voltageKv * currentKa;
}

/**
 * Utility source: |Zpu| = MVAbase / MVAsc, split by X/R (IEEE 141 per-unit practice).
 * The short-circuit MVA is taken at the bus's nominal voltage, which is the voltage base.
 */
export function utilityImpedancePu(shortCircuitMva: number, xr: number, baseMva: number): Complex {
  requirePositive(shortCircuitMva, 'shortCircuitMva');
  requirePositive(xr, 'xr');
  return splitImpedanceByXr(baseMva / shortCircuitMva, xr);
}

/**
 * Synchronous generator, subtransient: X = X"d/100 on the machine rating, changed to the system base;
 * R = X / (X/R) (IEEE 141 per-unit practice; X"d is a reactance, so R is added to it).
 */
export function generatorImpedancePu(p: {
  ratingKva: number;
  ratedKv: number;
  subtransientPct: number;
  xr: number;
  baseMva: number;
  baseKv: number;
}): Complex {
  requirePositive(p.ratingKva, 'kva');
  requirePositive(p.subtransientPct, 'subtransientPct');
  requirePositive(p.xr, 'xr');
  const x = (p.subtransientPct / 100) * changeOfBaseFactor(p.ratingKva / 1000, p.baseMva, p.ratedKv, p.baseKv);
  return complex(x / p.xr, x);
}

// ---------------------------------------------------------------------------------------------
// Transformers

/** Three-phase transformer full-load current: I_FLA = kVA·1000 / (√3·V) (point-to-point method). */
export function transformerFullLoadCurrentA(ratingKva: number, voltageKv: number): number {
  return (ratingKva * 1000) / (SQRT3 * voltageKv * 1000);
}

/**
 * Short circuit at the terminals of a transformer fed from an infinite bus: I = I_FLA × 100 / %Z
 * (point-to-point method, "transformer multiplier" 100/%Z).
 */
export function transformerInfiniteBusFaultCurrentA(
  ratingKva: number,
  voltageKv: number,
  impedancePct: number,
): number {
  return transformerFullLoadCurrentA(ratingKva, voltageKv) * (100 / impedancePct);
}

/**
 * Typical transformer X/R by rating, used only when the nameplate X/R is missing (with a warning).
 * from memory, unverified: rough mid-range values for liquid-filled units with a 480 V secondary
 * (common practice, no source); IEEE 141-1993 Annex 4A and IEEE C37.010 Fig. 17 publish such curves.
 */
export const TYPICAL_TRANSFORMER_XR: readonly (readonly [kva: number, xr: number])[] = [
  [75, 2.5],
  [150, 3.5],
  [300, 4.5],
  [500, 5],
  [750, 5.75],
  [1000, 6],
  [1500, 6.5],
  [2000, 7.5],
  [2500, 8],
  [5000, 11.5],
  [10000, 16.5],
];

/** Typical X/R for a transformer rating: linear in log10(kVA) between the rows above, clamped at the ends. */
export function typicalTransformerXr(ratingKva: number): number {
  const rows = TYPICAL_TRANSFORMER_XR;
  if (ratingKva <= rows[0][0]) return rows[0][1];
  if (ratingKva >= rows[rows.length - 1][0]) return rows[rows.length - 1][1];
  for (let i = 1; i < rows.length; i += 1) {
    const [k1, x1] = rows[i];
    if (ratingKva <= k1) {
      const [k0, x0] = rows[i - 1];
      const f = Math.log10(ratingKva / k0) / Math.log10(k1 / k0);
      return x0 + f * (x1 - x0);
    }
  }
  return rows[rows.length - 1][1];
}

/**
 * Transformer series impedance on the system base, referred to the secondary bus:
 * |Zpu| = (%Z/100) · (MVAbase / MVAtx) · (kVrated,secondary / kVbase,secondary)², split by X/R
 * (IEEE 141 per-unit practice: transformer Zpu and change of base).
 */
export function transformerImpedancePu(p: {
  ratingKva: number;
  impedancePct: number;
  xr: number;
  ratedSecondaryKv: number;
  baseSecondaryKv: number;
  baseMva: number;
}): Complex {
  requirePositive(p.ratingKva, 'kva');
  requirePositive(p.impedancePct, 'impedancePct');
  requirePositive(p.xr, 'xr');
  const magnitude =
    (p.impedancePct / 100) * changeOfBaseFactor(p.ratingKva / 1000, p.baseMva, p.ratedSecondaryKv, p.baseSecondaryKv);
  return splitImpedanceByXr(magnitude, p.xr);
}

/**
 * Off-nominal turns ratio of a transformer against its buses' voltage bases:
 * t = (kVrated,primary / kVbase,primary) / (kVrated,secondary / kVbase,secondary); 1 when ratings equal bus voltages.
 * The transformer is an ideal t:1 transformer followed by its series impedance (standard tap model).
 */
export function offNominalRatio(
  ratedPrimaryKv: number,
  basePrimaryKv: number,
  ratedSecondaryKv: number,
  baseSecondaryKv: number,
): number {
  return ratedPrimaryKv / basePrimaryKv / (ratedSecondaryKv / baseSecondaryKv);
}

// ---------------------------------------------------------------------------------------------
// Cables

/**
 * Cable impedance from NEC Chapter 9 Table 9: Z = (R + jX·f/60) · L[ft]/1000 / n, for n identical parallel
 * sets (Table 9 values are per conductor per 1000 ft at 60 Hz; X scales with frequency, X = 2πfL).
 */
export function cableImpedanceFromTableOhm(p: {
  size: string;
  material: ConductorMaterial;
  conduit: ConduitKind;
  lengthM: number;
  sets: number;
  frequencyHz: number;
}): Complex {
  requirePositive(p.lengthM, 'lengthM');
  requirePositive(p.sets, 'sets');
  const { rOhmPer1000Ft, xOhmPer1000Ft } = necTable9ImpedanceOhmPer1000Ft(p.size, p.material, p.conduit);
  const kft = (p.lengthM * FEET_PER_METRE) / 1000;
  const xScale = p.frequencyHz / TABLE9_FREQUENCY_HZ;
  return complex((rOhmPer1000Ft * kft) / p.sets, (xOhmPer1000Ft * xScale * kft) / p.sets);
}

/** Cable impedance from explicit per-length values of one conductor: Z = (r + jx) · L[km] / n. */
export function cableImpedanceFromPerKmOhm(p: {
  rOhmPerKm: number;
  xOhmPerKm: number;
  lengthM: number;
  sets: number;
}): Complex {
  requirePositive(p.rOhmPerKm, 'rOhmPerKm');
  requirePositive(p.xOhmPerKm, 'xOhmPerKm');
  requirePositive(p.lengthM, 'lengthM');
  requirePositive(p.sets, 'sets');
  const km = p.lengthM / 1000;
  return complex((p.rOhmPerKm * km) / p.sets, (p.xOhmPerKm * km) / p.sets);
}

// ---------------------------------------------------------------------------------------------
// Induction motors

/** Induction motor X" when none is given: 16.7 % on the motor kVA, i.e. 6 × rated current (IEEE 551-2006 Table 9-1). */
export const MOTOR_DEFAULT_SUBTRANSIENT_PU = 0.167;

/**
 * Motor kVA from horsepower when only hp is known: 1 kVA per hp (common practice, no source;
 * it amounts to efficiency × power factor ≈ 0.746).
 */
export function motorKvaFromHp(hp: number): number {
  return hp * 1.0;
}

/**
 * Subtransient reactance of an induction motor, per unit on its own kVA: X" = 1 / (locked-rotor multiple), or the
 * given X"%/100, or the IEEE 551-2006 Table 9-1 value 0.167 pu.
 */
export function motorSubtransientPu(p: { lockedRotorMultiple?: number; subtransientPct?: number }): number {
  if (p.subtransientPct !== undefined) return p.subtransientPct / 100;
  if (p.lockedRotorMultiple !== undefined) return 1 / p.lockedRotorMultiple;
  return MOTOR_DEFAULT_SUBTRANSIENT_PU;
}

/**
 * First-cycle multiplier on X" of an induction motor.
 * Low voltage (below 1 kV), IEEE 551-2006 Table 9-1 first-cycle network: 1.2 X" for motors of 50 hp and above,
 * 1.67 X" below 50 hp.
 * Medium voltage (1 kV and above), IEEE C37.010 first-cycle (momentary) network practice: 1.0 X" above 1000 hp and
 * for 3600 rpm motors of 250 hp and above; 1.2 X" for 50–1000 hp; 1.67 X" below 50 hp.
 * `rpm` unknown for a medium-voltage motor of 250–1000 hp: taken as 3600 rpm (1.0, the larger contribution; see
 * `motorRpmAssumed`).
 */
export function motorFirstCycleMultiplier(sizeHp: number, ratedKv: number, rpm?: number): number {
  if (ratedKv < 1) return sizeHp >= 50 ? 1.2 : 1.67;
  if (sizeHp > 1000) return 1.0;
  if (sizeHp >= 250 && (rpm === undefined || rpm >= 3600)) return 1.0;
  return sizeHp >= 50 ? 1.2 : 1.67;
}

/** Whether the multiplier of a medium-voltage motor rests on an assumed 3600 rpm (rpm not given, 250–1000 hp). */
export function motorRpmAssumed(sizeHp: number, ratedKv: number, rpm?: number): boolean {
  return ratedKv >= 1 && rpm === undefined && sizeHp >= 250 && sizeHp <= 1000;
}

/**
 * Typical X/R of an induction motor when none is given (with a warning): 6 below 1 kV, 15 above.
 * from memory, unverified (common practice, no source).
 */
export function typicalMotorXr(ratedKv: number): number {
  return ratedKv >= 1 ? 15 : 6;
}

/**
 * Induction motor contribution as a source behind its first-cycle reactance:
 * X = multiplier · X"pu · (MVAbase / MVAmotor) · (kVmotor / kVbase)², R = X / (X/R)
 * (IEEE 551-2006 Table 9-1 practice with the IEEE 141 change of base).
 */
export function motorImpedancePu(p: {
  ratingKva: number;
  ratedKv: number;
  subtransientPu: number;
  multiplier: number;
  xr: number;
  baseMva: number;
  baseKv: number;
}): Complex {
  requirePositive(p.ratingKva, 'kva');
  requirePositive(p.subtransientPu, 'subtransientPct');
  requirePositive(p.multiplier, 'firstCycleMultiplier');
  requirePositive(p.xr, 'xr');
  const x = p.multiplier * p.subtransientPu * changeOfBaseFactor(p.ratingKva / 1000, p.baseMva, p.ratedKv, p.baseKv);
  return complex(x / p.xr, x);
}
