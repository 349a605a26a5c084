/**
 * Arcing-current variation correction factor and reduced arcing current, IEEE Std 1584-2018 Eq. (2).
 */
import type { ElectrodeConfig } from '../../../shared/equipmentClasses';
import { table2Row } from './coefficients';

/**
 * IEEE Std 1584-2018 Eq. (2), arcing current variation correction factor:
 *
 *   VarCf = k1·Voc⁶ + k2·Voc⁵ + k3·Voc⁴ + k4·Voc³ + k5·Voc² + k6·Voc + k7
 *
 * with k1..k7 from Table 2 and Voc in kV. Dimensionless.
 */
export function arcingCurrentVariationFactor(config: ElectrodeConfig, voltageKv: number): number {
  const [k1, k2, k3, k4, k5, k6, k7] = table2Row(config);
  const v = voltageKv;
  return k1 * v ** 6 + k2 * v ** 5 + k3 * v ** 4 + k4 * v ** 3 + k5 * v ** 2 + k6 * v + k7;
}

/**
 * IEEE Std 1584-2018 Eq. (2), reduced (minimum) arcing current: Iarc_min = Iarc · (1 − 0.5·VarCf).
 * For 208-600 V it is applied to the final Iarc; above 600 V to each intermediate Iarc_600, Iarc_2700, Iarc_14300.
 */
export function reducedArcingCurrentKa(arcingCurrentKa: number, varCf: number): number {
  return arcingCurrentKa * (1 - 0.5 * varCf);
}
