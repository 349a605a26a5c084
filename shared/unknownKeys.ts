import type { z } from 'zod';

/**
 * Keys of an untrusted input that its zod schema does not know (docs/MODEL-FORMAT.md, Import and export): a
 * misspelt field (`workingDistanceMM`) would otherwise be dropped without a word and its default used. The input is
 * walked against the schema's shapes through zod 4's public `def`: objects (their `shape`; an object that accepts
 * any key — `.loose()`/`.catchall()` — is not checked), discriminated unions (the option its discriminator
 * selects), other unions (the option that fits best), arrays, tuples, records (keys checked when the record's key
 * is an enum), and the wrappers (optional, nullable, default, readonly, catch, pipe, lazy). Values of the wrong type
 * are left to the schema's own parse.
 */

export interface UnknownKey {
  /** Path of the unknown key in the model's notation: `buses[3].equipment.workingDistanceMM`. */
  path: string;
  /** The path as its parts. */
  parts: (string | number)[];
  key: string;
  /** The known key it most likely stands for, or undefined when none is close. */
  suggestion?: string;
  /** The keys known at that place. */
  known: string[];
  /** `unknown field — did you mean workingDistanceMm?` */
  message: string;
}

/** At most this many unknown keys are reported (a file of a different format would otherwise list thousands). */
export const MAX_UNKNOWN_KEYS = 100;

/** Levenshtein distance with adjacent transpositions (optimal string alignment), case as given. */
export function editDistance(a: string, b: string): number {
  const d: number[][] = Array.from({ length: a.length + 1 }, (_, i) => [i, ...new Array<number>(b.length).fill(0)]);
  for (let j = 1; j <= b.length; j += 1) d[0][j] = j;
  for (let i = 1; i <= a.length; i += 1) {
    for (let j = 1; j <= b.length; j += 1) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) {
        d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
      }
    }
  }
  return d[a.length][b.length];
}

/**
 * The known key a misspelt one stands for: the same letters in another case first, else the nearest by edit distance
 * (case-insensitive) within 1 edit for keys of up to 4 characters, 2 for up to 8 and 3 beyond; ties go to the first
 * known key. Undefined when nothing is that close.
 */
export function suggestKey(key: string, known: readonly string[]): string | undefined {
  const lower = key.toLowerCase();
  const sameLetters = known.find((k) => k.toLowerCase() === lower);
  if (sameLetters !== undefined) return sameLetters;
  if (key.length > 200) return undefined; // nobody misspells a 200-character field name
  const limit = key.length <= 4 ? 1 : key.length <= 8 ? 2 : 3;
  let best: string | undefined;
  let bestDistance = limit + 1;
  for (const k of known) {
    if (Math.abs(k.length - key.length) > limit) continue;
    const distance = editDistance(lower, k.toLowerCase());
    if (distance < bestDistance) {
      best = k;
      bestDistance = distance;
    }
  }
  return best;
}

function unknownKeyMessage(suggestion: string | undefined, known: readonly string[]): string {
  if (suggestion !== undefined) return `unknown field — did you mean ${suggestion}?`;
  if (known.length === 0) return 'unknown field — nothing is expected here';
  const listed = known.length > 20 ? `${known.slice(0, 20).join(', ')} …` : known.join(', ');
  return `unknown field — the fields here are ${listed}`;
}

function formatPath(parts: readonly (string | number)[]): string {
  let out = '';
  for (const part of parts) out += typeof part === 'number' ? `[${part}]` : out === '' ? part : `.${part}`;
  return out;
}

const isPlainObject = (v: unknown): v is Record<string, unknown> =>
  v !== null && typeof v === 'object' && !Array.isArray(v);

/** The parts of a zod 4 schema's definition this walk reads (all public: `schema.def`). */
interface Def {
  type: string;
  shape?: Record<string, z.ZodType>;
  catchall?: z.ZodType;
  innerType?: z.ZodType;
  element?: z.ZodType;
  items?: z.ZodType[];
  rest?: z.ZodType | null;
  options?: z.ZodType[];
  discriminator?: string;
  keyType?: z.ZodType;
  valueType?: z.ZodType;
  in?: z.ZodType;
  out?: z.ZodType;
  getter?: () => z.ZodType;
  entries?: Record<string, string | number>;
  values?: unknown[];
}

const defOf = (schema: z.ZodType): Def => (schema as unknown as { def: Def }).def;

/** Wrappers whose inner schema describes the value. */
const WRAPPERS = new Set(['optional', 'nullable', 'default', 'prefault', 'readonly', 'catch', 'nonoptional']);

/** The object shape (or null) of a schema behind its wrappers. */
function objectDef(schema: z.ZodType): Def | null {
  let def = defOf(schema);
  for (let i = 0; i < 20; i += 1) {
    if (def.type === 'object') return def;
    if (WRAPPERS.has(def.type) && def.innerType) def = defOf(def.innerType);
    else if (def.type === 'pipe' && def.in) def = defOf(def.in);
    else if (def.type === 'lazy' && def.getter) def = defOf(def.getter());
    else return null;
  }
  return null;
}

