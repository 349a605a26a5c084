/**
 * Incident energy at the working distance, IEEE Std 1584-2018 Eqs. (3)-(6) (Tables 3, 4, 5; from memory, unverified).
 */
import { CONSTANTS, energyRow, type EnergyRow, type ModelLevelV } from './coefficients';
import { exponentWithoutDistance, type EnergyTermsInput } from './energyTerms';

/** E = 12.552/50 · T · 10^(k1 + … + k12·lg D + …), the common form of Eqs. (3)-(6); J/cm². */
function energyJPerCm2(k: EnergyRow, terms: EnergyTermsInput, workingDistanceMm: number): number {
  const exponent = exponentWithoutDistance(k, terms) + k[11] * Math.log10(workingDistanceMm);
  return CONSTANTS.energyScale * terms.durationMs * 10 ** exponent;
}

/**
 * IEEE Std 1584-2018 Eqs. (3), (4), (5): intermediate incident energy at 600, 2700 or 14300 V (Tables 3, 4, 5):
 *
 *   E_Voc = 12.552/50 · T · 10^(k1 + k2·lg G + k3·Iarc_Voc/P(Ibf) + k11·lg Ibf + k12·lg D + k13·lg Iarc_Voc + lg(1/CF))
 *
 * T in ms, G and D in mm, currents in kA; result in J/cm². Pass Iarc_Voc as both `iarcK3Ka` and `iarcK13Ka`.
 */
export function intermediateIncidentEnergyJPerCm2(
  levelV: ModelLevelV,
  terms: EnergyTermsInput,
  workingDistanceMm: number,
): number {
  return energyJPerCm2(energyRow(terms.config, levelV), terms, workingDistanceMm);
}

/**
 * IEEE Std 1584-2018 Eq. (6): incident energy for Voc ≤ 600 V (Table 3 coefficients), as Eq. (3) but with the
 * final arcing current Iarc (Eq. 25) in the k13 term; the k3 term keeps Iarc_600. For the reduced case the k13
 * term takes Iarc_min (an interpretation to be confirmed against the standard). J/cm².
 */
export function lowVoltageIncidentEnergyJPerCm2(terms: EnergyTermsInput, workingDistanceMm: number): number {
  return energyJPerCm2(energyRow(terms.config, 600), terms, workingDistanceMm);
}
