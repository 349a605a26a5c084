/**
 * The report writer of the study report: US letter pages, headings, paragraphs, bullet lists, label/value pairs,
 * tables that continue on the next page under a repeated header, and the footer with page numbers on every page.
 * Layout is a convention (common practice, no source).
 */
import { rgb, type PDFDocument, type PDFFont, type PDFPage } from 'pdf-lib';
import { BLACK, Canvas, LINE_HEIGHT, type Align } from '../canvas';
import type { PdfFonts } from '../fonts';

/** US letter, in points; content between the margins and above the footer. */
const PAGE_W = 612;
const PAGE_H = 792;
export const MARGIN_X = 54;
const MARGIN_TOP = 54;
const FOOTER_H = 40;
export const CONTENT_W = PAGE_W - 2 * MARGIN_X;
const BOTTOM = PAGE_H - FOOTER_H - 14;
const HEADER_FILL = rgb(0.92, 0.92, 0.92);
const RULE = rgb(0.6, 0.6, 0.6);

export interface Column {
  header: string;
  /** Relative width. */
  weight: number;
  align?: Align;
  mono?: boolean;
}

/** Lays out flowing content on pages: headings, paragraphs, lists, tables that break across pages, plots. */
export class ReportWriter {
  readonly pages: PDFPage[] = [];
  private page!: PDFPage;
  cv!: Canvas;
  y = MARGIN_TOP;

  constructor(
    readonly doc: PDFDocument,
    readonly fonts: PdfFonts,
  ) {}

  newPage(): void {
    this.page = this.doc.addPage([PAGE_W, PAGE_H]);
    this.pages.push(this.page);
    this.cv = new Canvas(this.page, PAGE_H);
    this.y = MARGIN_TOP;
  }

  /** Starts a new page unless `h` more points fit on this one. */
  ensure(h: number): void {
    if (this.y + h > BOTTOM) this.newPage();
  }

  space(h: number): void {
    this.y += h;
  }

  heading(text: string, level: 1 | 2 = 1): void {
    const size = level === 1 ? 14 : 11;
    this.ensure(size * 1.4 + 60); // keep with what follows
    if (level === 1 && this.y > MARGIN_TOP) this.y += 8;
    const fitted = this.cv.text(text, MARGIN_X, this.y, CONTENT_W, {
      font: this.fonts.textBold,
      size,
      minSize: size * 0.7,
      maxLines: 2,
    });
    this.y += fitted.height + 1;
    if (level === 1) {
      this.cv.line(MARGIN_X, this.y, MARGIN_X + CONTENT_W, this.y, { width: 0.8 });
      this.y += 6;
    } else {
      this.y += 3;
    }
  }

  /** A paragraph; long paragraphs continue on the next page line by line. */
  paragraph(text: string, opts: { font?: PDFFont; size?: number; indent?: number; after?: number } = {}): void {
    const font = opts.font ?? this.fonts.text;
    const size = opts.size ?? 9;
    const indent = opts.indent ?? 0;
    const w = CONTENT_W - indent;
    const fitted = this.cv.fit(text, w, { font, size, maxLines: 1000, minSize: size });
    const lh = size * LINE_HEIGHT;
    for (const line of fitted.lines) {
      this.ensure(lh);
      this.cv.drawFitted({ lines: [line], size, truncated: false, font: fitted.font }, MARGIN_X + indent, this.y, w, {
        font,
        size,
      });
      this.y += lh;
    }
    this.y += opts.after ?? 4;
  }

  bullets(items: string[], size = 9): void {
    for (const item of items) {
      this.ensure(size * LINE_HEIGHT);
      this.cv.text('•', MARGIN_X + 2, this.y, 8, { font: this.fonts.text, size });
      this.paragraph(item, { size, indent: 12, after: 2.5 });
    }
    this.y += 2;
  }

  /** Label/value pairs in two columns. */
  keyValues(pairs: [string, string][], opts: { labelW?: number; size?: number } = {}): void {
    const labelW = opts.labelW ?? 150;
    const size = opts.size ?? 9.5;
    for (const [k, v] of pairs) {
      const opt = { font: this.fonts.text, size, minSize: size * 0.8, maxLines: 4 };
      const value = this.cv.fit(v, CONTENT_W - labelW, opt);
      this.ensure(value.height + 3);
      this.cv.text(k, MARGIN_X, this.y, labelW - 8, {
        font: this.fonts.textBold,
        size,
        minSize: size * 0.8,
        maxLines: 2,
      });
      this.cv.drawFitted(value, MARGIN_X + labelW, this.y, CONTENT_W - labelW, opt);
      this.y += Math.max(value.height, size * LINE_HEIGHT) + 3;
    }
  }

