/**
 * How a source's contribution to the fault changes during the arc: the synchronous generator's decrement
 * (subtransient → transient → sustained) and the decay of an induction motor's contribution. Pure functions of
 * time; every current is a ratio to the contribution at t = 0 (the first-cycle current of the short-circuit solution).
 */
import type { GeneratorSource } from '../../../shared/schemas/model';
import type { EngineWarning } from '../errors';
import typical from '../data/generator-typical.json';

/** A contribution over time: ratio(t) = I(t) / I(0); `scaleS(t)` is the fastest time constant still acting at t. */
export interface ContributionProfile {
  /** I(t) / I(0), the limit from the left at a step (a contribution ending at `endS` still counts at `endS`). */
  ratioAt(tS: number): number;
  /** Time over which the ratio changes noticeably from t on, s; Infinity once it is (practically) constant. */
  scaleS(tS: number): number;
  /** Time after which the contribution is taken as zero, s (Infinity: it lasts). */
  endS: number;
}

export const CONSTANT_PROFILE: ContributionProfile = { ratioAt: () => 1, scaleS: () => Infinity, endS: Infinity };

/** A term counts as decayed after this many of its time constants (e^-5 ≈ 0.7 %). */
export const TIME_CONSTANTS_TO_SETTLE = 5;

export interface GeneratorDecrementInput {
  /** X"d, per unit on the machine rating. */
  subtransientPu: number;
  /** X'd, per unit on the machine rating. */
  transientPu: number;
  /** Xd, per unit on the machine rating (or 1 / the sustained-current multiple with excitation support). */
  synchronousPu: number;
  /** T"d, short-circuit subtransient time constant, s. */
  subtransientTimeConstantS: number;
  /** T'd, short-circuit transient time constant, s. */
  transientTimeConstantS: number;
  /** Reactance between the machine terminals and the fault, per unit on the machine rating (0 at the terminals). */
  externalPu: number;
}

/**
 * Synchronous generator short-circuit current envelope: the classic three-stage decrement of the symmetrical
 * current after a three-phase fault (the form used for generator decrement in IEEE Std 551 and measured by the
 * sudden short-circuit test of IEEE Std 115; written here from memory):
 *
 *   i(t) = E [ (1/X"−1/X') e^(−t/T") + (1/X'−1/X) e^(−t/T') + 1/X ]
 *
 * with X" = X"d + Xe, X' = X'd + Xe, X = Xd + Xe for a fault behind an external reactance Xe, and the time constants
 * referred the same way: T' = T'd · (X'd+Xe)/(X'd) · Xd/(Xd+Xe), T" = T"d · (X"d+Xe)/(X"d) · X'd/(X'd+Xe)
 * (T'd = T'd0·X'd/Xd and T"d = T"d0·X"d/X'd at the terminals). Returns the ratio i(t)/i(0).
 */
export function generatorDecrementProfile(input: GeneratorDecrementInput): ContributionProfile {
  const xe = Math.max(0, input.externalPu);
  const x2 = input.subtransientPu + xe;
  const x1 = input.transientPu + xe;
  const x0 = input.synchronousPu + xe;
  const t2 = ((input.subtransientTimeConstantS * x2) / input.subtransientPu) * (input.transientPu / x1);
  const t1 = ((input.transientTimeConstantS * x1) / input.transientPu) * (input.synchronousPu / x0);
  const a2 = 1 / x2 - 1 / x1;
  const a1 = 1 / x1 - 1 / x0;
  const a0 = 1 / x0;
  const i0 = a2 + a1 + a0; // = 1 / x2
  return {
    ratioAt: (tS) => (a2 * Math.exp(-tS / t2) + a1 * Math.exp(-tS / t1) + a0) / i0,
    scaleS: (tS) => (tS < TIME_CONSTANTS_TO_SETTLE * t2 ? t2 : tS < TIME_CONSTANTS_TO_SETTLE * t1 ? t1 : Infinity),
    endS: Infinity,
  };
}

/**
 * Induction motor contribution decaying exponentially with the set number of cycles as its time constant:
 * I(t) = I(0) · e^(−t/τ), τ = cycles / f, dropped after 5 τ (below 0.7 %). The same ampere-seconds as feeding
 * the full contribution for τ and stopping (the step model). Common practice, no source.
 */
