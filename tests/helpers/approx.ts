/**
 * The one relative-tolerance helper for float checks. Never compare floats exactly.
 * `expectClose(actual, expected, relTol)` passes when |actual - expected| <= relTol * |expected|
 * (or <= absTol when expected is 0).
 */
export function isClose(actual: number, expected: number, relTol = 1e-9, absTol = 0): boolean {
  if (!Number.isFinite(actual) || !Number.isFinite(expected)) return false;
  return Math.abs(actual - expected) <= Math.max(relTol * Math.abs(expected), absTol);
}

export function expectClose(actual: number, expected: number, relTol = 1e-9, absTol = 0): void {
  if (!isClose(actual, expected, relTol, absTol)) {
    throw new Error(
      `expected ${actual} to be within ${relTol * 100}% (abs ${absTol}) of ${expected} ` +
        `(relative error ${(Math.abs(actual - expected) / Math.abs(expected || 1)).toExponential(3)})`,
    );
  }
}