  /** A table; rows that do not fit go to the next page under a repeated header. */
  table(columns: Column[], rows: string[][], opts: { size?: number; note?: string; pad?: number } = {}): void {
    const size = opts.size ?? 7.5;
    const pad = opts.pad ?? 3.5;
    const total = columns.reduce((s, c) => s + c.weight, 0);
    const widths = columns.map((c) => (c.weight / total) * CONTENT_W);
    const xs = widths.map((_, i) => MARGIN_X + widths.slice(0, i).reduce((s, w) => s + w, 0));
    const cellFont = (c: Column) => (c.mono ? this.fonts.mono : this.fonts.text);
    const fitRow = (cells: string[], header: boolean) =>
      cells.map((cell, i) => {
        const font = header ? this.fonts.textBold : cellFont(columns[i]);
        const cellSize = header ? size - 0.5 : size;
        // Numbers read best on one line: shrink a little first, wrap only if that is not enough.
        if (!header && columns[i].mono) {
          const one = this.cv.fit(cell, widths[i] - 2 * pad, {
            font,
            size: cellSize,
            minSize: size * 0.85,
            maxLines: 1,
          });
          if (!one.truncated) return one;
        }
        return this.cv.fit(cell, widths[i] - 2 * pad, {
          font,
          size: cellSize,
          minSize: size * 0.8,
          maxLines: header ? 3 : 6,
        });
      });
    const rowHeight = (fitted: { height: number }[]) =>
      Math.max(...fitted.map((f) => f.height), size * LINE_HEIGHT) + 2 * pad;
    const drawRow = (cells: string[], header: boolean) => {
      const fitted = fitRow(cells, header);
      const h = rowHeight(fitted);
      if (header) this.cv.rect(MARGIN_X, this.y, CONTENT_W, h, { fill: HEADER_FILL });
      fitted.forEach((f, i) => {
        const font = header ? this.fonts.textBold : cellFont(columns[i]);
        this.cv.drawFitted(f, xs[i] + pad, this.y + pad, widths[i] - 2 * pad, {
          font,
          size: f.size,
          align: columns[i].align ?? 'left',
        });
      });
      this.y += h;
      this.cv.line(MARGIN_X, this.y, MARGIN_X + CONTENT_W, this.y, {
        width: header ? 0.7 : 0.3,
        color: header ? BLACK : RULE,
      });
    };
    const headerCells = columns.map((c) => c.header);
    const headerH = rowHeight(fitRow(headerCells, true));
    const firstH = rows.length > 0 ? rowHeight(fitRow(rows[0], false)) : 0;
    this.ensure(headerH + firstH);
    drawRow(headerCells, true);
    for (const row of rows) {
      const h = rowHeight(fitRow(row, false));
      if (this.y + h > BOTTOM) {
        this.newPage();
        this.cv.text('(continued)', MARGIN_X, this.y, CONTENT_W, { font: this.fonts.text, size: 7 });
        this.y += 10;
        drawRow(headerCells, true);
      }
      drawRow(row, false);
    }
    if (rows.length === 0) {
      this.cv.text('None.', MARGIN_X + pad, this.y + pad, CONTENT_W, { font: this.fonts.text, size });
      this.y += size * LINE_HEIGHT + 2 * pad;
    }
    if (opts.note) {
      this.y += 3;
      this.paragraph(opts.note, { size: 7 });
    }
    this.y += 8;
  }

  /** Page numbers and footer on every page (drawn last, when the page count is known). */
  footers(left: string, right: string | null): void {
    const n = this.pages.length;
    this.pages.forEach((page, i) => {
      const cv = new Canvas(page, PAGE_H);
      const top = PAGE_H - FOOTER_H;
      cv.line(MARGIN_X, top, MARGIN_X + CONTENT_W, top, { width: 0.5, color: RULE });
      cv.text(left, MARGIN_X, top + 5, CONTENT_W * 0.7, { font: this.fonts.text, size: 7, minSize: 5.5, maxLines: 2 });
      cv.text(`Page ${i + 1} of ${n}`, MARGIN_X + CONTENT_W * 0.7, top + 5, CONTENT_W * 0.3, {
        font: this.fonts.text,
        size: 7,
        align: 'right',
      });
      if (right)
        cv.text(right, MARGIN_X + CONTENT_W * 0.5, top + 15, CONTENT_W * 0.5, {
          font: this.fonts.textBold,
          size: 7,
          align: 'right',
        });
    });
  }
}
