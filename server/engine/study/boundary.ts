/**
 * Arc-flash boundary when the energy is a sum over intervals: the distance at which the total incident energy equals
 * 5.0 J/cm² (1.2 cal/cm²; IEEE Std 1584-2018 definition of the arc-flash boundary). Energy falls monotonically with
 * distance, so a bracketing search on log(distance) finds it.
 */
export const BOUNDARY_ENERGY_J_PER_CM2 = 5.0;

export function boundaryDistanceMm(energyAtMm: (distanceMm: number) => number, loMm = 1, hiMm = 1e6): number {
  if (energyAtMm(hiMm) >= BOUNDARY_ENERGY_J_PER_CM2) return hiMm;
  if (energyAtMm(loMm) <= BOUNDARY_ENERGY_J_PER_CM2) return loMm;
  // Regula falsi (Illinois variant) on ln E against ln D: nearly a straight line (the IEEE 1584-2018 energy is a
  // power of D at each voltage level), so a few evaluations find it; it keeps a bracket, so it always converges.
  const f = (x: number) => Math.log(energyAtMm(Math.exp(x))) - Math.log(BOUNDARY_ENERGY_J_PER_CM2);
  let a = Math.log(loMm);
  let b = Math.log(hiMm);
  let fa = f(a);
  let fb = f(b);
  let side = 0;
  for (let i = 0; i < 200 && b - a > 1e-13; i++) {
    const x = (a * fb - b * fa) / (fb - fa);
    const fx = f(x);
    if (fx === 0 || !Number.isFinite(fx)) return Math.exp(x);
    if (fx > 0) {
      a = x;
      fa = fx;
      if (side === 1) fb /= 2;
      side = 1;
    } else {
      b = x;
      fb = fx;
      if (side === -1) fa /= 2;
      side = -1;
    }
    if (Math.abs(fx) < 1e-14) return Math.exp(x);
  }
  return Math.exp((a + b) / 2);
}
