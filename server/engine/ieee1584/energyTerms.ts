/**
 * The exponent shared by IEEE Std 1584-2018 Eqs. (3)-(10) (incident energy and arc-flash boundary), without the
 * k12·lg D term. Coefficients k1..k13 of Tables 3 (600 V), 4 (2700 V) and 5 (14300 V): from memory, unverified
 * (see the data file's provenance).
 */
import type { ElectrodeConfig } from '../../../shared/equipmentClasses';
import type { EnergyRow } from './coefficients';

/** Inputs shared by Eqs. (3)-(10). */
export interface EnergyTermsInput {
  config: ElectrodeConfig;
  gapMm: number;
  boltedFaultKa: number;
  /** Arcing current in the k3 term, kA: Iarc_Voc for Eqs. (3)-(5), (7)-(9); Iarc_600 for Eqs. (6), (10). */
  iarcK3Ka: number;
  /** Arcing current in the k13 term, kA: Iarc_Voc for Eqs. (3)-(5), (7)-(9); the final Iarc for Eqs. (6), (10). */
  iarcK13Ka: number;
  /** Enclosure size correction factor CF (Eqs. 14, 15; 1 in open air). */
  enclosureCorrectionFactor: number;
  /** Arc duration T, ms. */
  durationMs: number;
}

/** P(Ibf) = k4·Ibf⁷ + k5·Ibf⁶ + k6·Ibf⁵ + k7·Ibf⁴ + k8·Ibf³ + k9·Ibf² + k10·Ibf, the k3-term denominator of Eqs. (3)-(10). */
export function boltedCurrentPolynomial(k: EnergyRow, boltedFaultKa: number): number {
  const i = boltedFaultKa;
  return k[3] * i ** 7 + k[4] * i ** 6 + k[5] * i ** 5 + k[6] * i ** 4 + k[7] * i ** 3 + k[8] * i ** 2 + k[9] * i;
}

/**
 * k1 + k2·lg G + k3·Iarc/P(Ibf) + k11·lg Ibf + k13·lg Iarc + lg(1/CF): the exponent of Eqs. (3)-(10) without k12·lg D.
 */
export function exponentWithoutDistance(k: EnergyRow, t: EnergyTermsInput): number {
  return (
    k[0] +
    k[1] * Math.log10(t.gapMm) +
    (k[2] * t.iarcK3Ka) / boltedCurrentPolynomial(k, t.boltedFaultKa) +
    k[10] * Math.log10(t.boltedFaultKa) +
    k[12] * Math.log10(t.iarcK13Ka) +
    Math.log10(1 / t.enclosureCorrectionFactor)
  );
}
