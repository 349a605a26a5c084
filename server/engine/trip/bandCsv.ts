import Papa from 'papaparse';
import { CURVE_LIMITS, type CurrentUnit } from '../../../shared/schemas/device';
import type { TimeCurrentPoint } from './interpolate';

/** A problem in an uploaded band CSV, by 1-based line number of the file. */
export interface BandCsvError {
  line: number;
  message: string;
}

export type BandCsvResult =
  | { ok: true; currentUnit: CurrentUnit; min: [number, number][]; max: [number, number][] }
  | { ok: false; errors: BandCsvError[] };

/** What the first header names: a unit, or (`current`) no unit. */
const UNIT_HEADERS: Record<string, CurrentUnit | 'unstated'> = {
  current: 'unstated',
  current_a: 'ampere',
  amperes: 'ampere',
  ampere: 'ampere',
  a: 'ampere',
  multiple: 'multiple',
  multiples: 'multiple',
  x: 'multiple',
};
const UNIT_WORDS: Record<CurrentUnit, string> = { ampere: 'amperes', multiple: 'multiples of the rating' };
const MIN_HEADERS = new Set(['min_s', 'min', 'minimum_s', 'minimum']);
const MAX_HEADERS = new Set(['max_s', 'max', 'maximum_s', 'maximum']);

/** Why a cell's value lies outside CURVE_LIMITS (column 0 current, 1–2 seconds), or null when it is inside. */
function outOfLimits(column: number, v: number, unit: CurrentUnit): string | null {
  if (column === 0) {
    const max = unit === 'multiple' ? CURVE_LIMITS.maxMultiple : CURVE_LIMITS.maxCurrentA;
    if (v < CURVE_LIMITS.minCurrent) return `is below ${CURVE_LIMITS.minCurrent}`;
    if (v > max) return `is above ${max}${unit === 'multiple' ? ' × rating' : ' A'}`;
    return null;
  }
  if (v < CURVE_LIMITS.minTimeS) return `is below ${CURVE_LIMITS.minTimeS} s`;
  if (v > CURVE_LIMITS.maxTimeS) return `is above ${CURVE_LIMITS.maxTimeS} s`;
  return null;
}

function parseNumber(cell: string): number | null {
  const trimmed = cell.trim();
  if (trimmed === '' || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(trimmed)) return null;
  return Number(trimmed);
}

/**
 * Parses a digitized band CSV: three columns, current (amperes) or multiple (of rating), minimum seconds,
 * maximum seconds. What the first column holds is the uploader's explicit choice, `options.currentUnit`; a header row
 * is optional (`current,min_s,max_s`, `amperes,min_s,max_s` or `multiple,min_s,max_s`) and is never taken over a
 * choice: a header naming the other unit is an error on its line. Without a choice (programs of the API), a header
 * naming a unit decides, otherwise amperes. A min or max cell may be left
 * empty where that curve has no point at the row's current. Lines starting with `#` and blank lines are skipped.
 * Every problem is reported with its line number: non-numeric or non-positive values, currents not strictly
 * increasing, a curve's time rising with current, a row's minimum above its maximum, too few points.
 */