export function motorExponentialProfile(timeConstantS: number): ContributionProfile {
  const endS = TIME_CONSTANTS_TO_SETTLE * timeConstantS;
  return {
    ratioAt: (tS) => (tS > endS ? 0 : Math.exp(-tS / timeConstantS)),
    scaleS: (tS) => (tS < endS ? timeConstantS : Infinity),
    endS,
  };
}

/** Induction motor contribution fed in full and stopped after `decayS` (the step model). Common practice, no source. */
export function motorStepProfile(decayS: number): ContributionProfile {
  return { ratioAt: (tS) => (tS > decayS ? 0 : 1), scaleS: () => Infinity, endS: decayS };
}

export const TYPICAL_GENERATOR = {
  transientPu: typical.values.transientPu.value,
  synchronousPu: typical.values.synchronousPu.value,
  subtransientTimeConstantS: typical.values.subtransientTimeConstantS.value,
  transientTimeConstantS: typical.values.transientTimeConstantS.value,
  supportedSustainedMultiple: typical.values.supportedSustainedMultiple.value,
} as const;

export interface ResolvedGenerator {
  subtransientPu: number;
  transientPu: number;
  synchronousPu: number;
  subtransientTimeConstantS: number;
  transientTimeConstantS: number;
  /**
   * When neither Xd nor a sustained multiple is given: the equivalent Xd of a machine with excitation support
   * (1 / the typical supported multiple). The study evaluates both sustained currents and keeps the higher energy.
   */
  alternateSynchronousPu: number | null;
  /** Fields taken from the typical values (typical value, from memory). */
  typicalValuesUsed: string[];
  warnings: EngineWarning[];
}

/**
 * The generator's decrement data, with typical values (from memory, `data/generator-typical.json`) where the model
 * gives none: each flagged with a GENERATOR_TYPICAL_VALUE warning. A sustained-current multiple k (excitation
 * support) stands for an equivalent Xd = 1/k.
 */
export function resolveGenerator(g: GeneratorSource): ResolvedGenerator {
  const used: string[] = [];
  const subtransientPu = g.subtransientPct / 100;
  let transientPu: number;
  if (g.transientPct !== undefined) transientPu = g.transientPct / 100;
  else {
    transientPu = Math.max(TYPICAL_GENERATOR.transientPu, subtransientPu);
    used.push('transientPct');
  }
  let synchronousPu: number;
  if (g.sustainedCurrentMultiple !== undefined) synchronousPu = 1 / g.sustainedCurrentMultiple;
  else if (g.synchronousPct !== undefined) synchronousPu = g.synchronousPct / 100;
  else {
    synchronousPu = Math.max(TYPICAL_GENERATOR.synchronousPu, transientPu);
    used.push('synchronousPct');
  }
  const subtransientTimeConstantS = g.subtransientTimeConstantS ?? TYPICAL_GENERATOR.subtransientTimeConstantS;
  if (g.subtransientTimeConstantS === undefined) used.push('subtransientTimeConstantS');
  const transientTimeConstantS = g.transientTimeConstantS ?? TYPICAL_GENERATOR.transientTimeConstantS;
  if (g.transientTimeConstantS === undefined) used.push('transientTimeConstantS');
  const names: Record<string, string> = {
    transientPct: `X'd = ${transientPu * 100} %`,
    synchronousPct: `Xd = ${synchronousPu * 100} %`,
    subtransientTimeConstantS: `T"d = ${subtransientTimeConstantS} s`,
    transientTimeConstantS: `T'd = ${transientTimeConstantS} s`,
  };
  const alternateSynchronousPu = used.includes('synchronousPct')
    ? Math.max(1 / TYPICAL_GENERATOR.supportedSustainedMultiple, transientPu)
    : null;
  if (alternateSynchronousPu !== null)
    names.synchronousPct = `Xd = ${synchronousPu * 100} % and, as a second case, a sustained current of ${TYPICAL_GENERATOR.supportedSustainedMultiple} × rated (excitation support), the higher energy kept`;
  const warnings: EngineWarning[] = used.length
    ? [
        {
          code: 'GENERATOR_TYPICAL_VALUE',
          message: `Generator ${g.id}: no ${used.join(', ')} given; its decrement uses ${used.map((u) => names[u]).join(', ')} (typical value, from memory). Enter the machine's data.`,
        },
      ]
    : [];
  return {
    subtransientPu,
    transientPu,
    synchronousPu,
    subtransientTimeConstantS,
    transientTimeConstantS,
    alternateSynchronousPu,
    typicalValuesUsed: used.map((u) => `${g.id}.${u}`),
    warnings,
  };
}
