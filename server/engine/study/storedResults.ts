import type { BusResult, StudyResults } from '../../../shared/schemas/studyResults';

/**
 * The stored text of a run's results (the `results` column of a run row) and the one way to read it back.
 *
 * Most of a bus's label values are the same sentences and tables on every bus of a voltage and class: the bases of
 * the minimum arc rating, PPE level and signal word, the shock-approach and glove tables with their sources, the
 * cautions, and the bus's equipment (class, gap, working distance, enclosure). They are stored once per results, in
 * `shared`, and each bus names them by their index there:
 *
 *   {"storedFormat":2,"shared":[…],"results":{…the results, each bus with numbers in place of those values…}}
 *
 * `parseStoredResults` puts them back: every bus gets its own copy, with its keys in the order they had, so the
 * results read back are the results computed (the same `JSON.stringify` text, byte for byte). Results stored before
 * this form (plain `JSON.stringify` of the results) read as they are. Every reader of stored results goes through
 * `parseStoredResults`; a reader that did not would find no `buses` at the top and fail at once, never read an index
 * as a label value.
 */

/** The form written now. */
export const STORED_RESULTS_FORMAT = 2;

/** Label-value keys stored once per results (never numbers in a bus result, so a number there is an index). */
const SHARED_LABEL_KEYS = [
  'minimumArcRatingBasis',
  'ppeLevel',
  'ppeLevelBasis',
  'shockApproach',
  'gloveClass',
  'signalColor',
  'signalWordBasis',
  'cautions',
] as const;

/** Distinct values under one key compared element by element before they are looked up by their JSON text. */
const MAX_CANDIDATES = 16;

/**
 * Whether two JSON values have the same JSON text: the same primitives (numbers by value: NaN and infinities, which
 * JSON writes as null, never match), arrays of the same length, objects with the same keys in the same order.
 */
function sameJson(a: unknown, b: unknown): boolean {
  if (a === b) return typeof a !== 'number' || Number.isFinite(a);
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  // A value with its own JSON form (a Date): not compared here.
  if (
    typeof (a as { toJSON?: unknown }).toJSON === 'function' ||
    typeof (b as { toJSON?: unknown }).toJSON === 'function'
  )
    return false;
  if (Array.isArray(a)) {
    if (!Array.isArray(b) || a.length !== b.length) return false;
    for (let i = 0; i < a.length; i++) if (!sameJson(a[i], b[i])) return false;
    return true;
  }
  if (Array.isArray(b)) return false;
  const ka = Object.keys(a);
  const kb = Object.keys(b);
  if (ka.length !== kb.length) return false;
  for (let i = 0; i < ka.length; i++) {
    const k = ka[i];
    if (k !== kb[i]) return false;
    const x = (a as Record<string, unknown>)[k];
    const y = (b as Record<string, unknown>)[k];
    // JSON leaves out a key whose value is undefined (or a function): never equal, to be safe.
    if (x === undefined || y === undefined || typeof x === 'function' || typeof y === 'function') return false;
    if (!sameJson(x, y)) return false;
  }
  return true;
}

/** Writes the stored text of one run's results, bus by bus (a large run holds text, not object graphs). */
export class StoredResultsWriter {
  /** The JSON text of each shared value, by index. */
  private readonly sharedJson: string[] = [];
  /** Strings by their value (the same constant string hashes once), other values by their JSON text. */
  private readonly stringIndex = new Map<string, number>();
  private readonly jsonIndex = new Map<string, number>();
  private readonly busJson: string[] = [];

  /** Number of buses added. */
  get buses(): number {
    return this.busJson.length;
  }

  /**
   * Values already stored, by the key they sit under: checked for equality (the same JSON text) element by element,
   * which for the engine's values is mostly comparing the same string objects. Past `MAX_CANDIDATES` distinct values
   * under one key, they are looked up by their JSON text instead.
   */
  private readonly candidates = new Map<string, { value: unknown; index: number }[]>();

