import { z } from 'zod';
import {
  MODEL_FORMAT,
  MODEL_VERSION,
  busSchema,
  cableSchema,
  motorSchema,
  placedDeviceSchema,
  scenarioSchema,
  sourceSchema,
  tieSchema,
  transformerSchema,
  type Model,
  type ModelIssue,
} from '../../shared/schemas/model';

/**
 * The system model as flat tables: one table per element type, one column per field. The workbook
 * (modelWorkbook.ts) and the CSV files (modelCsv.ts) share these tables; this module turns elements into rows and
 * rows back into elements, and maps a model issue back to the sheet (or file), row and column it came from.
 *
 * Headers are the field paths of the JSON format (docs/MODEL-FORMAT.md), nested fields joined by dots
 * (`equipment.enclosureMm.height`); units are part of the names (`nominalKv`, `gapMm`, `lengthM`). The columns are
 * generated from the zod shapes of shared/schemas/model.ts, in the order of the shapes, so a field added there is a
 * column here. Device settings are too deep for flat columns: a device row carries its device object as JSON.
 * Operating scenarios are nested records (by source, tie and motor id): their table has one row per scenario and
 * element it overrides (`scenarioColumns`).
 */

// ---------------------------------------------------------------------------------------------
// Errors

/** One problem in an uploaded file, located as precisely as the format allows. */
export interface ImportError {
  /** File name as uploaded. */
  file: string;
  /** Workbook sheet name (workbooks only). */
  sheet?: string;
  /** 1-based row: the row number Excel shows, or the line number in a CSV file. */
  row?: number;
  /** Column header and letter, e.g. `lengthM (D)`; the bare header when the column is missing. */
  column?: string;
  /** 1-based line and column of a JSON syntax error. */
  line?: number;
  col?: number;
  /** Model path of the problem, e.g. `cables[2].toBus` (model checks only). */
  path?: string;
  /** Id of the element at fault, when known. */
  elementId?: string;
  /** Where, in words: `Cables row 5, toBus (C)`, `cables.csv line 5, toBus (C)`, `model.json cables[2].toBus`. */
  where: string;
  message: string;
}

/** The result of reading one upload (one workbook, a set of CSV files, one JSON file), before model checks. */
export type ParsedModelFile =
  | {
      ok: true;
      /** The model as read: not yet validated, run `parseModel` on it. */
      input: unknown;
      /** Where a model issue came from in the upload. */
      locate: (issue: ModelIssue) => ImportError;
    }
  | { ok: false; errors: ImportError[] };

// ---------------------------------------------------------------------------------------------
// Tables and columns

export const ELEMENT_TABLES = ['buses', 'sources', 'transformers', 'cables', 'motors', 'ties', 'devices'] as const;
export type ElementTable = (typeof ELEMENT_TABLES)[number];
/** The operating scenarios' table: one row per scenario and element (source, tie or motor) it overrides. */
export const SCENARIO_TABLE = 'scenarios' as const;
/**
 * Every table of the flat format: the `about` table (model-level fields), one per element type, and the operating
 * scenarios.
 */
export const MODEL_TABLES = ['about', ...ELEMENT_TABLES, SCENARIO_TABLE] as const;
export type ModelTable = (typeof MODEL_TABLES)[number];

/** Sheet names in the workbook (also the display names of the CSV files' tables). */
export const TABLE_TITLES: Record<ModelTable, string> = {
  about: 'About',
  buses: 'Buses',
  sources: 'Sources',
  transformers: 'Transformers',
  cables: 'Cables',
  motors: 'Motors',
  ties: 'Ties',
  devices: 'Devices',
  scenarios: 'Scenarios',
};

/**
 * How a cell is read: text, number, boolean, a JSON object, or (About `value` only) as it is. `number-or-none`: a
 * number, or the word `none` for an explicit null (e.g. no arc-duration cap at a bus); empty means omitted.
 */
export type ColumnType = 'string' | 'number' | 'number-or-none' | 'boolean' | 'json' | 'raw';

export interface Column {
  /** Header text, the field path joined by dots. */
  header: string;
  path: readonly string[];
  type: ColumnType;
  /** The header must be present, and every row must give a value. */
  required?: boolean;
  /** The column applies only to rows whose `when.column` holds one of `when.values` (e.g. generator fields). */
  when?: { column: string; values: readonly string[] };
  /** Short help for the header cell (workbook note). */
  note?: string;
  /** Scenarios table: the kinds of element (the row's `element`) an override column applies to. */
  elementKinds?: readonly ScenarioElementKind[];
}

/** The kinds of element an operating scenario overrides, found from the model's ids on import. */
export type ScenarioElementKind = 'source' | 'tie' | 'motor';

/**
 * Spreadsheet help for the header cells (workbook notes), by header. The headers themselves, their types, whether
 * they are required and which source kind they apply to come from the zod shapes of the model (`elementColumns`).
 */
