import { gunzipSync, gzipSync } from 'node:zlib';
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
 *
 * A large run is computed in parts (contiguous ranges of its buses, each in a worker of its own), and each part keeps
 * its own list of shared values; its buses name values by their index in their part's list:
 *
 *   {"storedFormat":3,"parts":[{"from":0,"shared":[…]},{"from":5000,"shared":[…]}],"results":{…}}
 *
 * where `from` is the position of the part's first bus in `results.buses`. A run in one part is stored in form 2.
 *
 * A large run's text (its buses past `COMPRESS_BATCH_CHARS`) is stored compressed: `gzip-base64:` followed by the
 * base64 of a gzip (RFC 1952) of the text above, written as several gzip members one after the other (the buses are
 * compressed in batches as they are evaluated, so a large run never holds its whole text; the members decompress to
 * the text joined). A 10 000-bus plant's 40 MB of text is stored in about 5 MB.
 */

/** The form written for a run computed in one part. */
export const STORED_RESULTS_FORMAT = 2;
/** The form written for a run computed in several parts. */
export const STORED_RESULTS_PARTS_FORMAT = 3;

/** The start of a compressed stored text (never the start of JSON text). */
export const COMPRESSED_PREFIX = 'gzip-base64:';

/** Bus text is compressed in batches of about this many characters once a run's buses reach it. */
export const COMPRESS_BATCH_CHARS = 1 << 20;

/** gzip level of stored results: the fastest (JSON of results compresses about 10:1 even so). */
const GZIP_LEVEL = 1;

/**
 * One part's stored text: its shared values (JSON items joined by commas) and its buses, the same way, as text or —
 * for a large part — as gzip members whose text, joined, is that.
 */
export interface StoredResultsPiece {
  shared: string;
  buses: string | Uint8Array[];
  /** Buses in the piece. */
  count: number;
}

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
  /** Bus text not yet compressed (the buses' JSON and the commas between them) and its length. */
  private pending: string[] = [];
  private pendingChars = 0;
  /** The bus text compressed so far (gzip members), once it passed `COMPRESS_BATCH_CHARS`. */
  private readonly members: Uint8Array[] = [];
  private count = 0;

  /** Number of buses added. */
  get buses(): number {
    return this.count;
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
    const json = JSON.stringify(stored);
    if (this.count > 0) this.pending.push(',');
    this.pending.push(json);
    this.pendingChars += json.length + 1;
    this.count += 1;
    if (this.pendingChars >= COMPRESS_BATCH_CHARS) this.compressPending();
  }

  private compressPending(): void {
    if (this.pending.length) this.members.push(gzipSync(this.pending.join(''), { level: GZIP_LEVEL }));
    this.pending = [];
    this.pendingChars = 0;
  }

  /** What was added, as one part of a run's stored text (`storedResultsFromPieces`). */
  piece(): StoredResultsPiece {
    const shared = this.sharedJson.join(',');
    if (!this.members.length) return { shared, buses: this.pending.join(''), count: this.count };
    this.compressPending();
    return { shared, buses: [...this.members], count: this.count };
  }

  /** The stored text: `results` with the buses added (its own `buses` is ignored). */
  text(results: StudyResults): string {
    return storedResultsFromPieces(results, [this.piece()]);
  }
}

/**
 * The stored text of a run from the pieces of its parts, in the order of their buses, and `results` for everything
 * but the buses (its own `buses` is ignored): form 2 for one piece, form 3 for several; compressed when any piece is.
 */
export function storedResultsFromPieces(results: StudyResults, pieces: readonly StoredResultsPiece[]): string {
  const head = JSON.stringify({ ...results, buses: [] });
  const key = '"buses":[]';
  // A quote outside a string value is a delimiter in JSON text (inside one it is escaped), so the first
  // `"buses":[]` is the results' own key: the keys before it hold a string and numbers only.
  const at = head.indexOf(key);
  if (at < 0) throw new Error('The study results have no buses array');
  let start: string;
  if (pieces.length === 1) {
    start = `{"storedFormat":${STORED_RESULTS_FORMAT},"shared":[${pieces[0].shared}],"results":`;
  } else {
    let from = 0;
    const parts = pieces.map((p) => {
      const part = `{"from":${from},"shared":[${p.shared}]}`;
      from += p.count;
      return part;
    });
    start = `{"storedFormat":${STORED_RESULTS_PARTS_FORMAT},"parts":[${parts.join(',')}],"results":`;
  }
  const before = `${start}${head.slice(0, at)}"buses":[`;
  const after = `]${head.slice(at + key.length)}}`;
  const filled = pieces.filter((p) => p.count > 0);
  if (filled.every((p) => typeof p.buses === 'string'))
    return `${before}${filled.map((p) => p.buses).join(',')}${after}`;
  // Compressed: gzip members of the same text, one after the other.
  const z = (text: string) => gzipSync(text, { level: GZIP_LEVEL });
  const members: Uint8Array[] = [z(before)];
  filled.forEach((p, i) => {
    if (i > 0) members.push(z(','));
    if (typeof p.buses === 'string') members.push(z(p.buses));
    else members.push(...p.buses);
  });
  members.push(z(after));
  return COMPRESSED_PREFIX + Buffer.concat(members).toString('base64');
}

/** The JSON text of a stored text: as it is, or decompressed. */
export function storedJsonText(text: string): string {
  if (!text.startsWith(COMPRESSED_PREFIX)) return text;
  return gunzipSync(Buffer.from(text.slice(COMPRESSED_PREFIX.length), 'base64')).toString('utf8');
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

/** The parts of a form-3 text, checked: the first starts at bus 0, each at or after the one before. */
function partsOf(stored: Record<string, unknown>, busCount: number): { from: number; shared: unknown[] }[] {
  const parts = stored.parts;
  const damaged = () => new Error('The stored results are damaged: their parts do not cover the buses');
  if (!Array.isArray(parts) || parts.length === 0) throw damaged();
  let last = 0;
  return parts.map((p: unknown, i) => {
    const part = p as { from?: unknown; shared?: unknown };
    const from = part.from;
    if (typeof from !== 'number' || !Number.isInteger(from) || !Array.isArray(part.shared)) throw damaged();
    if ((i === 0 && from !== 0) || from < last || from > busCount) throw damaged();
    last = from;
    return { from, shared: part.shared as unknown[] };
  });
}

/** The results of a run from their stored text (any form); each bus with its own copy of every value. */
export function parseStoredResults(text: string): StudyResults {
  const stored = JSON.parse(storedJsonText(text)) as Record<string, unknown>;
  if (stored.storedFormat === undefined) return stored as unknown as StudyResults;
  const results = stored.results as StudyResults;
  let parts: { from: number; shared: unknown[] }[];
  if (stored.storedFormat === STORED_RESULTS_FORMAT && Array.isArray(stored.shared)) {
    parts = [{ from: 0, shared: stored.shared as unknown[] }];
  } else if (stored.storedFormat === STORED_RESULTS_PARTS_FORMAT) {
    parts = partsOf(stored, results.buses.length);
  } else {
    throw new Error(`Stored results of an unknown form (${String(stored.storedFormat)})`);
  }
  let part = 0;
  let shared = parts[0].shared;
  for (let i = 0; i < results.buses.length; i++) {
    while (part + 1 < parts.length && parts[part + 1].from <= i) shared = parts[++part].shared;
    const bus = results.buses[i] as unknown as Record<string, unknown>;
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