  private index(key: string, value: unknown): number {
    if (typeof value === 'string') {
      let i = this.stringIndex.get(value);
      if (i === undefined) {
        i = this.sharedJson.push(JSON.stringify(value)) - 1;
        this.stringIndex.set(value, i);
      }
      return i;
    }
    let list = this.candidates.get(key);
    if (!list) this.candidates.set(key, (list = []));
    if (list.length < MAX_CANDIDATES) {
      for (const c of list) if (sameJson(c.value, value)) return c.index;
      const index = this.sharedJson.push(JSON.stringify(value)) - 1;
      list.push({ value: copyJson(value), index });
      return index;
    }
    const json = JSON.stringify(value);
    let i = this.jsonIndex.get(json);
    if (i === undefined) {
      i = this.sharedJson.push(json) - 1;
      this.jsonIndex.set(json, i);
    }
    return i;
  }

  /** Adds one bus (serialized now; the object is not kept). */
  add(bus: BusResult): void {
    const lv = bus.labelValues;
    let stored: unknown = bus;
    if (lv || bus.equipment) {
      // Spread then assigned: the keys keep their places (read back in the same order).
      const copy = { ...bus } as Record<string, unknown>;
      if (bus.equipment) copy.equipment = this.index('equipment', bus.equipment);
      if (lv) {
        const l = { ...lv } as Record<string, unknown>;
        for (const k of SHARED_LABEL_KEYS) {
          const v = l[k];
          // A missing or null value stays as it is (shorter than an index, and read back as is).
          if (v !== undefined && v !== null) l[k] = this.index(k, v);
        }
        copy.labelValues = l;
      }
      stored = copy;
    }
    this.busJson.push(JSON.stringify(stored));
  }

  /** The stored text: `results` with the buses added (its own `buses` is ignored). */
  text(results: StudyResults): string {
    const head = JSON.stringify({ ...results, buses: [] });
    const key = '"buses":[]';
    // A quote outside a string value is a delimiter in JSON text (inside one it is escaped), so the first
    // `"buses":[]` is the results' own key: the keys before it hold a string and numbers only.
    const at = head.indexOf(key);
    if (at < 0) throw new Error('The study results have no buses array');
    const body = `${head.slice(0, at)}"buses":[${this.busJson.join(',')}]${head.slice(at + key.length)}`;
    return `{"storedFormat":${STORED_RESULTS_FORMAT},"shared":[${this.sharedJson.join(',')}],"results":${body}}`;
  }
}

/** The stored text of whole results (the same text as adding their buses one by one). */
export function storedResultsText(results: StudyResults): string {
  const w = new StoredResultsWriter();
  for (const b of results.buses) w.add(b);
  return w.text(results);
}

/** A copy of a JSON value (plain objects, arrays, strings, numbers, booleans, null), keys in their order. */
function copyJson(v: unknown): unknown {
  if (v === null || typeof v !== 'object') return v;
  if (Array.isArray(v)) return v.map(copyJson);
  const out: Record<string, unknown> = {};
  for (const k of Object.keys(v)) {
    const x = copyJson((v as Record<string, unknown>)[k]);
    if (k === '__proto__')
      Object.defineProperty(out, k, { value: x, enumerable: true, writable: true, configurable: true });
    else out[k] = x;
  }
  return out;
}

function sharedAt(shared: unknown[], i: number): unknown {
  if (!Number.isInteger(i) || i < 0 || i >= shared.length) {
    throw new Error(`The stored results are damaged: no shared value ${i}`);
  }
  return copyJson(shared[i]);
}

/** The results of a run from their stored text (either form); each bus with its own copy of every value. */
export function parseStoredResults(text: string): StudyResults {
  const stored = JSON.parse(text) as Record<string, unknown>;
  if (stored.storedFormat === undefined) return stored as unknown as StudyResults;
  if (stored.storedFormat !== STORED_RESULTS_FORMAT || !Array.isArray(stored.shared)) {
    throw new Error(`Stored results of an unknown form (${String(stored.storedFormat)})`);
  }
  const shared = stored.shared as unknown[];
  const results = stored.results as StudyResults;
  for (const b of results.buses) {
    const bus = b as unknown as Record<string, unknown>;
    if (typeof bus.equipment === 'number') bus.equipment = sharedAt(shared, bus.equipment);
    const lv = bus.labelValues as Record<string, unknown> | undefined;
    if (!lv) continue;
    for (const k of SHARED_LABEL_KEYS) {
      const v = lv[k];
      if (typeof v === 'number') lv[k] = sharedAt(shared, v);
    }
  }
  return results;
}