const NOTES: Record<ElementTable, Record<string, string>> = {
  buses: {
    nominalKv: 'Nominal line-to-line voltage, kV',
    'equipment.class': 'Equipment class id, e.g. switchgear-lv',
    'equipment.electrodeConfig': 'VCB, VCBB, HCB, VOA or HOA; empty: typical of the class',
    'equipment.gapMm': 'Gap between conductors, mm; empty: typical of the class',
    'equipment.workingDistanceMm': 'Working distance, mm; empty: typical of the class',
    'equipment.enclosureMm.height': 'Enclosure height, mm',
    'equipment.enclosureMm.width': 'Enclosure width, mm',
    'equipment.enclosureMm.depth': 'Enclosure depth, mm',
    'equipment.mainIsolated':
      'TRUE: main isolated from the bus; FALSE: shares the enclosure; empty: not stated, treated as FALSE',
    'equipment.arcDurationCapS':
      "Arc-duration cap at this bus, s; none: no cap (the clearing time stands); empty: the study's cap",
    'equipment.arcDurationCapReason': 'Why this bus has its own cap (required with a cap)',
  },
  sources: {
    kind: 'utility or generator',
    shortCircuitMva: 'Utility: available three-phase MVA (or kA)',
    shortCircuitKa: 'Utility: available three-phase kA (or MVA)',
    xr: 'X/R ratio',
    kva: 'Generator: rated kVA',
    kv: 'Generator: rated line-to-line kV',
    subtransientPct: 'Generator: subtransient reactance, % on rating',
    transientPct: "Generator: transient reactance X'd, % on rating; empty: typical value, with a warning",
    synchronousPct: 'Generator: synchronous reactance Xd, % on rating; empty: typical value, with a warning',
    sustainedCurrentMultiple:
      'Generator: sustained fault current with excitation support, × rated current (instead of Xd)',
    subtransientTimeConstantS: 'Generator: short-circuit subtransient time constant T"d, s; empty: typical value',
    transientTimeConstantS: "Generator: short-circuit transient time constant T'd, s; empty: typical value",
  },
  transformers: {
    fromBus: 'Primary-side bus',
    toBus: 'Secondary-side bus',
    kva: 'Self-cooled rating, kVA',
    impedancePct: '%Z on the transformer rating',
    xr: 'X/R ratio; empty: typical by size',
  },
  cables: {
    lengthM: 'Route length, m',
    sets: 'Parallel sets per phase; empty: 1',
    size: 'AWG or kcmil, e.g. 4/0 or 500 (or give rOhmPerKm and xOhmPerKm)',
    material: 'Cu or Al',
    conduit: 'steel, pvc or aluminum',
    rOhmPerKm: 'Resistance of one conductor, ohm/km (instead of size)',
    xOhmPerKm: 'Reactance of one conductor, ohm/km (instead of size)',
  },
  motors: {
    hp: 'Rated horsepower (or kva)',
    kva: 'Rated kVA (or hp)',
    kv: 'Rated line-to-line kV',
    lockedRotorMultiple: 'Locked-rotor current, multiple of rated',
    subtransientPct: 'Subtransient reactance, % on motor kVA',
    firstCycleMultiplier: 'Multiplier on X" for the first-cycle network',
    rpm: 'Synchronous speed, rpm (medium-voltage multipliers); empty: 3600 where it matters',
    xr: 'X/R ratio; empty: typical value',
  },
  ties: {
    closed: 'TRUE or FALSE; empty: TRUE',
  },
  devices: {
    branch: 'Transformer, cable or tie id (or source)',
    end: 'from or to (with branch)',
    source: 'Source or motor id (instead of branch)',
    'device.kind': 'relay, fuse, band, thermal-magnetic or electronic (repeats the device column)',
    device: 'The device object as JSON',
    library: 'Library device type and switch positions, as JSON',
    onlyAt:
      'Acts only for arcs at these buses, as JSON: {"busIds": [...], "purpose": "arc-flash-relay" or "maintenance-switch"}; empty: every fault',
  },
};

/** The zod shape of one element of each table. */
const ELEMENT_SCHEMAS: Record<ElementTable, z.ZodType> = {
  buses: busSchema,
  sources: sourceSchema,
  transformers: transformerSchema,
  cables: cableSchema,
  motors: motorSchema,
  ties: tieSchema,
  devices: placedDeviceSchema,
};

/** Fields kept whole in one JSON cell: device settings are too deep for flat columns. */
const JSON_FIELDS = new Set(['device', 'library', 'onlyAt']);

/** The columns of one object shape: nested objects flattened to dotted paths, in the order of the shape. */
function objectColumns(schema: z.ZodObject, prefix: readonly string[], parentRequired: boolean): Column[] {
  const out: Column[] = [];
  for (const [key, field] of Object.entries(schema.shape)) {
    let s: z.ZodType = field;
    let optional = false;
    let nullable = false;
    for (;;) {
      if (s instanceof z.ZodOptional || s instanceof z.ZodDefault) optional = true;
      else if (s instanceof z.ZodNullable) nullable = true;
      else break;
      s = (s as z.ZodOptional | z.ZodDefault | z.ZodNullable).unwrap() as z.ZodType;
    }
    const path = [...prefix, key];
    const header = path.join('.');
    const required = parentRequired && !optional;
    if (JSON_FIELDS.has(header)) {
      out.push({ header, path, type: 'json', required });
    } else if (s instanceof z.ZodObject) {
      out.push(...objectColumns(s, path, required));
    } else if (s instanceof z.ZodNumber) {
      out.push({ header, path, type: nullable ? 'number-or-none' : 'number', required });
    } else if (s instanceof z.ZodBoolean) {
      out.push({ header, path, type: 'boolean', required });
    } else if (s instanceof z.ZodString || s instanceof z.ZodEnum || s instanceof z.ZodLiteral) {
      out.push({ header, path, type: 'string', required });
    } else {
      throw new Error(`No column type for ${header}`);
    }
  }
  return out;
}

