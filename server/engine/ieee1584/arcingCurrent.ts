/**
 * Arcing current of the IEEE Std 1584-2018 empirical model: Eq. (1) (intermediate average arcing current at 600,
 * 2700 and 14300 V) and Eq. (25) (final arcing current at or below 600 V).
 */
import type { ElectrodeConfig } from '../../../shared/equipmentClasses';
import { table1Row, type ModelLevelV } from './coefficients';

/**
 * IEEE Std 1584-2018 Eq. (1), intermediate average arcing current at the model voltage `levelV` (600, 2700, 14300 V):
 *
 *   Iarc_Voc = 10^(k1 + k2·lg Ibf + k3·lg G) · (k4·Ibf⁶ + k5·Ibf⁵ + k6·Ibf⁴ + k7·Ibf³ + k8·Ibf² + k9·Ibf + k10)
 *
 * with k1..k10 from Table 1. Ibf in kA (bolted three-phase fault, symmetrical rms), G in mm; result in kA.
 */
export function intermediateArcingCurrentKa(
  config: ElectrodeConfig,
  levelV: ModelLevelV,
  boltedFaultKa: number,
  gapMm: number,
): number {
  const [k1, k2, k3, k4, k5, k6, k7, k8, k9, k10] = table1Row(config, levelV);
  const i = boltedFaultKa;
  const polynomial = k4 * i ** 6 + k5 * i ** 5 + k6 * i ** 4 + k7 * i ** 3 + k8 * i ** 2 + k9 * i + k10;
  return 10 ** (k1 + k2 * Math.log10(i) + k3 * Math.log10(gapMm)) * polynomial;
}

/**
 * IEEE Std 1584-2018 Eq. (25), final arcing current for 208 V ≤ Voc ≤ 600 V:
 *
 *   Iarc = 1 / √( (0.6/Voc)² · [ 1/Iarc_600² − (0.6² − Voc²) / (0.6² · Ibf²) ] )
 *
 * Voc in kV, Iarc_600 (Eq. 1 at 600 V) and Ibf in kA; result in kA. Returns NaN where the bracket is not positive
 * (outside the model; the caller reports it).
 */
export function lowVoltageArcingCurrentKa(voltageKv: number, iarc600Ka: number, boltedFaultKa: number): number {
  const bracket = 1 / iarc600Ka ** 2 - (0.6 ** 2 - voltageKv ** 2) / (0.6 ** 2 * boltedFaultKa ** 2);
  const radicand = (0.6 / voltageKv) ** 2 * bracket;
  return radicand > 0 ? 1 / Math.sqrt(radicand) : Number.NaN;
}
