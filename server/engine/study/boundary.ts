/**
 * Arc-flash boundary when the energy is a sum over intervals: the distance at which the total incident energy equals
 * 5.0 J/cm² (1.2 cal/cm²; IEEE Std 1584-2018 definition of the arc-flash boundary). Energy falls monotonically with
 * distance, so bisection on log(distance) finds it.
 */
export const BOUNDARY_ENERGY_J_PER_CM2 = 5.0;

export function boundaryDistanceMm(energyAtMm: (distanceMm: number) => number, loMm = 1, hiMm = 1e6): number {
  if (energyAtMm(hiMm) >= BOUNDARY_ENERGY_J_PER_CM2) return hiMm;
  if (energyAtMm(loMm) <= BOUNDARY_ENERGY_J_PER_CM2) return loMm;
  let lo = Math.log(loMm);
  let hi = Math.log(hiMm);
  for (let i = 0; i < 80; i++) {
    const mid = (lo + hi) / 2;
    if (energyAtMm(Math.exp(mid)) > BOUNDARY_ENERGY_J_PER_CM2) lo = mid;
    else hi = mid;
  }
  return Math.exp((lo + hi) / 2);
}