/**
 * The columns of one element table, from its zod shape. A discriminated union (sources) gives the columns of every
 * variant once: a column of every variant is required where every variant requires it, a column of some variants
 * applies only to rows of those kinds (`when`).
 */
function elementColumns(table: ElementTable): Column[] {
  const schema = ELEMENT_SCHEMAS[table];
  let columns: Column[];
  if (schema instanceof z.ZodDiscriminatedUnion) {
    const key = schema._zod.def.discriminator;
    const variants = (schema.options as z.ZodObject[]).map((o) => ({
      value: String((o.shape[key] as z.ZodLiteral).value),
      columns: objectColumns(o, [], true),
    }));
    columns = [];
    for (const v of variants) {
      for (const c of v.columns) {
        if (columns.some((x) => x.header === c.header)) continue;
        const having = variants.filter((w) => w.columns.some((x) => x.header === c.header));
        const required = having.every((w) => w.columns.find((x) => x.header === c.header)?.required);
        columns.push({
          ...c,
          required: having.length === variants.length && required,
          ...(having.length < variants.length ? { when: { column: key, values: having.map((w) => w.value) } } : {}),
        });
      }
    }
  } else if (schema instanceof z.ZodObject) {
    columns = objectColumns(schema, [], true);
  } else {
    throw new Error(`No columns for ${table}`);
  }
  if (table === 'devices') {
    // The device kind again, for sorting and filtering in a spreadsheet (the device column is JSON).
    const at = columns.findIndex((c) => c.header === 'device');
    columns.splice(at, 0, { header: 'device.kind', path: ['device', 'kind'], type: 'string', required: false });
  }
  // A note whose field was renamed or removed in the schema must not linger unseen.
  const orphan = Object.keys(NOTES[table]).find((h) => !columns.some((c) => c.header === h));
  if (orphan) throw new Error(`Note for ${table}.${orphan}, which is not a field of the model`);
  return columns.map(({ required, ...c }) => ({
    ...c,
    ...(required ? { required } : {}),
    ...(NOTES[table][c.header] ? { note: NOTES[table][c.header] } : {}),
  }));
}

/** The scenario's maps of overrides, by element id, and the kind of element each map holds. */
const SCENARIO_MAPS: Record<string, ScenarioElementKind> = { sources: 'source', ties: 'tie', motors: 'motor' };
/** Headers of the scenario's own fields where the field name alone would be ambiguous beside an element's. */
const SCENARIO_HEADERS: Record<string, string> = { id: 'scenario', name: 'scenarioName' };
/** The column that names the element a row overrides. */
const ELEMENT_HEADER = 'element';

const SCENARIO_NOTES: Record<string, string> = {
  scenario: 'Scenario id (not base: the model as written is the base); one row per element it overrides',
  scenarioName: 'Scenario name, on any one of its rows',
  allMotorsOff: "TRUE: every motor stopped in this scenario (a motor's own row wins), on any one of its rows",
  element: 'Source, tie or motor id whose state this row changes; empty on a row that only gives the scenario',
  inService: 'Source or motor: FALSE out of service (motor stopped), TRUE in service; empty: as in the model',
  shortCircuitMva: 'Utility source: available three-phase MVA in this scenario (or kA); empty: as in the model',
  shortCircuitKa: 'Utility source: available three-phase kA in this scenario (or MVA); empty: as in the model',
  xr: 'Source: X/R ratio in this scenario; empty: as in the model',
  closed: 'Tie: TRUE closed or FALSE open in this scenario',
};

/**
 * The columns of the Scenarios table, from the zod shape of a scenario: the scenario's own fields (`id` as
 * `scenario`, `name` as `scenarioName`, `allMotorsOff`), then `element` (a source, tie or motor id), then the fields
 * of the overrides, each once, with the kinds of element it applies to.
 */
function scenarioColumns(): Column[] {
  const level: Column[] = [];
  const overrides: Column[] = [];
  for (const [key, field] of Object.entries(scenarioSchema.shape)) {
    const inner = (field instanceof z.ZodOptional ? field.unwrap() : field) as z.ZodType;
    if (inner instanceof z.ZodRecord) {
      const kind = SCENARIO_MAPS[key];
      if (!kind || !(inner.valueType instanceof z.ZodObject)) throw new Error(`No columns for scenarios.${key}`);
      for (const c of objectColumns(inner.valueType, [], false)) {
        const known = overrides.find((x) => x.header === c.header);
        if (known) known.elementKinds = [...known.elementKinds!, kind];
        else overrides.push({ ...c, elementKinds: [kind] });
      }
    } else {
      const header = SCENARIO_HEADERS[key] ?? key;
      const [c] = objectColumns(z.object({ [header]: field }), [], true);
      level.push(c);
    }
  }
  const columns = [...level, { header: ELEMENT_HEADER, path: [ELEMENT_HEADER], type: 'string' as const }, ...overrides];
  const orphan = Object.keys(SCENARIO_NOTES).find((h) => !columns.some((c) => c.header === h));
  if (orphan) throw new Error(`Note for scenarios.${orphan}, which is not a column`);
  return columns.map(({ required, ...c }) => ({
    ...c,
    ...(required ? { required } : {}),
    ...(SCENARIO_NOTES[c.header] ? { note: SCENARIO_NOTES[c.header] } : {}),
  }));
}

/** Which scenario field a scenario-level column holds: `scenarioName` → `name`. */
const scenarioFieldOf = (header: string) =>
  Object.entries(SCENARIO_HEADERS).find(([, h]) => h === header)?.[0] ?? header;

