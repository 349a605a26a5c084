import Papa from 'papaparse';
import type { Response } from 'express';

/**
 * CSV text (RFC 4180, CRLF line ends, UTF-8 with a byte-order mark so spreadsheet programs read accents right).
 * Cells that a spreadsheet would run as a formula (=, +, -, @ first) are quoted with a leading apostrophe.
 */
export function toCsv(header: string[], rows: (string | number | null | undefined)[][]): string {
  const data = rows.map((r) => r.map((c) => (c === null || c === undefined ? '' : c)));
  return '\uFEFF' + Papa.unparse({ fields: header, data }, { newline: '\r\n', escapeFormulae: true });
}

export function sendCsv(res: Response, filename: string, csv: string): void {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${filename.replace(/[^A-Za-z0-9._-]/g, '_')}"`);
  res.send(csv);
}
