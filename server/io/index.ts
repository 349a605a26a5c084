import { modelSchema, parseModel, type Model } from '../../shared/schemas/model';
import { findUnknownKeys } from '../../shared/unknownKeys';
import { EngineError } from '../engine/errors';
import { MODEL_TABLES, csvFileName, type ImportError, type ModelTable, type ParsedModelFile } from './columns';
import { exportModelCsv, importModelCsv } from './modelCsv';
import { exportModelJson, importModelJson } from './modelJson';
import { exportModelWorkbook, importModelWorkbook } from './modelWorkbook';

/**
 * Import and export of the system model (docs/MODEL-FORMAT.md, Import and export) as JSON, an .xlsx workbook or CSV
 * files. Pure: buffers in, buffers out. An import gives either a whole valid model (zod shapes and the semantic checks
 * of `parseModel`) or every problem found, each located in the upload: sheet or file, row and column for tables, model
 * path (or line and column for a syntax error) for JSON.
 */

export type { ImportError, ModelTable, ParsedModelFile } from './columns';
export { ELEMENT_TABLES, MODEL_TABLES, TABLE_COLUMNS, TABLE_TITLES } from './columns';
export { exportModelCsv, importModelCsv } from './modelCsv';
export { exportModelJson, importModelJson } from './modelJson';
export { exportModelWorkbook, importModelWorkbook } from './modelWorkbook';

export type ModelFileFormat = 'json' | 'xlsx' | 'csv';

export interface UploadedModelFile {
  name: string;
  mimeType?: string;
  buffer: Buffer;
}

export type ImportModelResult = { ok: true; model: Model } | { ok: false; errors: ImportError[] };

export interface ExportedModelFile {
  filename: string;
  mimeType: string;
  body: Buffer | string;
}

export const MODEL_MIME_TYPES: Record<ModelFileFormat, string> = {
  json: 'application/json',
  xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
  csv: 'text/csv',
};

const EXTRA_MIME_TYPES: Record<string, ModelFileFormat> = {
  'application/csv': 'csv',
  'text/comma-separated-values': 'csv',
  'text/json': 'json',
};

/** Format of an upload: by extension, else by MIME type. */
function formatOf(file: UploadedModelFile): ModelFileFormat | undefined {
  const ext = /\.([A-Za-z]+)$/.exec(file.name)?.[1]?.toLowerCase();
  if (ext === 'json' || ext === 'xlsx' || ext === 'csv') return ext;
  const mime = file.mimeType?.split(';')[0].trim().toLowerCase();
  if (!mime) return undefined;
  const byMime = (Object.keys(MODEL_MIME_TYPES) as ModelFileFormat[]).find((f) => MODEL_MIME_TYPES[f] === mime);
  return byMime ?? EXTRA_MIME_TYPES[mime];
}

/** UTF-8 text; a file that is not valid UTF-8 is read as Windows-1252 (what spreadsheets save as "CSV"). */
function decodeText(buffer: Buffer): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(buffer);
  } catch {
    return new TextDecoder('windows-1252').decode(buffer);
  }
}

const uploadError = (file: string, message: string): ImportError => ({ file, where: file || 'upload', message });

/**
 * Imports a system model from one .xlsx workbook, one .json file, or one or several .csv files (one per table,
 * named after it). Returns the validated model, or every problem found (nothing partial).
 */
export async function importModel(files: UploadedModelFile[]): Promise<ImportModelResult> {
  if (files.length === 0) return { ok: false, errors: [uploadError('', 'Choose a model file: .xlsx, .csv or .json')] };
  const formats = files.map(formatOf);
  const unknown = files.filter((_, i) => formats[i] === undefined);
  if (unknown.length > 0) {
    return {
      ok: false,
      errors: unknown.map((f) =>
        uploadError(f.name, 'Unsupported file type: upload an .xlsx workbook, .csv files or a .json file'),
      ),
    };
  }
  const format = formats[0]!;
  if (formats.some((f) => f !== format) || (format !== 'csv' && files.length > 1)) {
    return {
      ok: false,
      errors: [
        uploadError(
          files.map((f) => f.name).join(', '),
          'Upload one .xlsx workbook, one .json file, or .csv files (one per table)',
        ),
      ],
    };
  }

  let parsed: ParsedModelFile;
  if (format === 'xlsx') parsed = await importModelWorkbook(files[0].buffer, files[0].name);
  else if (format === 'json') parsed = importModelJson(decodeText(files[0].buffer), files[0].name);
  else parsed = importModelCsv(files.map((f) => ({ name: f.name, text: decodeText(f.buffer) })));
  if (!parsed.ok) return parsed;

  // The JSON of a table's cell (a device, its library reference) is held to the model's keys too (a JSON file is
  // checked as it is read): a misspelt key is refused at its row and column, never dropped.
  const unknownKeys = findUnknownKeys(modelSchema, parsed.input);
  if (unknownKeys.length > 0) {
    return {
      ok: false,
      errors: unknownKeys.map((k) => {
        const field = k.path.replace(/^[^.[]+\[\d+\]\.?/, '');
        const [collection, index] = k.parts;
        const element =
          typeof index === 'number' ? (parsed.input as Record<string, unknown[]>)[collection]?.[index] : null;
        const id = (element as { id?: unknown } | null)?.id;
        return parsed.locate({
          code: 'invalid-value',
          path: k.path,
          ...(typeof id === 'string' ? { elementId: id } : {}),
          field,
          message: `${field}: ${k.message}`,
        });
      }),
    };
  }

  const result = parseModel(parsed.input);
  if (result.success) return { ok: true, model: result.model };
  return { ok: false, errors: result.issues.map(parsed.locate) };
}

/** File name stem from the model name: "Plant 2 / North" → "plant-2-north". */
function fileStem(model: Model): string {
  const stem = (model.name ?? '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '');
  return stem || 'model';
}

/**
 * Exports the model as JSON, an .xlsx workbook, or one table as CSV (`element` names the table: `about`, `buses`,
 * … `devices`). CSV carries a byte-order mark so that spreadsheets read it as UTF-8 (the import removes it).
 */
export async function exportModel(
  model: Model,
  format: ModelFileFormat,
  element?: ModelTable,
): Promise<ExportedModelFile> {
  switch (format) {
    case 'json':
      return { filename: `${fileStem(model)}.json`, mimeType: MODEL_MIME_TYPES.json, body: exportModelJson(model) };
    case 'xlsx':
      return {
        filename: `${fileStem(model)}.xlsx`,
        mimeType: MODEL_MIME_TYPES.xlsx,
        body: await exportModelWorkbook(model),
      };
    case 'csv': {
      if (element === undefined || !(MODEL_TABLES as readonly string[]).includes(element)) {
        throw new EngineError(
          'invalid-input',
          'csv-table',
          `Name the table to export as CSV: ${MODEL_TABLES.join(', ')}`,
          'element',
        );
      }
      return {
        filename: csvFileName(element),
        mimeType: `${MODEL_MIME_TYPES.csv}; charset=utf-8`,
        body: `\uFEFF${exportModelCsv(model)[element]}`,
      };
    }
    default:
      throw new EngineError(
        'invalid-input',
        'model-format',
        `Unknown export format "${String(format)}": use json, xlsx or csv`,
        'format',
      );
  }
}