export const TABLE_COLUMNS: Record<ModelTable, readonly Column[]> = {
  about: [
    { header: 'field', path: ['field'], type: 'string', required: true },
    { header: 'value', path: ['value'], type: 'raw' },
    { header: 'note', path: ['note'], type: 'string', note: 'Help text, ignored on import' },
  ],
  buses: elementColumns('buses'),
  sources: elementColumns('sources'),
  transformers: elementColumns('transformers'),
  cables: elementColumns('cables'),
  motors: elementColumns('motors'),
  ties: elementColumns('ties'),
  devices: elementColumns('devices'),
  scenarios: scenarioColumns(),
};

/** Model-level fields listed in the About table, with how their value is read. */
const ABOUT_FIELDS: Record<string, { type: 'string' | 'number'; note: string }> = {
  format: { type: 'string', note: `Always ${MODEL_FORMAT}` },
  version: { type: 'number', note: `Format version (${MODEL_VERSION})` },
  name: { type: 'string', note: 'Model name' },
  frequencyHz: { type: 'number', note: 'System frequency, Hz: 50 or 60 (empty: 60)' },
  prefaultPu: { type: 'number', note: 'Pre-fault voltage, per unit (empty: 1.0)' },
};

/** General notes written below the About fields (field and value left empty, so import skips them). */
export const ABOUT_NOTES = [
  `One table per element type: ${ELEMENT_TABLES.map((t) => TABLE_TITLES[t]).join(', ')}. One row per element; empty rows are skipped.`,
  'Headers are the field names of the JSON model format; nested fields are joined by dots (equipment.enclosureMm.height). Units are part of the names: Kv kV, Mm mm, M metres, Pct percent, OhmPerKm ohm/km.',
  'Leave a cell empty where the field does not apply or its default is wanted. Booleans: TRUE or FALSE (yes or no).',
  'Scenarios: one row per operating scenario and source, tie or motor (element) whose state it changes; a row with no element gives a scenario that changes nothing else or only allMotorsOff. scenarioName and allMotorsOff may stand on any one row of the scenario. An empty cell keeps the model as written. The model as written (base) is always run besides.',
  'Devices: the device column holds the device object (relay, fuse, band, thermal-magnetic or electronic) as JSON, and the library column the library reference as JSON, because device settings are too deep for flat columns. device.kind repeats the kind for sorting and filtering.',
  'Unknown sheets, files and columns are rejected, so that a misspelt header is not silently ignored.',
];

/** File name of a table's CSV file: `buses` → buses.csv. */
export const csvFileName = (table: ModelTable) => `${table}.csv`;

/** Excel column letters: 0 → A, 25 → Z, 26 → AA. */
export function columnLetter(index0: number): string {
  let n = index0 + 1;
  let out = '';
  while (n > 0) {
    const rem = (n - 1) % 26;
    out = String.fromCharCode(65 + rem) + out;
    n = Math.floor((n - 1) / 26);
  }
  return out;
}

const headerKey = (text: string) => text.trim().toLowerCase();

// ---------------------------------------------------------------------------------------------
// Model → rows

/** A cell as the workbook and CSV readers hand it over; `{ invalid }` is a cell that cannot be read (a date, #REF!). */
export type Cell = string | number | boolean | null | { invalid: string };

function getPath(value: unknown, path: readonly string[]): unknown {
  let v = value;
  for (const key of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<string, unknown>)[key];
  }
  return v;
}

function toCell(column: Column, value: unknown): string | number | boolean | null {
  if (value === null && column.type === 'number-or-none') return 'none';
  if (value === undefined || value === null) return null;
  if (column.type === 'json') return JSON.stringify(value);
  if (typeof value === 'string' || typeof value === 'number' || typeof value === 'boolean') return value;
  return JSON.stringify(value);
}

/** The rows of one table (header row not included), in column order. */
export function tableRows(model: Model, table: ModelTable): (string | number | boolean | null)[][] {
  if (table === 'about') {
    const rows: (string | number | boolean | null)[][] = Object.entries(ABOUT_FIELDS).map(([field, spec]) => [
      field,
      toCell(TABLE_COLUMNS.about[1], (model as Record<string, unknown>)[field]),
      spec.note,
    ]);
    return [...rows, ...ABOUT_NOTES.map((note) => [null, null, note])];
  }
  if (table === SCENARIO_TABLE) return scenarioRows(model);
  const columns = TABLE_COLUMNS[table];
  const elements = (model[table] ?? []) as unknown[];
  return elements.map((element) => columns.map((c) => toCell(c, getPath(element, c.path))));
}

/**
 * The Scenarios rows: one per scenario and element it overrides, the scenario's own fields on its first row; a
 * scenario that overrides no element has one row with no element. No scenarios, no rows.
 */
function scenarioRows(model: Model): (string | number | boolean | null)[][] {
  const columns = TABLE_COLUMNS.scenarios;
  const row = (values: Record<string, unknown>) => columns.map((c) => toCell(c, values[c.header]));
  const rows: (string | number | boolean | null)[][] = [];
  for (const scenario of model.scenarios ?? []) {
    const own: Record<string, unknown> = {};
    for (const c of columns) {
      if (c.elementKinds || c.header === ELEMENT_HEADER) continue;
      own[c.header] = (scenario as Record<string, unknown>)[scenarioFieldOf(c.header)];
    }
    const overrides = Object.keys(SCENARIO_MAPS).flatMap((key) =>
      Object.entries((scenario as Record<string, unknown>)[key] ?? {}).map(([id, o]) => ({
        [ELEMENT_HEADER]: id,
        ...(o as Record<string, unknown>),
      })),
    );
    if (overrides.length === 0) rows.push(row(own));
    overrides.forEach((o, i) => rows.push(row({ ...(i === 0 ? own : { [SCENARIO_HEADERS.id]: scenario.id }), ...o })));
  }
  return rows;
}

