import { formatReading } from '../shared/numberFormat';

export type LengthUnit = 'mm' | 'in';

/** The user's unit system: US customary (in, ft) or SI (mm, m). Stored values are always SI. */
export type UnitSystem = 'us' | 'si';
/** What a stored length is kept in: gaps, distances and enclosures in mm, cable lengths in m. */
export type StoredLength = 'mm' | 'm';
/** What a length is shown in. */
export type ShownLength = 'mm' | 'm' | 'in' | 'ft';

/** Exact by definition (international yard and pound agreement, 1959): 1 in = 25.4 mm, 1 ft = 0.3048 m. */
export const MM_PER_IN = 25.4;
export const M_PER_FT = 0.3048;

export function toDisplay(mm: number, unit: LengthUnit): number {
  return unit === 'mm' ? mm : mm / MM_PER_IN;
}

export function fromDisplay(value: number, unit: LengthUnit): number {
  return unit === 'mm' ? value : value * MM_PER_IN;
}

/** The unit a stored length is shown in under a unit system. */
export function shownUnit(stored: StoredLength, system: UnitSystem): ShownLength {
  if (system === 'si') return stored;
  return stored === 'mm' ? 'in' : 'ft';
}

/** The length unit of the spot check and the results under a unit system. */
export function lengthUnitOf(system: UnitSystem): LengthUnit {
  return system === 'us' ? 'in' : 'mm';
}

/** A stored length in the unit shown (not rounded). */
export function toShown(value: number, stored: StoredLength, system: UnitSystem): number {
  if (system === 'si') return value;
  return stored === 'mm' ? value / MM_PER_IN : value / M_PER_FT;
}

/** A number entered in the unit shown, as stored: exactly the converted number, never rounded. */
export function fromShown(value: number, stored: StoredLength, system: UnitSystem): number {
  if (system === 'si') return value;
  return stored === 'mm' ? value * MM_PER_IN : value * M_PER_FT;
}

/**
 * The text a stored length is shown as: SI values as stored (every digit), US customary rounded for reading only
 * (two decimals, trailing zeros dropped). The stored value never changes by being shown.
 */
export function lengthText(value: number | undefined, stored: StoredLength, system: UnitSystem): string {
  if (value === undefined || Number.isNaN(value)) return '';
  if (system === 'si') return String(value);
  const shown = toShown(value, stored, system);
  return String(Math.round(shown * 100) / 100);
}

/** A number as typed: undefined when empty, NaN when not a number. */
export function parseNumberText(s: string): number | undefined {
  const t = s.trim().replace(',', '.');
  if (t === '') return undefined;
  const v = Number(t);
  return Number.isFinite(v) ? v : Number.NaN;
}

/**
 * What a length field holds once read: when its text is still the text it was shown with, the stored value itself
 * (so showing, switching units and reading back never changes it); otherwise the number typed, converted exactly.
 */
export function readLengthText(
  text: string,
  shown: { text: string; value: number | undefined },
  stored: StoredLength,
  system: UnitSystem,
): number | undefined {
  if (text === shown.text) return shown.value;
  const v = parseNumberText(text);
  return v === undefined || Number.isNaN(v) ? v : fromShown(v, stored, system);
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

/** A column's or field's unit as shown: mm → in and m → ft for US customary; other units as they are. */
export function unitLabel(unit: string | undefined, system: UnitSystem): string | undefined {
  if (unit === 'mm' || unit === 'm') return shownUnit(unit, system);
  return unit;
}

/** A stored length for reading with its unit ("25 m", "82.02 ft"); "—" when missing. */
export function lengthReading(value: number | undefined, stored: StoredLength, system: UnitSystem): string {
  if (value === undefined || Number.isNaN(value)) return '—';
  return `${lengthText(value, stored, system)} ${shownUnit(stored, system)}`;
}