/** The literal values of a discriminator field (a literal or an enum, behind wrappers). */
function literalValues(schema: z.ZodType | undefined): unknown[] {
  if (!schema) return [];
  const def = defOf(schema);
  if (def.type === 'literal') return def.values ?? [];
  if (def.type === 'enum') return Object.values(def.entries ?? {});
  if (WRAPPERS.has(def.type)) return literalValues(def.innerType);
  return [];
}

/** A discriminated union's options by their discriminator's values (built once per union). */
const optionsByTag = new WeakMap<Def, Map<unknown, z.ZodType>>();

function optionFor(def: Def, tag: unknown): z.ZodType | undefined {
  let byTag = optionsByTag.get(def);
  if (!byTag) {
    byTag = new Map();
    // The first option that lists a value wins (as a search in order would find it).
    for (const o of def.options ?? []) {
      for (const v of literalValues(objectDef(o)?.shape?.[def.discriminator!])) if (!byTag.has(v)) byTag.set(v, o);
    }
    optionsByTag.set(def, byTag);
  }
  return byTag.get(tag);
}

/**
 * Unknown keys of `input` against `schema`, in document order, at most MAX_UNKNOWN_KEYS. The path is one stack,
 * pushed and popped as the walk goes (copied only for a key reported): a large model is walked without a path copy
 * per field.
 */
export function findUnknownKeys(schema: z.ZodType, input: unknown): UnknownKey[] {
  const found: UnknownKey[] = [];
  const parts: (string | number)[] = [];
  const report = (key: string, known: string[]) => {
    if (found.length >= MAX_UNKNOWN_KEYS) return;
    const suggestion = suggestKey(key, known);
    const all = [...parts, key];
    found.push({
      path: formatPath(all),
      parts: all,
      key,
      suggestion,
      known,
      message: unknownKeyMessage(suggestion, known),
    });
  };

  /** The walk one level down, at `part`. */
  const child = (s: z.ZodType, value: unknown, part: string | number, depth: number): void => {
    parts.push(part);
    walk(s, value, depth + 1);
    parts.pop();
  };

  const walk = (s: z.ZodType, value: unknown, depth: number): void => {
    if (found.length >= MAX_UNKNOWN_KEYS || depth > 64) return;
    const def = defOf(s);
    switch (def.type) {
      case 'object': {
        if (!isPlainObject(value)) return;
        const shape = def.shape ?? {};
        const catchallType = def.catchall ? defOf(def.catchall).type : 'never';
        const open = catchallType !== 'never';
        for (const key of Object.keys(value)) {
          if (Object.prototype.hasOwnProperty.call(shape, key)) child(shape[key], value[key], key, depth);
          else if (open) {
            if (def.catchall && catchallType !== 'unknown' && catchallType !== 'any')
              child(def.catchall, value[key], key, depth);
          } else report(key, Object.keys(shape));
        }
        return;
      }
      case 'array':
        if (Array.isArray(value) && def.element) {
          for (let i = 0; i < value.length; i++) child(def.element, value[i], i, depth);
        }
        return;
      case 'tuple':
        if (Array.isArray(value)) {
          for (let i = 0; i < value.length; i++) {
            const item = def.items?.[i] ?? def.rest ?? undefined;
            if (item) child(item, value[i], i, depth);
          }
        }
        return;
      case 'record': {
        if (!isPlainObject(value) || !def.valueType) return;
        const keyValues = literalValues(def.keyType).filter((k): k is string => typeof k === 'string');
        for (const key of Object.keys(value)) {
          if (keyValues.length > 0 && !keyValues.includes(key)) report(key, keyValues);
          else child(def.valueType, value[key], key, depth);
        }
        return;
      }
      case 'union': {
        const options = def.options ?? [];
        if (def.discriminator !== undefined) {
          if (!isPlainObject(value)) return;
          const chosen = optionFor(def, value[def.discriminator]);
          if (chosen) walk(chosen, value, depth + 1);
          return; // an unknown kind is the schema's own error
        }
        // Another union: the option with the fewest unknown keys (none: the value fits one of them).
        let best: UnknownKey[] | null = null;
        for (const option of options) {
          const sub = findUnknownKeysAt(option, value, depth + 1);
          if (best === null || sub.length < best.length) best = sub;
          if (sub.length === 0) break;
        }
        for (const k of best ?? []) if (found.length < MAX_UNKNOWN_KEYS) found.push(k);
        return;
      }
      case 'intersection':
        return; // keys may belong to either side: left to the schema
      case 'pipe':
        if (def.in) walk(def.in, value, depth + 1);
        return;
      case 'lazy':
        if (def.getter) walk(def.getter(), value, depth + 1);
        return;
      default:
        if (WRAPPERS.has(def.type) && def.innerType) walk(def.innerType, value, depth + 1);
    }
  };

  /** The same walk from the place the path stands at, collected apart (for trying a union's options). */
  const findUnknownKeysAt = (s: z.ZodType, value: unknown, depth: number) => {
    const saved = found.splice(0, found.length);
    walk(s, value, depth);
    const sub = found.splice(0, found.length);
    found.push(...saved);
    return sub;
  };

  walk(schema, input, 0);
  return found;
}
