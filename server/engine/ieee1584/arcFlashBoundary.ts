/**
 * Arc-flash boundary, IEEE Std 1584-2018 Eqs. (7)-(10) (Tables 3, 4, 5; from memory, unverified): the distance at
 * which the incident energy is 5.0 J/cm² (1.2 cal/cm²).
 */
import { CONSTANTS, energyRow, type EnergyRow, type ModelLevelV } from './coefficients';
import { exponentWithoutDistance, type EnergyTermsInput } from './energyTerms';

/** AFB = 10^((k1 + … + lg(1/CF) − lg(20/T)) / (−k12)), the common form of Eqs. (7)-(10); mm. */
function boundaryMm(k: EnergyRow, terms: EnergyTermsInput): number {
  const numerator = exponentWithoutDistance(k, terms) - Math.log10(CONSTANTS.afbLogConstant / terms.durationMs);
  return 10 ** (numerator / -k[11]);
}

/**
 * IEEE Std 1584-2018 Eqs. (7), (8), (9): intermediate arc-flash boundary at 600, 2700 or 14300 V (Tables 3, 4, 5):
 *
 *   AFB_Voc = 10^((k1 + k2·lg G + k3·Iarc_Voc/P(Ibf) + k11·lg Ibf + k13·lg Iarc_Voc + lg(1/CF) − lg(20/T)) / (−k12))
 *
 * The 20 is 5.0·50/12.552 = 19.92 rounded, as printed. T in ms, G in mm, currents in kA; result in mm.
 */
export function intermediateArcFlashBoundaryMm(levelV: ModelLevelV, terms: EnergyTermsInput): number {
  return boundaryMm(energyRow(terms.config, levelV), terms);
}

/**
 * IEEE Std 1584-2018 Eq. (10): arc-flash boundary for Voc ≤ 600 V, as Eq. (7) with the final arcing current in the
 * k13 term (Iarc_min for the reduced case; the k3 term keeps Iarc_600), mm.
 */
export function lowVoltageArcFlashBoundaryMm(terms: EnergyTermsInput): number {
  return boundaryMm(energyRow(terms.config, 600), terms);
}