// ---------------------------------------------------------------------------------------------
// Rows → model

/** Where a table was read from. */
export interface TableSource {
  table: ModelTable;
  file: string;
  /** Workbook sheet name; absent for CSV. */
  sheet?: string;
  /** Header cells of row 1, in order. */
  header: Cell[];
  /** Data rows with their 1-based row (or line) numbers. */
  rows: { row: number; cells: Cell[] }[];
}

/** A problem found while reading a table, before it is given its place in words. */
type Located = Omit<ImportError, 'where'>;

interface ReadColumn {
  column: Column;
  index: number;
  /** Header as written in the file, with its letter: `lengthM (D)`. */
  label: string;
}

interface ReadTable {
  source: TableSource;
  columns: ReadColumn[];
  /** Row number of each element, in element order. */
  rowOf: number[];
  /** About table: row number of each field. */
  fieldRows: Map<string, number>;
}

const isBlank = (cell: Cell | undefined) =>
  cell === null || cell === undefined || (typeof cell === 'string' && cell.trim() === '');
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const TRUE_WORDS = new Set(['true', 'yes', 'y', '1']);
const FALSE_WORDS = new Set(['false', 'no', 'n', '0']);

/** Reads one non-blank cell as its column's type; a string result is an error message. */
function readCell(type: ColumnType, cell: Exclude<Cell, null>): { value: unknown } | string {
  if (typeof cell === 'object') return cell.invalid;
  switch (type) {
    case 'raw':
      return { value: typeof cell === 'string' ? cell.trim() : cell };
    case 'string':
      return {
        value:
          typeof cell === 'string'
            ? cell.trim()
            : typeof cell === 'boolean'
              ? String(cell).toUpperCase()
              : String(cell),
      };
    case 'number-or-none':
      if (typeof cell === 'string' && cell.trim().toLowerCase() === 'none') return { value: null };
      if (typeof cell === 'number') return Number.isFinite(cell) ? { value: cell } : 'Enter a number or none';
      if (typeof cell === 'string' && NUMBER.test(cell.trim())) return { value: Number(cell.trim()) };
      return 'Enter a number or none';
    case 'number': {
      if (typeof cell === 'number') return Number.isFinite(cell) ? { value: cell } : 'Enter a number';
      if (typeof cell === 'string' && NUMBER.test(cell.trim())) return { value: Number(cell.trim()) };
      return 'Enter a number';
    }
    case 'boolean': {
      if (typeof cell === 'boolean') return { value: cell };
      const word = String(cell).trim().toLowerCase();
      if (TRUE_WORDS.has(word)) return { value: true };
      if (FALSE_WORDS.has(word)) return { value: false };
      return 'Enter TRUE or FALSE';
    }
    case 'json': {
      if (typeof cell !== 'string') return 'Enter a JSON object, e.g. {"kind": "fuse", …}';
      let value: unknown;
      try {
        value = JSON.parse(cell);
      } catch (err) {
        return `Enter a JSON object: ${(err as Error).message}`;
      }
      if (value === null || typeof value !== 'object' || Array.isArray(value))
        return 'Enter a JSON object, e.g. {"kind": "fuse", …}';
      return { value };
    }
  }
}

/** Sets `path` in `target`; false when a different value is already there (e.g. `device.kind` against `device`). */
function setPath(target: Record<string, unknown>, path: readonly string[], value: unknown): boolean {
  let obj = target;
  for (const key of path.slice(0, -1)) {
    const next = obj[key];
    if (next === undefined) obj[key] = {};
    else if (next === null || typeof next !== 'object' || Array.isArray(next)) return false;
    obj = obj[key] as Record<string, unknown>;
  }
  const last = path[path.length - 1];
  if (obj[last] !== undefined && obj[last] !== value) return false;
  obj[last] = value;
  return true;
}

/** Matches the header row to the table's columns: unknown, duplicate and missing required columns are errors. */
function readHeader(source: TableSource, errors: Located[]): ReadColumn[] {
  const specs = TABLE_COLUMNS[source.table];
  const title = TABLE_TITLES[source.table];
  const at = { file: source.file, ...(source.sheet !== undefined ? { sheet: source.sheet } : {}), row: 1 };
  const columns: ReadColumn[] = [];
  source.header.forEach((cell, index) => {
    if (isBlank(cell)) return;
    const text = typeof cell === 'object' && cell !== null ? '' : String(cell).trim();
    const label = `${text} (${columnLetter(index)})`;
    const column = specs.find((c) => headerKey(c.header) === headerKey(text));
    if (!column) {
      errors.push({
        ...at,
        column: label,
        message: `Unknown column "${text}": the ${title} columns are ${specs.map((c) => c.header).join(', ')}`,
      });
    } else if (columns.some((c) => c.column === column)) {
      errors.push({ ...at, column: label, message: `Column "${column.header}" appears twice` });
    } else {
      columns.push({ column, index, label });
    }
  });
  for (const spec of specs) {
    if (spec.required && !columns.some((c) => c.column === spec)) {
      errors.push({ ...at, column: spec.header, message: `Missing required column "${spec.header}"` });
    }
  }
  // Values under a blank header would be lost: report them.
  const lastHeader = Math.max(-1, ...source.header.map((c, i) => (isBlank(c) ? -1 : i)));
  for (const { row, cells } of source.rows) {
    cells.forEach((cell, index) => {
      if (!isBlank(cell) && (index > lastHeader || isBlank(source.header[index]))) {
        errors.push({ ...at, row, column: `(${columnLetter(index)})`, message: 'Value in a column without a header' });
      }
    });
  }
  return columns;
}

