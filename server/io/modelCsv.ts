import Papa from 'papaparse';
import type { Model } from '../../shared/schemas/model';
import {
  MODEL_TABLES,
  TABLE_COLUMNS,
  csvFileName,
  readTables,
  tableOfName,
  tableRows,
  withPlace,
  type Cell,
  type ImportError,
  type ModelTable,
  type ParsedModelFile,
  type TableSource,
} from './columns';

/**
 * The system model as CSV files, one per table (about.csv, buses.csv, … devices.csv, scenarios.csv), with the same
 * columns as the workbook sheets (columns.ts).
 */

/**
 * Text cells that a spreadsheet would run as a formula (`=`, `+`, `-`, `@` first) are written with a leading
 * apostrophe (common practice against formula injection, no source); import removes it again.
 */
const ESCAPED_FORMULA = /^'[=+\-@\t\r]/;

/** One CSV text per table, keyed by table name (`buses` → buses.csv). */
export function exportModelCsv(model: Model): Record<ModelTable, string> {
  const out = {} as Record<ModelTable, string>;
  for (const table of MODEL_TABLES) {
    out[table] = `${Papa.unparse(
      { fields: TABLE_COLUMNS[table].map((c) => c.header), data: tableRows(model, table) },
      { escapeFormulae: true, newline: '\r\n' },
    )}\r\n`;
  }
  return out;
}

/**
 * The table a CSV file stands for, from its name: `Buses.csv`, `buses.CSV`, `plant-2 cables.csv` and
 * `cables (1).csv` (a second download) all work; the last word of the name picks the table.
 */
export function tableOfFileName(fileName: string): ModelTable | undefined {
  const base = fileName
    .split(/[\\/]/)
    .pop()!
    .replace(/\.csv$/i, '')
    .replace(/\s*\(\d+\)$/, '');
  const words = base.split(/[\s._-]+/).filter(Boolean);
  return words.length > 0 ? tableOfName(words[words.length - 1]) : undefined;
}

/** Parses CSV text into rows with the line number each row starts on. */
function csvRows(file: string, text: string, errors: ImportError[]): { line: number; cells: Cell[] }[] {
  const normalized = text.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  const rows: { line: number; cells: Cell[] }[] = [];
  let line = 1;
  let offset = 0;
  Papa.parse<string[]>(normalized, {
    header: false,
    skipEmptyLines: false,
    step: (result) => {
      for (const e of result.errors) {
        if (e.type !== 'Delimiter') errors.push(withPlace({ file, row: line, message: `CSV: ${e.message}` }));
      }
      const cells = result.data.map((c): Cell => (ESCAPED_FORMULA.test(c) ? c.slice(1) : c));
      rows.push({ line, cells });
      const end = result.meta.cursor;
      for (let i = offset; i < end && i < normalized.length; i += 1) if (normalized[i] === '\n') line += 1;
      offset = end;
    },
  });
  return rows;
}

/**
 * Reads CSV files back into a model input. The file name picks the table (case-insensitive); unknown names, a
 * table given twice, unknown columns and cells that do not read as their column's type are errors naming the
 * file, the line and the column.
 */
export function importModelCsv(files: { name: string; text: string }[]): ParsedModelFile {
  const errors: ImportError[] = [];
  const sources: TableSource[] = [];
  for (const { name, text } of files) {
    const table = tableOfFileName(name);
    if (!table) {
      errors.push(
        withPlace({
          file: name,
          message: `Unknown file "${name}": name it after its table, e.g. ${MODEL_TABLES.map(csvFileName).join(', ')}`,
        }),
      );
      continue;
    }
    const first = sources.find((s) => s.table === table);
    if (first) {
      errors.push(withPlace({ file: name, message: `${first.file} already gives the ${table} table` }));
      continue;
    }
    const rows = csvRows(name, text, errors);
    const [header, ...data] = rows;
    sources.push({
      table,
      file: name,
      header: header?.cells ?? [],
      rows: data.map((r) => ({ row: r.line, cells: r.cells })),
    });
  }
  if (errors.length > 0) return { ok: false, errors };
  return readTables(sources);
}
