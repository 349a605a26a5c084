import { formatReading } from '../shared/numberFormat';

export type LengthUnit = 'mm' | 'in';

export const MM_PER_IN = 25.4;

export function toDisplay(mm: number, unit: LengthUnit): number {
  return unit === 'mm' ? mm : mm / MM_PER_IN;
}

export function fromDisplay(value: number, unit: LengthUnit): number {
  return unit === 'mm' ? value : value * MM_PER_IN;
}

/** A number for reading (not for computing): the one reading format, in shared/numberFormat.ts. */
export const fmt = formatReading;

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