export function parseBandCsv(text: string, options: { currentUnit?: CurrentUnit } = {}): BandCsvResult {
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), {
    header: false,
    skipEmptyLines: false,
    delimiter: '',
  });
  const rows = parsed.data;
  const errors: BandCsvError[] = [];
  let currentUnit: CurrentUnit = options.currentUnit ?? 'ampere';
  const min: [number, number][] = [];
  const max: [number, number][] = [];
  const minLines: number[] = [];
  const maxLines: number[] = [];
  let prevCurrent: { value: number; line: number } | null = null;
  let sawHeaderOrData = false;

  rows.forEach((row, index) => {
    const line = index + 1;
    const cells = row.map((c) => (c ?? '').trim());
    if (cells.every((c) => c === '') || cells[0].startsWith('#')) return;
    if (!sawHeaderOrData) {
      sawHeaderOrData = true;
      if (parseNumber(cells[0]) === null && cells[0] !== '') {
        const [c0, c1, c2] = cells.map((c) => c.toLowerCase());
        const unit = UNIT_HEADERS[c0];
        if (!unit || !MIN_HEADERS.has(c1 ?? '') || !MAX_HEADERS.has(c2 ?? '')) {
          errors.push({
            line,
            message: `Header "${cells.join(',')}" not understood: use current,min_s,max_s or multiple,min_s,max_s`,
          });
        } else if (unit !== 'unstated' && options.currentUnit && unit !== options.currentUnit) {
          errors.push({
            line,
            message: `The header says the first column holds ${UNIT_WORDS[unit]}, but ${UNIT_WORDS[options.currentUnit]} was chosen: choose the unit the file holds`,
          });
        } else if (unit !== 'unstated' && !options.currentUnit) {
          currentUnit = unit;
        }
        return;
      }
    }
    if (cells.length < 3) {
      errors.push({ line, message: `Expected 3 columns (current, min_s, max_s), found ${cells.length}` });
      return;
    }
    if (cells.length > 3 && cells.slice(3).some((c) => c !== '')) {
      errors.push({ line, message: `Expected 3 columns (current, min_s, max_s), found ${cells.length}` });
      return;
    }
    const names = ['current', 'min_s', 'max_s'];
    const values: (number | null)[] = [];
    let rowOk = true;
    for (let i = 0; i < 3; i += 1) {
      const cell = cells[i];
      if (cell === '' && i > 0) {
        values.push(null);
        continue;
      }
      const v = parseNumber(cell);
      if (v === null || !Number.isFinite(v)) {
        errors.push({ line, message: `${names[i]} "${cell}" is not a number` });
        rowOk = false;
        values.push(null);
      } else if (v <= 0) {
        errors.push({ line, message: `${names[i]} ${cell} must be positive (log-log axes)` });
        rowOk = false;
        values.push(null);
      } else if (outOfLimits(i, v, currentUnit)) {
        errors.push({ line, message: `${names[i]} ${cell} ${outOfLimits(i, v, currentUnit)}` });
        rowOk = false;
        values.push(null);
      } else {
        values.push(v);
      }
    }
    // Order is checked on every row whose current is a valid number, even if another cell is bad.
    const current = values[0];
    if (current !== null) {
      if (prevCurrent !== null && !(current > prevCurrent.value)) {
        errors.push({
          line,
          message: `current ${current} is not greater than ${prevCurrent.value} on line ${prevCurrent.line}: sort the rows by increasing current`,
        });
        rowOk = false;
      } else {
        prevCurrent = { value: current, line };
      }
    }
    if (!rowOk || current === null) return;
    const [, minS, maxS] = values as [number, number | null, number | null];
    if (minS === null && maxS === null) {
      errors.push({ line, message: 'Give min_s, max_s or both' });
      return;
    }
    if (minS !== null && maxS !== null && minS > maxS) {
      errors.push({ line, message: `min_s ${minS} is greater than max_s ${maxS}` });
      return;
    }
    if (minS !== null) {
      const last = min[min.length - 1];
      if (last && minS > last[1]) {
        errors.push({
          line,
          message: `min_s ${minS} rises above ${last[1]} on line ${minLines[minLines.length - 1]}: a trip curve does not rise with current`,
        });
      } else {
        min.push([current, minS]);
        minLines.push(line);
      }
    }
    if (maxS !== null) {
      const last = max[max.length - 1];
      if (last && maxS > last[1]) {
        errors.push({
          line,
          message: `max_s ${maxS} rises above ${last[1]} on line ${maxLines[maxLines.length - 1]}: a trip curve does not rise with current`,
        });
      } else {
        max.push([current, maxS]);
        maxLines.push(line);
      }
    }
  });

  const lastLine = Math.max(1, rows.length);
  for (const [name, list, lines] of [
    ['min_s', min, minLines],
    ['max_s', max, maxLines],
  ] as const) {
    if (list.length > CURVE_LIMITS.maxPoints) {
      errors.push({
        line: lines[CURVE_LIMITS.maxPoints],
        message: `More than ${CURVE_LIMITS.maxPoints} ${name} points: a curve may have at most ${CURVE_LIMITS.maxPoints}`,
      });
    }
  }
  if (errors.length === 0) {
    if (min.length === 0) errors.push({ line: lastLine, message: 'No minimum-curve points (min_s)' });
    if (max.length === 0) errors.push({ line: lastLine, message: 'No maximum-curve points (max_s)' });
  }
  if (errors.length > 0) return { ok: false, errors: errors.sort((a, b) => a.line - b.line) };
  return { ok: true, currentUnit, min, max };
}

/** The band CSV of a point list pair, with a header row; parseBandCsv reads it back unchanged. */
export function formatBandCsv(band: {
  currentUnit: CurrentUnit;
  min: readonly TimeCurrentPoint[];
  max: readonly TimeCurrentPoint[];
}): string {
  const currents = Array.from(new Set([...band.min.map((p) => p[0]), ...band.max.map((p) => p[0])])).sort(
    (a, b) => a - b,
  );
  const minAt = new Map(band.min.map((p) => [p[0], p[1]]));
  const maxAt = new Map(band.max.map((p) => [p[0], p[1]]));
  const lines = [`${band.currentUnit === 'multiple' ? 'multiple' : 'current'},min_s,max_s`];
  for (const c of currents) lines.push(`${c},${minAt.get(c) ?? ''},${maxAt.get(c) ?? ''}`);
  return `${lines.join('\n')}\n`;
}
