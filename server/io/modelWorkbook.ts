import ExcelJS from 'exceljs';
import { guardWorkbookArchive } from './zipGuard';
import type { Model } from '../../shared/schemas/model';
import {
  MODEL_TABLES,
  TABLE_COLUMNS,
  TABLE_TITLES,
  readTables,
  tableOfName,
  tableRows,
  withPlace,
  type Cell,
  type ImportError,
  type ParsedModelFile,
  type TableSource,
} from './columns';

/**
 * The system model as an .xlsx workbook: an About sheet (format, version, name, frequency, pre-fault voltage and
 * notes), then one sheet per element type and a Scenarios sheet (operating scenarios), with the columns of
 * columns.ts. Header row bold and frozen.
 */

const MIN_WIDTH = 8;
const MAX_WIDTH = 60;

/** Writes the model to an .xlsx workbook. */
export async function exportModelWorkbook(model: Model): Promise<Buffer> {
  const workbook = new ExcelJS.Workbook();
  workbook.creator = 'Emberline';
  for (const table of MODEL_TABLES) {
    const columns = TABLE_COLUMNS[table];
    const sheet = workbook.addWorksheet(TABLE_TITLES[table], { views: [{ state: 'frozen', ySplit: 1 }] });
    const rows = tableRows(model, table);
    sheet.columns = columns.map((c, i) => {
      const longest = Math.max(c.header.length, ...rows.map((r) => String(r[i] ?? '').length));
      return { header: c.header, width: Math.min(MAX_WIDTH, Math.max(MIN_WIDTH, longest + 2)) };
    });
    const header = sheet.getRow(1);
    header.font = { bold: true };
    columns.forEach((c, i) => {
      if (c.note) header.getCell(i + 1).note = c.note;
    });
    for (const row of rows) sheet.addRow(row);
    if (table === 'about') sheet.getColumn(3).alignment = { wrapText: true, vertical: 'top' };
  }
  const body = await workbook.xlsx.writeBuffer();
  return Buffer.from(body as unknown as ArrayBuffer);
}

/** Turns an exceljs cell value into a plain cell; dates and error cells cannot be read as model values. */
function toCell(value: ExcelJS.CellValue): Cell {
  if (value === null || value === undefined) return null;
  if (typeof value === 'string' || typeof value === 'number' || typeof value === 'boolean') return value;
  if (value instanceof Date) return { invalid: 'This cell holds a date: enter a number or plain text' };
  if ('error' in value) return { invalid: `This cell shows the error ${value.error}` };
  if ('richText' in value) return value.richText.map((r) => r.text).join('');
  if ('hyperlink' in value) return value.text;
  if ('formula' in value || 'sharedFormula' in value) {
    return value.result === undefined
      ? { invalid: 'This formula has no saved result: enter the value' }
      : toCell(value.result);
  }
  return { invalid: 'This cell cannot be read' };
}

/**
 * Reads a workbook written by `exportModelWorkbook` (or by hand in the same layout) back into a model input.
 * Sheets are matched by name (case-insensitive); an unknown sheet, an unknown column, a cell that does not read as
 * its column's type are errors naming the sheet, the row as Excel shows it and the column (header and letter).
 */
export async function importModelWorkbook(buffer: Buffer, fileName = 'model.xlsx'): Promise<ParsedModelFile> {
  // Checked and stripped to its sheets before unpacking (zip bombs, large media): UnsafeArchiveError otherwise.
  const sheetsOnly = await guardWorkbookArchive(buffer);
  const workbook = new ExcelJS.Workbook();
  try {
    await workbook.xlsx.load(sheetsOnly as unknown as ExcelJS.Buffer);
  } catch {
    return { ok: false, errors: [withPlace({ file: fileName, message: 'Not a readable .xlsx workbook' })] };
  }
  const errors: ImportError[] = [];
  const sources: TableSource[] = [];
  const known = MODEL_TABLES.map((t) => TABLE_TITLES[t]).join(', ');
  workbook.eachSheet((sheet) => {
    const table = tableOfName(sheet.name);
    if (!table) {
      // A blank extra sheet is harmless; one with content is probably a misspelt table.
      if (sheet.actualRowCount > 0) {
        errors.push(
          withPlace({ file: fileName, sheet: sheet.name, message: `Unknown sheet "${sheet.name}": use ${known}` }),
        );
      }
      return;
    }
    if (sources.some((s) => s.table === table)) {
      errors.push(withPlace({ file: fileName, sheet: sheet.name, message: `A second ${TABLE_TITLES[table]} sheet` }));
      return;
    }
    const width = sheet.columnCount;
    const cellsOf = (row: ExcelJS.Row) => Array.from({ length: width }, (_, i) => toCell(row.getCell(i + 1).value));
    const source: TableSource = {
      table,
      file: fileName,
      sheet: sheet.name,
      header: cellsOf(sheet.getRow(1)),
      rows: [],
    };
    sheet.eachRow({ includeEmpty: false }, (row, rowNumber) => {
      if (rowNumber > 1) source.rows.push({ row: rowNumber, cells: cellsOf(row) });
    });
    sources.push(source);
  });
  if (errors.length > 0) return { ok: false, errors };
  return readTables(sources, fileName);
}
