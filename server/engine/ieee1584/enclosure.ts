/**
 * Enclosure size correction factor of IEEE Std 1584-2018: enclosure type (typical or shallow), equivalent height
 * and width (Table 6, Eqs. 11 and 12), equivalent enclosure size (Eq. 13) and the correction factor CF
 * (Eq. 14 typical, Eq. 15 shallow, coefficients of Table 7). CF = 1 for the open-air configurations VOA and HOA.
 * Table 6 rules and Table 7 coefficients: from memory, unverified (see the data file's provenance).
 */
import type { ElectrodeConfig, EnclosureSizeMm } from '../../../shared/equipmentClasses';
import { TABLE6, enclosureConstantsAB, table7Row, type BoxConfig, type EnclosureType } from './coefficients';

export function isOpenAir(config: ElectrodeConfig): config is 'VOA' | 'HOA' {
  return config === 'VOA' || config === 'HOA';
}

/**
 * IEEE Std 1584-2018 enclosure classification: shallow when all hold — Voc < 0.6 kV; height < 508 mm and
 * width < 508 mm; depth ≤ 203.2 mm. Otherwise typical.
 */
export function enclosureType(voltageKv: number, enclosureMm: EnclosureSizeMm): EnclosureType {
  const shallow =
    voltageKv < 0.6 &&
    enclosureMm.height < TABLE6.lowerMm &&
    enclosureMm.width < TABLE6.lowerMm &&
    enclosureMm.depth <= TABLE6.shallowDepthMaxMm;
  return shallow ? 'shallow' : 'typical';
}

/**
 * IEEE Std 1584-2018 Eq. (11) (width) and Eq. (12) (height), the same form:
 *   X1 = (660.4 + (X − 660.4)·((Voc + A)/B)) · 25.4⁻¹
 * X in mm (already limited to 1244.6 mm), Voc in kV, A and B of Table 6 for the configuration; result in inches.
 */
export function equivalentDimensionEq11Eq12In(dimensionMm: number, voltageKv: number, config: BoxConfig): number {
  const { a, b } = enclosureConstantsAB(config);
  return (TABLE6.midMm + (dimensionMm - TABLE6.midMm) * ((voltageKv + a) / b)) / 25.4;
}

/** Table 6 rule for dimensions below 660.4 mm (the same for width and height). */
function smallDimensionIn(dimensionMm: number, type: EnclosureType): number {
  if (dimensionMm < TABLE6.lowerMm) {
    return type === 'shallow' ? TABLE6.inchFactor * dimensionMm : TABLE6.referenceSizeIn;
  }
  return TABLE6.inchFactor * dimensionMm;
}

/**
 * Equivalent width Width1 (in), IEEE Std 1584-2018 Table 6 with Eq. (11) (VCB, VCBB, HCB):
 * < 508 mm: 20 (typical) or 0.03937·W (shallow); 508-660.4 mm: 0.03937·W; > 660.4 mm: Eq. (11), W limited to 1244.6 mm.
 */
export function equivalentWidthIn(config: BoxConfig, widthMm: number, voltageKv: number, type: EnclosureType): number {
  if (widthMm <= TABLE6.midMm) return smallDimensionIn(widthMm, type);
  return equivalentDimensionEq11Eq12In(Math.min(widthMm, TABLE6.upperMm), voltageKv, config);
}

/**
 * Equivalent height Height1 (in), IEEE Std 1584-2018 Table 6 with Eq. (12):
 * < 508 mm: 20 (typical) or 0.03937·H (shallow); 508-660.4 mm: 0.03937·H; above 660.4 mm: VCB 0.03937·H
 * (49 in above 1244.6 mm), VCBB and HCB Eq. (12) with H limited to 1244.6 mm.
 */
export function equivalentHeightIn(
  config: BoxConfig,
  heightMm: number,
  voltageKv: number,
  type: EnclosureType,
): number {
  if (heightMm <= TABLE6.midMm) return smallDimensionIn(heightMm, type);
  if (config === 'VCB') {
    return heightMm > TABLE6.upperMm ? TABLE6.vcbHeightAboveLimitIn : TABLE6.inchFactor * heightMm;
  }
  return equivalentDimensionEq11Eq12In(Math.min(heightMm, TABLE6.upperMm), voltageKv, config);
}

/** IEEE Std 1584-2018 Eq. (13): equivalent enclosure size EES = (Height1 + Width1)/2, inches. */
export function equivalentEnclosureSizeIn(height1In: number, width1In: number): number {
  return (height1In + width1In) / 2;
}

/** IEEE Std 1584-2018 Eq. (14), typical enclosure: CF = b1·EES² + b2·EES + b3 (Table 7, typical). */
export function typicalEnclosureCorrectionFactor(config: BoxConfig, eesIn: number): number {
  const [b1, b2, b3] = table7Row(config, 'typical');
  return b1 * eesIn ** 2 + b2 * eesIn + b3;
}

/** IEEE Std 1584-2018 Eq. (15), shallow enclosure: CF = 1/(b1·EES² + b2·EES + b3) (Table 7, shallow). */
export function shallowEnclosureCorrectionFactor(config: BoxConfig, eesIn: number): number {
  const [b1, b2, b3] = table7Row(config, 'shallow');
  return 1 / (b1 * eesIn ** 2 + b2 * eesIn + b3);
}

export interface EnclosureCorrection {
  /** 'open-air' for VOA and HOA (CF = 1). */
  enclosureType: EnclosureType | 'open-air';
  enclosureCorrectionFactor: number;
  height1In?: number;
  width1In?: number;
  equivalentEnclosureSizeIn?: number;
  /** True where the height or width was above 1244.6 mm and the Table 6 limit was used instead. */
  heightLimited: boolean;
  widthLimited: boolean;
}

/**
 * Enclosure size correction factor CF, IEEE Std 1584-2018 Eqs. (11)-(15) with Tables 6 and 7; CF = 1 for VOA and HOA.
 */
export function enclosureCorrectionFactor(
  config: ElectrodeConfig,
  voltageKv: number,
  enclosureMm: EnclosureSizeMm,
): EnclosureCorrection {
  if (isOpenAir(config)) {
    return { enclosureType: 'open-air', enclosureCorrectionFactor: 1, heightLimited: false, widthLimited: false };
  }
  const type = enclosureType(voltageKv, enclosureMm);
  const height1In = equivalentHeightIn(config, enclosureMm.height, voltageKv, type);
  const width1In = equivalentWidthIn(config, enclosureMm.width, voltageKv, type);
  const ees = equivalentEnclosureSizeIn(height1In, width1In);
  const cf =
    type === 'shallow' ? shallowEnclosureCorrectionFactor(config, ees) : typicalEnclosureCorrectionFactor(config, ees);
  return {
    enclosureType: type,
    enclosureCorrectionFactor: cf,
    height1In,
    width1In,
    equivalentEnclosureSizeIn: ees,
    heightLimited: enclosureMm.height > TABLE6.upperMm,
    widthLimited: enclosureMm.width > TABLE6.upperMm,
  };
}
