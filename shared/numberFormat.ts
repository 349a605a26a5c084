/**
 * How numbers read outside a label, in one place for the screens, the PDFs and the engine's trace sentences:
 * significant figures in plain notation (never exponent form) and one mark for a missing value.
 * What a label prints (hazard values rounded UP) is shared/labelDisplay.ts, built on these.
 */

/** Shown where a value is missing or not a finite number. */
export const MISSING = '—';

/**
 * A number with `digits` significant figures, in plain notation (never exponent form). With `trim` (the default)
 * trailing zeros after the decimal point are removed: 0.08312 → "0.0831", 12.34 → "12.3", 1234 → "1234",
 * 0.1 → "0.1"; without it they stay (0.3 → "0.300"), as in readouts. Integer digits are never dropped: 12 345 with
 * three figures reads "12345", not "12300".
 */
export function formatSig(value: number, digits = 3, trim = true): string {
  if (!Number.isFinite(value)) return MISSING;
  if (value === 0) return '0';
  const magnitude = Math.floor(Math.log10(Math.abs(value)));
  let decimals = Math.min(20, Math.max(0, digits - 1 - magnitude));
  let s = value.toFixed(decimals);
  // Rounding may carry into one more integer digit (9.996 → 10.00): one decimal fewer keeps `digits` figures.
  if (decimals > 0 && Math.floor(Math.log10(Math.abs(Number(s))) + 1e-12) > magnitude) {
    decimals -= 1;
    s = value.toFixed(decimals);
  }
  if (trim && decimals > 0) {
    // Trailing zeros after the decimal point, and the point itself when nothing is left after it.
    let end = s.length;
    while (s.charCodeAt(end - 1) === 48) end -= 1;
    if (s.charCodeAt(end - 1) === 46) end -= 1;
    s = s.slice(0, end);
  }
  // toFixed keeps the sign of a negative value that rounds to zero ("-0.00").
  return value < 0 && /^-0(\.0*)?$/.test(s) ? s.slice(1) : s;
}

/**
 * A reading on screen: `digits` significant figures with their trailing zeros (0.3 → "0.300", 12.34 → "12.3"), and
 * from 1 000 up a whole number with thousands separators ("12,345"); MISSING for no value.
 */
export function formatReading(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return MISSING;
  if (Math.abs(value) >= 1000) return Math.round(value).toLocaleString('en-US');
  return formatSig(value, digits, false);
}
