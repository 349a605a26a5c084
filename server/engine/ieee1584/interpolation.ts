/**
 * Interpolation over voltage of IEEE Std 1584-2018 for 0.6 kV < Voc ≤ 15 kV. The same three formulas serve the
 * arcing current (Eqs. 16-18), the incident energy (Eqs. 19-21) and the arc-flash boundary (Eqs. 22-24):
 * `x600`, `x2700`, `x14300` are the intermediate values at 600, 2700 and 14300 V, Voc in kV.
 */

/** Eqs. (16), (19), (22): x_1 = (x_2700 − x_600)/2.1 · (Voc − 2.7) + x_2700. */
export function interpolateFirst(x600: number, x2700: number, voltageKv: number): number {
  return ((x2700 - x600) / 2.1) * (voltageKv - 2.7) + x2700;
}

/** Eqs. (17), (20), (23): x_2 = (x_14300 − x_2700)/11.6 · (Voc − 14.3) + x_14300. */
export function interpolateSecond(x2700: number, x14300: number, voltageKv: number): number {
  return ((x14300 - x2700) / 11.6) * (voltageKv - 14.3) + x14300;
}

/** Eqs. (18), (21), (24): x_3 = x_1·(2.7 − Voc)/2.1 + x_2·(Voc − 0.6)/2.1. */
export function interpolateThird(x1: number, x2: number, voltageKv: number): number {
  return (x1 * (2.7 - voltageKv)) / 2.1 + (x2 * (voltageKv - 0.6)) / 2.1;
}

export interface InterpolationTrace {
  x1: number;
  x2: number;
  x3: number;
  /** The selected value: x_3 for 0.6 < Voc ≤ 2.7 kV, x_2 for Voc > 2.7 kV (IEEE Std 1584-2018). */
  value: number;
}

/**
 * IEEE Std 1584-2018 selection rule after Eqs. (16)-(18) (and likewise 19-21, 22-24):
 * 0.6 < Voc ≤ 2.7 kV → x_3; Voc > 2.7 kV → x_2.
 */
export function interpolateByVoltage(
  x600: number,
  x2700: number,
  x14300: number,
  voltageKv: number,
): InterpolationTrace {
  const x1 = interpolateFirst(x600, x2700, voltageKv);
  const x2 = interpolateSecond(x2700, x14300, voltageKv);
  const x3 = interpolateThird(x1, x2, voltageKv);
  return { x1, x2, x3, value: voltageKv <= 2.7 ? x3 : x2 };
}

/** Final arcing current for 0.6 < Voc ≤ 15 kV, IEEE Std 1584-2018 Eqs. (16)-(18); currents in kA, Voc in kV. */
export function interpolatedArcingCurrentKa(
  iarc600Ka: number,
  iarc2700Ka: number,
  iarc14300Ka: number,
  voltageKv: number,
): number {
  return interpolateByVoltage(iarc600Ka, iarc2700Ka, iarc14300Ka, voltageKv).value;
}

/** Final incident energy for 0.6 < Voc ≤ 15 kV, IEEE Std 1584-2018 Eqs. (19)-(21); energies in J/cm², Voc in kV. */
export function interpolatedIncidentEnergyJPerCm2(
  e600JPerCm2: number,
  e2700JPerCm2: number,
  e14300JPerCm2: number,
  voltageKv: number,
): number {
  return interpolateByVoltage(e600JPerCm2, e2700JPerCm2, e14300JPerCm2, voltageKv).value;
}

/** Final arc-flash boundary for 0.6 < Voc ≤ 15 kV, IEEE Std 1584-2018 Eqs. (22)-(24); boundaries in mm, Voc in kV. */
export function interpolatedArcFlashBoundaryMm(
  afb600Mm: number,
  afb2700Mm: number,
  afb14300Mm: number,
  voltageKv: number,
): number {
  return interpolateByVoltage(afb600Mm, afb2700Mm, afb14300Mm, voltageKv).value;
}
