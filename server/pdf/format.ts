/**
 * How numbers read on labels and in the report. Hazard values (energy, boundary) are rounded UP at the shown
 * precision, so a printed value is never below the computed one (common practice, no source).
 */

const MM_PER_IN = 25.4;

/** Rounds up to `decimals` places (guarding against float noise such as 4.2000000001). */
export function ceilTo(value: number, decimals: number): number {
  const f = 10 ** decimals;
  return Math.ceil(value * f - 1e-9) / f;
}

/** Incident energy in cal/cm²: two decimals below 1, one decimal from 1 (rounded up). */
export function formatCalPerCm2(value: number): string {
  if (!Number.isFinite(value)) return '—';
  const decimals = value < 1 ? 2 : 1;
  return ceilTo(value, decimals).toFixed(decimals);
}

/** Incident energy in J/cm²: one decimal (rounded up). */
export function formatJPerCm2(value: number): string {
  if (!Number.isFinite(value)) return '—';
  return ceilTo(value, 1).toFixed(1);
}

/** Feet and inches of a length, inches rounded up ("15 ft 2 in"; "11 in" below a foot). */
export function feetInchesUp(mm: number): string {
  const totalIn = Math.ceil(mm / MM_PER_IN - 1e-9);
  const ft = Math.floor(totalIn / 12);
  const inches = totalIn - ft * 12;
  return ft === 0 ? `${inches} in` : `${ft} ft ${inches} in`;
}

/** A boundary distance, metres rounded up to the centimetre ("4.61 m"). */
export function formatMetresUp(mm: number): string {
  if (!Number.isFinite(mm)) return '—';
  return `${ceilTo(mm / 1000, 2).toFixed(2)} m`;
}

/** A boundary distance in both systems, each rounded up: "4.61 m (15 ft 2 in)". */
export function formatBoundary(mm: number): string {
  if (!Number.isFinite(mm)) return '—';
  return `${formatMetresUp(mm)} (${feetInchesUp(mm)})`;
}

/** The working distance as entered, rounded to the millimetre and the inch: "610 mm (24 in)". */
export function formatWorkingDistance(mm: number): string {
  return `${Math.round(mm)} mm (${Math.round(mm / MM_PER_IN)} in)`;
}

/** Nominal voltage: "480 V", "4.16 kV", "12.47 kV". */
export function formatVoltage(volts: number): string {
  if (!Number.isFinite(volts)) return '—';
  if (volts < 1000) return `${Math.round(volts)} V`;
  return `${Number((volts / 1000).toFixed(3)).toString()} kV`;
}

/** A number with `sig` significant figures, without exponent for ordinary magnitudes ("20.9", "0.786", "1500"). */
export function formatSig(value: number, sig = 3): string {
  if (!Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const abs = Math.abs(value);
  if (abs >= 10 ** sig) return Math.round(value).toString();
  return Number(value.toPrecision(sig)).toString();
}

/** Seconds: "0.35 s", "0.025 s", "2 s". */
export function formatSeconds(s: number | null): string {
  return s === null || !Number.isFinite(s) ? '—' : `${formatSig(s, 3)} s`;
}

/** The label code in groups of four for reading aloud or typing: "7K3M 9QXW 2R4T BH6N". */
export function groupCode(code: string): string {
  return code.replace(/(.{4})(?=.)/g, '$1 ');
}

/** The code at the end of a check address `/l/<code>` (or the whole text when it has no such end). */
export function codeFromCheckUrl(url: string): string {
  const m = /\/l\/([^/?#\s]+)\/?(?:[?#].*)?$/.exec(url);
  return m ? decodeURIComponent(m[1]) : url;
}
