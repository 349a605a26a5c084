/**
 * A small complex-number type for the short-circuit engine.
 *
 * Why not mathjs' Complex: the sparse factorization touches every matrix entry a few times per study
 * (10 000-bus models), and mathjs' typed dispatch plus one object per operation cost far more than the
 * arithmetic itself. The solver therefore works on parallel `Float64Array`s of real and imaginary parts,
 * and the element formulas use this plain, JSON-friendly `{ re, im }` value. Nothing here is clever:
 * it is the textbook arithmetic of complex numbers.
 */
export interface Complex {
  readonly re: number;
  readonly im: number;
}

export const complex = (re: number, im = 0): Complex => ({ re, im });

export const cAdd = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });

export const cSub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im });

export const cMul = (a: Complex, b: Complex): Complex => ({
  re: a.re * b.re - a.im * b.im,
  im: a.re * b.im + a.im * b.re,
});

export const cScale = (a: Complex, k: number): Complex => ({ re: a.re * k, im: a.im * k });

/** a / b. Division by zero gives non-finite parts; callers check with `cIsFinite`. */
export function cDiv(a: Complex, b: Complex): Complex {
  const den = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / den, im: (a.im * b.re - a.re * b.im) / den };
}

/** 1 / a. */
export function cInv(a: Complex): Complex {
  const den = a.re * a.re + a.im * a.im;
  return { re: a.re / den, im: -a.im / den };
}

export const cAbs = (a: Complex): number => Math.hypot(a.re, a.im);

export const cConj = (a: Complex): Complex => ({ re: a.re, im: -a.im });

export const cIsFinite = (a: Complex): boolean => Number.isFinite(a.re) && Number.isFinite(a.im);