/** Reads one table into plain objects (elements, or the About fields); cell problems go to `errors`. */
function readTable(source: TableSource, errors: Located[]): { read: ReadTable; objects: Record<string, unknown>[] } {
  const columns = readHeader(source, errors);
  // JSON columns first, so that a dotted column under them (device.kind) is checked against the JSON.
  const ordered = [...columns].sort((a, b) => Number(b.column.type === 'json') - Number(a.column.type === 'json'));
  const read: ReadTable = { source, columns, rowOf: [], fieldRows: new Map() };
  const objects: Record<string, unknown>[] = [];
  const where = { file: source.file, ...(source.sheet !== undefined ? { sheet: source.sheet } : {}) };

  for (const { row, cells } of source.rows) {
    if (cells.every(isBlank)) continue;
    const values = new Map<ReadColumn, unknown>();
    const object: Record<string, unknown> = {};
    let rowOk = true;
    const fail = (c: ReadColumn, message: string) => {
      errors.push({ ...where, row, column: c.label, message });
      rowOk = false;
    };
    for (const c of ordered) {
      const cell = cells[c.index];
      if (isBlank(cell)) {
        if (c.column.required && source.table !== 'about') fail(c, 'Enter a value');
        continue;
      }
      const result = readCell(c.column.type, cell as Exclude<Cell, null>);
      if (typeof result === 'string') {
        fail(c, result);
        continue;
      }
      values.set(c, result.value);
      if (!setPath(object, c.column.path, result.value)) {
        const parent = c.column.path.slice(0, -1).join('.');
        fail(c, `Does not match the ${parent} column`);
      }
    }
    for (const c of values.keys()) {
      const when = c.column.when;
      if (!when) continue;
      const governing = columns.find((g) => g.column.header === when.column);
      const gv = governing ? values.get(governing) : undefined;
      if (typeof gv === 'string' && !when.values.includes(gv)) {
        fail(c, `${c.column.header} applies to ${when.column} ${when.values.join(' or ')} only`);
      }
    }
    if (!rowOk) continue;
    read.rowOf.push(row);
    objects.push(object);
  }
  return { read, objects };
}

/** Turns the About table's field/value rows into the model-level fields. */
function readAbout(table: ReadTable, objects: Record<string, unknown>[], errors: Located[]): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  const { source } = table;
  const where = { file: source.file, ...(source.sheet !== undefined ? { sheet: source.sheet } : {}) };
  const label = (header: string) => table.columns.find((c) => c.column.header === header)?.label ?? header;
  objects.forEach((object, i) => {
    const row = table.rowOf[i];
    const field = object.field as string | undefined;
    const value = object.value;
    if (field === undefined) {
      if (value !== undefined) errors.push({ ...where, row, column: label('field'), message: 'Give the field name' });
      return; // a note row
    }
    const spec = Object.entries(ABOUT_FIELDS).find(([key]) => headerKey(key) === headerKey(field));
    if (!spec) {
      errors.push({
        ...where,
        row,
        column: label('field'),
        message: `Unknown field "${field}": use ${Object.keys(ABOUT_FIELDS).join(', ')}`,
      });
      return;
    }
    const [key, { type }] = spec;
    if (table.fieldRows.has(key)) {
      errors.push({ ...where, row, column: label('field'), message: `Field "${key}" appears twice` });
      return;
    }
    table.fieldRows.set(key, row);
    if (value === undefined) return;
    const result = readCell(type, value as string | number | boolean);
    if (typeof result === 'string') errors.push({ ...where, row, column: label('value'), message: result });
    else out[key] = result.value;
  });
  return out;
}

/** Place of a table error in words: `Cables row 5, toBus (C)` (workbook) or `cables.csv line 5, toBus (C)` (CSV). */
export function describePlace(e: Pick<ImportError, 'file' | 'sheet' | 'row' | 'column'>): string {
  let place = e.sheet ?? e.file;
  if (e.row !== undefined) place += e.sheet !== undefined ? ` row ${e.row}` : ` line ${e.row}`;
  if (e.column !== undefined) place += `, ${e.column}`;
  return place;
}

export const withPlace = (e: Omit<ImportError, 'where'>): ImportError => ({ ...e, where: describePlace(e) });

/** Where each part of one operating scenario was read from. */
interface ScenarioPlace {
  /** The scenario's first row. */
  firstRow: number;
  /** Row of each scenario-level field given (`name`, `allMotorsOff`). */
  fieldRows: Map<string, number>;
  /** By map (`sources`, `ties`, `motors`): the row of each element overridden. */
  elementRows: Map<string, Map<string, number>>;
}

/**
 * The kind of each source, tie and motor id of the upload, from the raw id cells of those tables (so that a row with
 * another problem still counts), first table first.
 */
