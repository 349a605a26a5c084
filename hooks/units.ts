export type LengthUnit = 'mm' | 'in';

export const MM_PER_IN = 25.4;

export function toDisplay(mm: number, unit: LengthUnit): number {
  return unit === 'mm' ? mm : mm / MM_PER_IN;
}

export function fromDisplay(value: number, unit: LengthUnit): number {
  return unit === 'mm' ? value : value * MM_PER_IN;
}

/** A number with sensible significant figures for reading (not for computing). */
export function fmt(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const abs = Math.abs(value);
  if (abs === 0) return '0';
  if (abs >= 1000) return Math.round(value).toLocaleString('en-US');
  const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(abs)));
  return value.toFixed(Math.min(decimals, 4));
}

export function fmtLength(mm: number, unit: LengthUnit): string {
  if (unit === 'mm') return `${Math.round(mm).toLocaleString('en-US')} mm`;
  const inches = mm / MM_PER_IN;
  if (inches >= 24) {
    const ft = Math.floor(inches / 12);
    const rest = Math.round(inches - ft * 12);
    return rest === 12 ? `${ft + 1} ft 0 in` : `${ft} ft ${rest} in`;
  }
  return `${inches.toFixed(1)} in`;
}