function elementKindsOf(sources: TableSource[]): Map<string, ScenarioElementKind> {
  const kinds = new Map<string, ScenarioElementKind>();
  for (const [key, kind] of Object.entries(SCENARIO_MAPS)) {
    const source = sources.find((s) => s.table === key);
    const at = source?.header.findIndex((c) => typeof c === 'string' && headerKey(c) === 'id') ?? -1;
    if (!source || at < 0) continue;
    for (const { cells } of source.rows) {
      const cell = cells[at];
      const id = typeof cell === 'string' || typeof cell === 'number' ? String(cell).trim() : '';
      if (id !== '' && !kinds.has(id)) kinds.set(id, kind);
    }
  }
  return kinds;
}

/**
 * Turns the Scenarios rows into the model's scenarios: rows of one scenario id are gathered in the order they first
 * appear; each row with an element adds that element's override to the map of its kind (found from the model's ids).
 * An unknown element, a value that does not apply to the element's kind, an element given twice in a scenario and
 * two different values of a scenario-level field are errors at their cell.
 */
function readScenarios(
  read: ReadTable,
  objects: Record<string, unknown>[],
  kinds: Map<string, ScenarioElementKind>,
  errors: Located[],
): { scenarios: Record<string, unknown>[]; places: ScenarioPlace[] } {
  const { source } = read;
  const where = { file: source.file, ...(source.sheet !== undefined ? { sheet: source.sheet } : {}) };
  const rowWord = source.sheet !== undefined ? 'row' : 'line';
  const label = (header: string) => read.columns.find((c) => c.column.header === header)?.label ?? header;
  const columns = TABLE_COLUMNS.scenarios;
  const mapOf = (kind: ScenarioElementKind) => Object.keys(SCENARIO_MAPS).find((k) => SCENARIO_MAPS[k] === kind)!;
  const scenarios: Record<string, unknown>[] = [];
  const places: ScenarioPlace[] = [];
  const indexOf = new Map<string, number>();
  objects.forEach((object, i) => {
    const row = read.rowOf[i];
    const fail = (header: string, message: string) => errors.push({ ...where, row, column: label(header), message });
    const id = object[SCENARIO_HEADERS.id] as string;
    let k = indexOf.get(id);
    if (k === undefined) {
      k = scenarios.length;
      indexOf.set(id, k);
      scenarios.push({ id });
      places.push({ firstRow: row, fieldRows: new Map(), elementRows: new Map() });
    }
    const scenario = scenarios[k];
    const place = places[k];
    for (const c of columns) {
      if (c.elementKinds || c.header === ELEMENT_HEADER || c.header === SCENARIO_HEADERS.id) continue;
      const value = object[c.header];
      if (value === undefined) continue;
      const field = scenarioFieldOf(c.header);
      const before = place.fieldRows.get(field);
      if (before === undefined) {
        scenario[field] = value;
        place.fieldRows.set(field, row);
      } else if (scenario[field] !== value) {
        fail(c.header, `Scenario "${id}" has another ${c.header} on ${rowWord} ${before}: give it once`);
      }
    }
    const given = columns.filter((c) => c.elementKinds && object[c.header] !== undefined);
    const element = object[ELEMENT_HEADER] as string | undefined;
    if (element === undefined) {
      for (const c of given) fail(c.header, `Give the element (a source, tie or motor id) that ${c.header} applies to`);
      return;
    }
    const kind = kinds.get(element);
    if (!kind) {
      fail(ELEMENT_HEADER, `Unknown element "${element}": give the id of a source, tie or motor of the model`);
      return;
    }
    const misplaced = given.filter((c) => !c.elementKinds!.includes(kind));
    for (const c of misplaced) {
      fail(c.header, `${c.header} applies to a ${c.elementKinds!.join(' or ')}; "${element}" is a ${kind}`);
    }
    if (misplaced.length > 0) return;
    const key = mapOf(kind);
    const rows = place.elementRows.get(key) ?? place.elementRows.set(key, new Map()).get(key)!;
    const first = rows.get(element);
    if (first !== undefined) {
      fail(ELEMENT_HEADER, `Scenario "${id}" already changes "${element}" on ${rowWord} ${first}: give it on one row`);
      return;
    }
    rows.set(element, row);
    const map = (scenario[key] ??= {}) as Record<string, unknown>;
    // An id is any text: defined as an own property, so that an id like "__proto__" stays a key.
    Object.defineProperty(map, element, {
      value: Object.fromEntries(given.map((c) => [c.header, object[c.header]])),
      enumerable: true,
      writable: true,
      configurable: true,
    });
  });
  return { scenarios, places };
}

/** Splits a model path `cables[2].equipment.gapMm` into collection, index and the field inside the element. */
function splitPath(path: string): { collection: string; index?: number; field?: string } {
  const m = /^([A-Za-z]+)(?:\[(\d+)\])?(?:\.?(.*))?$/.exec(path);
  if (!m) return { collection: path };
  return { collection: m[1], index: m[2] !== undefined ? Number(m[2]) : undefined, field: m[3] || undefined };
}

/**
 * Assembles the model from the tables read (at most one per table; the caller checks for duplicates) and returns
 * the model input with a locator for the issues `parseModel` reports, or every cell problem found.
 * `workbookFile` names the workbook the sheets came from; without it the tables are CSV files.
 */
export function readTables(sources: TableSource[], workbookFile?: string): ParsedModelFile {
  const errors: Located[] = [];
  const reads = new Map<ModelTable, ReadTable>();
  const input: Record<string, unknown> = { format: MODEL_FORMAT, version: MODEL_VERSION };
  let scenarioTable: { read: ReadTable; objects: Record<string, unknown>[] } | undefined;
  for (const source of sources) {
    // A blank sheet or file stands for an empty table.
    if (source.header.every(isBlank) && source.rows.every((r) => r.cells.every(isBlank))) continue;
    const { read, objects } = readTable(source, errors);
    reads.set(source.table, read);
    if (source.table === 'about') Object.assign(input, readAbout(read, objects, errors));
    else if (source.table === SCENARIO_TABLE) scenarioTable = { read, objects };
    else input[source.table] = objects;
  }
  if (!input.buses) input.buses = [];
  // Scenarios last: an element's kind comes from the ids of the other tables. No rows, no `scenarios` key.
  let scenarioPlaces: ScenarioPlace[] = [];
  if (scenarioTable) {
    const read = readScenarios(scenarioTable.read, scenarioTable.objects, elementKindsOf(sources), errors);
    if (read.scenarios.length > 0) input.scenarios = read.scenarios;
    scenarioPlaces = read.places;
  }
  if (errors.length > 0) return { ok: false, errors: errors.map(withPlace) };

  const locate = (issue: ModelIssue): ImportError => {
    const { collection, index, field: pathField } = splitPath(issue.path);
    const isElement = (ELEMENT_TABLES as readonly string[]).includes(collection);
    const table: ModelTable = isElement
      ? (collection as ElementTable)
      : collection === SCENARIO_TABLE
        ? SCENARIO_TABLE
        : 'about';
    const read = reads.get(table);
    const detail = {
      path: issue.path,
      ...(issue.elementId !== undefined ? { elementId: issue.elementId } : {}),
      message: issue.message,
    };
    // The table is missing altogether (e.g. no Buses sheet): name the sheet or file it needs.
    if (!read) {
      return workbookFile !== undefined
        ? withPlace({ file: workbookFile, sheet: TABLE_TITLES[table], ...detail })
        : withPlace({ file: csvFileName(table), ...detail });
    }
    const base = {
      file: read.source.file,
      ...(read.source.sheet !== undefined ? { sheet: read.source.sheet } : {}),
      ...detail,
    };
    if (table === SCENARIO_TABLE) {
      return withPlace({ ...base, ...scenarioCell(read, scenarioPlaces[index ?? -1], issue.field ?? pathField) });
    }
    if (!isElement) {
      const row = read.fieldRows.get(collection);
      const valueLabel = read.columns.find((c) => c.column.header === 'value')?.label ?? 'value';
      return withPlace({ ...base, ...(row !== undefined ? { row, column: valueLabel } : {}) });
    }
    if (index === undefined) return withPlace(base);
    const row = read.rowOf[index];
    const field = issue.field ?? pathField;
    let column: string | undefined;
    if (field !== undefined) {
      // The longest column path that is the field or contains it (device.ratingA → the device column).
      const spec = [...TABLE_COLUMNS[table]]
        .filter((c) => field === c.header || field.startsWith(`${c.header}.`) || field.startsWith(`${c.header}[`))
        .sort((a, b) => b.header.length - a.header.length)[0];
      if (spec) column = read.columns.find((c) => c.column === spec)?.label ?? spec.header;
      else column = field;
    }
    return withPlace({ ...base, ...(row !== undefined ? { row } : {}), ...(column !== undefined ? { column } : {}) });
  };
  return { ok: true, input, locate };
}

/**
 * The row and column of a scenario's field (`name`, `allMotorsOff`) or of one element's override in it
 * (`sources.UTIL-1.shortCircuitMva`, `ties.TIE-1`): ids may hold dots, so the longest id of the map that the path
 * starts with is the element.
 */
function scenarioCell(read: ReadTable, place: ScenarioPlace | undefined, field: string | undefined) {
  if (!place) return {};
  const at = (row: number, header: string) => ({
    row,
    column: read.columns.find((c) => c.column.header === header)?.label ?? header,
  });
  if (field === undefined) return { row: place.firstRow };
  const head = field.split('.')[0];
  if (Object.hasOwn(SCENARIO_MAPS, head)) {
    const rest = field.slice(head.length + 1);
    const ids = [...(place.elementRows.get(head) ?? new Map<string, number>())].sort(
      (a, b) => b[0].length - a[0].length,
    );
    for (const [id, row] of ids) {
      if (rest === id) return at(row, ELEMENT_HEADER);
      if (rest.startsWith(`${id}.`)) {
        const sub = rest.slice(id.length + 1).split('.')[0];
        const column = TABLE_COLUMNS.scenarios.find((c) => c.elementKinds && c.header === sub);
        return at(row, column ? column.header : ELEMENT_HEADER);
      }
    }
    return at(place.firstRow, SCENARIO_HEADERS.id);
  }
  const header = Object.hasOwn(SCENARIO_HEADERS, head) ? SCENARIO_HEADERS[head] : head;
  const known = TABLE_COLUMNS.scenarios.some((c) => !c.elementKinds && c.header === header);
  return at(place.fieldRows.get(head) ?? place.firstRow, known ? header : SCENARIO_HEADERS.id);
}

/** Which table a sheet or file name stands for (case-insensitive), or undefined. */
export function tableOfName(name: string): ModelTable | undefined {
  const key = headerKey(name);
  return MODEL_TABLES.find((t) => t === key || headerKey(TABLE_TITLES[t]) === key);
}
