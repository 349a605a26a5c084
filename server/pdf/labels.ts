/**
 * Arc-flash equipment labels as PDF (docs/ARCHITECTURE.md, Label values; Labels and field checks). One label per page
 * at 4×6 in (portrait) and 4×4 in; on letter and A4 sheets, four 4×4 labels per page in a 2 × 2 grid with cut
 * lines, drawn at 95–98 % so that no text prints below 6 pt.
 *
 * What a label says is `LabelContent` and nothing else, plus the QR code of its public check address. The layout
 * is our own: an ANSI Z535.4 signal-word panel (DANGER: white on safety red; WARNING: black on safety orange) with
 * the safety alert symbol, then the hazard statement, the arc-flash values, the shock values, the equipment, the
 * study, the caution and the QR code. Body black on white. The NFPA 70E 130.5(H) content (nominal voltage,
 * arc-flash boundary, incident energy with its working distance, minimum arc rating, site PPE level) is always
 * present. Sizes, positions and wording of the layout are conventions (common practice, no source).
 */
import { PDFDocument, type PDFPage, type PDFRef } from 'pdf-lib';
import type { LabelContent, LabelSize } from '../../shared/schemas/labels';
import { SAFETY_COLORS, signalPanelColors } from '../../shared/safetyColors';
import { BLACK, Canvas, WHITE, hexColor, safetyAlertPaths, safetyAlertWidth } from './canvas';
import { embedFonts, printable, type PdfFonts } from './fonts';
import { codeFromCheckUrl, groupCode } from './format';
import {
  clearedByCaption,
  clearedByLine,
  clearedByText,
  displayText,
  labelDisplay,
  type DisplayValue,
  type LabelDisplay,
} from '../../shared/labelDisplay';
import { embedQrImage } from './qr';
import { textWidth } from './text';

export type LabelPdfSize = LabelSize;

export interface LabelToRender {
  content: LabelContent;
  /** Public check address, `<origin>/l/<code>`: the QR code holds it. */
  checkUrl: string;
}

export interface RenderLabelsOptions {
  onProgress?: (done: number, total: number) => void;
}

const PT_PER_IN = 72;
const PT_PER_MM = 72 / 25.4;

/** Page sizes, points. */
const PAGE = {
  '4x6': { width: 4 * PT_PER_IN, height: 6 * PT_PER_IN },
  '4x4': { width: 4 * PT_PER_IN, height: 4 * PT_PER_IN },
  letter: { width: 8.5 * PT_PER_IN, height: 11 * PT_PER_IN },
  a4: { width: 210 * PT_PER_MM, height: 297 * PT_PER_MM },
} as const;

/** Sheet grid: columns × rows, page margin and gutter between labels, points (common practice, no source). */
export const SHEET_GRID = { columns: 2, rows: 2, margin: 0.25 * PT_PER_IN, gutter: 0.2 * PT_PER_IN } as const;

/** No text on a label prints smaller than this, points (sheets included: the cell scale is taken into account). */
export const MIN_PRINTED_TEXT_PT = 6;

/** The compact layout is drawn in a 288 × 288 pt box (4 × 4 in) and scaled to a sheet cell. */
const COMPACT = 4 * PT_PER_IN;
const TALL_W = 4 * PT_PER_IN;
const TALL_H = 6 * PT_PER_IN;

export function labelsPerPage(size: LabelPdfSize): number {
  return size === 'letter' || size === 'a4' ? SHEET_GRID.columns * SHEET_GRID.rows : 1;
}

export function pageCountFor(size: LabelPdfSize, labelCount: number): number {
  return Math.ceil(labelCount / labelsPerPage(size));
}

/** Cell boxes of a sheet page, top-down page points, row by row. */
export function sheetCells(size: 'letter' | 'a4'): { left: number; top: number; width: number; height: number }[] {
  const { width, height } = PAGE[size];
  const { columns, rows, margin, gutter } = SHEET_GRID;
  const cw = (width - 2 * margin - (columns - 1) * gutter) / columns;
  const ch = (height - 2 * margin - (rows - 1) * gutter) / rows;
  const out = [];
  for (let r = 0; r < rows; r += 1) {
    for (let c = 0; c < columns; c += 1)
      out.push({ left: margin + c * (cw + gutter), top: margin + r * (ch + gutter), width: cw, height: ch });
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// Values as printed

export { NO_ADEQUATE_PPE_TEXT } from '../../shared/labelDisplay';

/** A printed distance: value with its unit, and the other system on the line below. */
function distanceParts(d: DisplayValue): [string, string | null] {
  return [displayText(d), d.secondary ?? null];
}

// ---------------------------------------------------------------------------------------------
// Drawing

interface Ctx {
  fonts: PdfFonts;
}

/** A label's printed strings: every text drawn below comes from shared/labelDisplay.ts. */
type D = LabelDisplay;

function drawSignalPanel(
  cv: Canvas,
  ctx: Ctx,
  c: LabelContent,
  x: number,
  y: number,
  w: number,
  h: number,
  wordSize: number,
): void {
  const word = labelDisplay(c).signalWord.value as LabelContent['signalWord'];
  const colors = signalPanelColors(word);
  cv.rect(x, y, w, h, { fill: hexColor(colors.background) });
  const symbolH = h * 0.7;
  const symbolW = safetyAlertWidth(symbolH);
  const gap = h * 0.22;
  const font = ctx.fonts.textBold;
  // The word is fitted to what the symbol leaves; the pair is centred in the panel.
  let size = wordSize;
  const room = w - symbolW - gap - h * 0.5;
  while (size > 8 && textWidth(font, word, size) > room) size -= 0.5;
  const wordW = textWidth(font, word, size);
  const startX = x + (w - (symbolW + gap + wordW)) / 2;
  const symbolY = y + (h - symbolH) / 2 - h * 0.01;
  // Safety alert symbol as in ANSI Z535.4 (from memory): on DANGER a white triangle with a safety-red mark, on
  // WARNING a black triangle with a safety-orange mark.
  const tri = colors.text === SAFETY_COLORS.white ? WHITE : BLACK;
  const mark = hexColor(colors.background);
  const p = safetyAlertPaths(symbolH);
  cv.path(p.triangle, startX, symbolY, { fill: tri });
  cv.path(p.mark, startX, symbolY, { fill: mark });
  cv.circle(startX + p.dot.cx, symbolY + p.dot.cy, p.dot.r, { fill: mark });
  const capH = size * 0.73;
  cv.textAt(word, startX + symbolW + gap, y + (h + capH) / 2, font, size, hexColor(colors.text));
}

/** Small bold uppercase caption. */
function caption(
  cv: Canvas,
  ctx: Ctx,
  text: string,
  x: number,
  y: number,
  w: number,
  size: number,
  maxLines = 1,
): number {
  return cv.text(text.toUpperCase(), x, y, w, {
    font: ctx.fonts.textBold,
    size,
    minSize: size * 0.75,
    maxLines,
    lineHeight: 1.1,
  }).height;
}

/** A number with its unit after it on the same baseline ("30.3" big, "cal/cm²" small), fitted to w. */
function numberWithUnit(
  cv: Canvas,
  ctx: Ctx,
  value: string,
  unit: string,
  x: number,
  top: number,
  w: number,
  size: number,
  unitSize: number,
): void {
  const vf = ctx.fonts.monoBold;
  const uf = ctx.fonts.text;
  let s = size;
  let us = unitSize;
  const gap = () => s * 0.18;
  while (s > 6 && textWidth(vf, value, s) + gap() + textWidth(uf, unit, us) > w) {
    s -= 0.5;
    us = Math.max(5, unitSize * (s / size));
  }
  const baseline = top + s * 0.86;
  const text = printable(value, vf);
  cv.textAt(text, x, baseline, vf, s);
  cv.textAt(printable(unit, uf), x + textWidth(vf, text, s) + gap(), baseline, uf, us);
}

/** A value cell: caption above, value (mono bold) below, optional second value line. */
function valueCell(
  cv: Canvas,
  ctx: Ctx,
  label: string,
  value: string,
  second: string | null,
  x: number,
  y: number,
  w: number,
  sizes: { caption: number; value: number; second: number },
): void {
  const h = caption(cv, ctx, label, x, y, w, sizes.caption);
  // Words ("No arc-rated PPE is adequate", "Avoid contact") in the text face on up to two lines; numbers in mono.
  const wordy = !/\d/.test(value) && /[a-z]{3}/i.test(value);
  const v = cv.text(value, x, y + h + 1, w, {
    font: wordy ? ctx.fonts.textBold : ctx.fonts.monoBold,
    size: wordy ? Math.min(sizes.value * 0.75, 9) : sizes.value,
    minSize: wordy ? 6 : Math.max(6, sizes.value * 0.6),
    maxLines: wordy ? 2 : 1,
    lineHeight: 1.1,
  });
  if (second)
    cv.text(second, x, y + h + 1 + v.height, w, {
      font: ctx.fonts.mono,
      size: sizes.second,
      minSize: Math.max(6, sizes.second * 0.7),
    });
}

function noPpeBox(cv: Canvas, ctx: Ctx, text: string, x: number, y: number, w: number, h: number, size: number): void {
  cv.rect(x, y, w, h, { stroke: BLACK, lineWidth: 1.5 });
  const pad = 3;
  const opts = {
    font: ctx.fonts.textBold,
    size,
    minSize: size * 0.6,
    maxLines: 2,
    align: 'center' as const,
    lineHeight: 1.1,
  };
  const fitted = cv.fit(text, w - 2 * pad, opts);
  cv.drawFitted(fitted, x + pad, y + (h - fitted.height) / 2, w - 2 * pad, opts);
}

function drawQr(
  cv: Canvas,
  ctx: Ctx,
  qr: PDFRef,
  checkUrl: string,
  x: number,
  y: number,
  size: number,
  withUrl: boolean,
): void {
  // The image carries its own 4-module quiet zone.
  cv.xObject(qr, x, y, size, size);
  const code = groupCode(codeFromCheckUrl(checkUrl));
  const t = cv.text(code, x - 8, y + size, size + 8, {
    font: ctx.fonts.monoBold,
    size: 7,
    minSize: 4.5,
    align: 'center',
  });
  if (withUrl) {
    const shown = checkUrl.replace(/^https?:\/\//, '');
    cv.text(shown, x, y + size + t.height, size, {
      font: ctx.fonts.mono,
      size: 5,
      minSize: 3.5,
      maxLines: 2,
      align: 'center',
    });
  }
}

/** True when the PPE cell shows a refusal (no adequate PPE, no level) instead of a level. */
function ppeRefused(d: D, c: LabelContent): boolean {
  return c.noAdequatePpe || c.ppeLevel === null || c.incidentEnergyCalPerCm2 > 40 || d.ppeLevel.value === '';
}

/** 4 × 6 in, portrait (288 × 432 pt). */
function drawTall(cv: Canvas, ctx: Ctx, c: LabelContent, qr: PDFRef, checkUrl: string): void {
  const d = labelDisplay(c);
  const W = TALL_W;
  const H = TALL_H;
  const f = ctx.fonts;
  cv.rect(4, 4, W - 8, H - 8, { stroke: BLACK, lineWidth: 1.2 });
  const L = 11;
  const R = W - 11;
  const CW = R - L;

  drawSignalPanel(cv, ctx, c, 7, 7, W - 14, 54, 36);

  let y = 66;
  cv.text(d.hazardStatement.value, L, y, CW, { font: f.textBold, size: 16, minSize: 10, align: 'center' });
  y += 20;
  cv.text(d.hazardCaution.value, L, y, CW, { font: f.text, size: 7.5, minSize: 6, align: 'center', maxLines: 2 });
  y += 13;
  cv.line(L, y, R, y, { width: 1 });

  // Arc flash: incident energy (left, large) and arc-flash boundary (right).
  y += 5;
  const leftW = CW * 0.58;
  const rightX = L + leftW + 8;
  const rightW = R - rightX;
  caption(cv, ctx, 'Incident energy', L, y, leftW, 7);
  numberWithUnit(cv, ctx, d.incidentEnergy.value, d.incidentEnergy.unit, L, y + 10, leftW, 30, 11);
  cv.text(d.incidentEnergy.secondary ?? '', L, y + 40, leftW, { font: f.mono, size: 9, minSize: 6 });
  cv.text(
    `at a working distance of ${displayText(d.workingDistance)} (${d.workingDistance.secondary})`,
    L,
    y + 51,
    leftW,
    {
      font: f.text,
      size: 7,
      minSize: 6,
    },
  );
  cv.line(rightX - 4, y, rightX - 4, y + 60, { width: 0.5 });
  caption(cv, ctx, 'Arc-flash boundary', rightX, y, rightW, 7);
  cv.text(displayText(d.arcFlashBoundary), rightX, y + 12, rightW, { font: f.monoBold, size: 18, minSize: 9 });
  cv.text(d.arcFlashBoundary.secondary ?? '', rightX, y + 34, rightW, { font: f.mono, size: 10, minSize: 6 });
  y += 64;

  // Minimum arc rating and PPE level.
  cv.line(L, y, R, y, { width: 0.5 });
  y += 4;
  const arcW = CW * 0.36;
  valueCell(
    cv,
    ctx,
    'Minimum arc rating',
    displayText(d.minimumArcRating),
    d.minimumArcRating.secondary ?? null,
    L,
    y,
    arcW,
    {
      caption: 6.5,
      value: 12,
      second: 8,
    },
  );
  const ppeX = L + arcW + 8;
  const ppeW = R - ppeX;
  if (ppeRefused(d, c)) {
    noPpeBox(cv, ctx, d.ppeLevel.value, ppeX, y - 1, ppeW, 28, 10);
  } else {
    caption(cv, ctx, 'PPE level', ppeX, y, ppeW, 6.5);
    const lv = cv.text(d.ppeLevel.value, ppeX, y + 8, ppeW, {
      font: f.textBold,
      size: 11,
      minSize: 6.5,
      maxLines: d.ppeLevel.secondary ? 1 : 2,
    });
    if (d.ppeLevel.secondary)
      cv.text(d.ppeLevel.secondary, ppeX, y + 8 + lv.height, ppeW, {
        font: f.text,
        size: 6.5,
        minSize: 6,
        maxLines: 2,
      });
  }
  y += 31;
  cv.line(L, y, R, y, { width: 1 });

  // Shock.
  y += 5;
  const third = (CW - 16) / 3;
  const sizes = { caption: 6, value: 10, second: 8 };
  valueCell(cv, ctx, 'Nominal voltage', displayText(d.nominalVoltage), null, L, y, third, { ...sizes, value: 14 });
  valueCell(cv, ctx, 'Glove class', displayText(d.gloveClass), null, L + third + 8, y, third, { ...sizes, value: 14 });
  const [rm, ri] = distanceParts(d.restrictedApproach);
  valueCell(cv, ctx, 'Restricted approach', rm, ri, L + 2 * (third + 8), y, third, sizes);
  y += 34;
  const half = (CW - 8) / 2;
  const [mm, mi] = distanceParts(d.limitedApproachMovable);
  const [fm, fi] = distanceParts(d.limitedApproachFixed);
  valueCell(cv, ctx, 'Limited approach, movable', mm, mi, L, y, half, sizes);
  valueCell(cv, ctx, 'Limited approach, fixed part', fm, fi, L + half + 8, y, half, sizes);
  y += 34;
  cv.line(L, y, R, y, { width: 1 });

  // Equipment, clearing device and study dates (left); QR code (right).
  y += 5;
  const top = y;
  const qrSize = 84;
  const qrX = R - qrSize + 4; // the image's quiet zone makes its own margin
  const eqW = qrX - L - 2;
  caption(cv, ctx, 'Equipment', L, y, eqW, 6.5);
  y += 8;
  y += cv.text(d.equipmentTag.value, L, y, eqW, { font: f.monoBold, size: 13, minSize: 7 }).height;
  y += cv.text(d.equipmentName.value, L, y, eqW, { font: f.textBold, size: 10, minSize: 6.5, maxLines: 2 }).height;
  y += cv.text(d.siteName.value, L, y, eqW, { font: f.text, size: 7.5, minSize: 6 }).height + 3;
  caption(cv, ctx, clearedByCaption(c), L, y, eqW, 6);
  y += 7;
  cv.text(clearedByText(d.clearedBy), L, y, eqW, { font: f.text, size: 7, minSize: 6, maxLines: 3 });
  y = top + 84;
  const third3 = (eqW - 8) / 3;
  const small = { caption: 6, value: 8.5, second: 7 };
  valueCell(cv, ctx, 'Study date', d.studyDate.value, null, L, y, third3 + 6, small);
  valueCell(cv, ctx, 'Review by', d.reviewByDate.value, null, L + third3 + 10, y, third3 + 6, small);
  valueCell(cv, ctx, 'Revision', d.studyRevision.value, null, L + 2 * third3 + 20, y, third3 - 12, small);
  drawQr(cv, ctx, qr, checkUrl, qrX, top - 3, qrSize, true);

  // Study, approval and caution, at the foot.
  y = top + 106;
  cv.line(L, y, R, y, { width: 0.5 });
  y += 3;
  y += cv.text(`Study: ${d.studyTitle.value}`, L, y, CW, { font: f.text, size: 6.5, minSize: 6 }).height;
  cv.text(`Approved by ${d.approvedBy.value}`, L, y, CW, { font: f.text, size: 6.5, minSize: 6 });
  cv.text(d.caution.value, L, H - 24, CW, { font: f.text, size: 6, minSize: 6, maxLines: 2 });
}

/** 4 × 4 in (288 × 288 pt); also drawn scaled into sheet cells. */
function drawCompact(cv: Canvas, ctx: Ctx, c: LabelContent, qr: PDFRef, checkUrl: string): void {
  const d = labelDisplay(c);
  const W = COMPACT;
  const H = COMPACT;
  const f = ctx.fonts;
  cv.rect(3.5, 3.5, W - 7, H - 7, { stroke: BLACK, lineWidth: 1 });
  const L = 9;
  const R = W - 9;
  const CW = R - L;

  drawSignalPanel(cv, ctx, c, 6, 6, W - 12, 30, 22);

  let y = 38;
  cv.text(d.hazardStatement.value, L, y, CW, { font: f.textBold, size: 11, minSize: 8, align: 'center' });
  y += 13;
  const hc = cv.text(d.hazardCaution.value, L, y, CW, {
    font: f.text,
    size: 6.2,
    minSize: 6,
    align: 'center',
    maxLines: 2,
    lineHeight: 1.1,
  });
  y += Math.max(9, hc.height + 1.5);
  cv.line(L, y, R, y, { width: 1 });

  y += 3;
  const leftW = CW * 0.56;
  const rightX = L + leftW + 7;
  const rightW = R - rightX;
  caption(cv, ctx, 'Incident energy', L, y, leftW, 6);
  numberWithUnit(cv, ctx, d.incidentEnergy.value, d.incidentEnergy.unit, L, y + 8, leftW, 22, 9);
  cv.text(
    `${d.incidentEnergy.secondary ?? ''} at ${displayText(d.workingDistance)} (${d.workingDistance.secondary})`,
    L,
    y + 31,
    leftW,
    {
      font: f.mono,
      size: 6.5,
      minSize: 6,
      maxLines: 2,
    },
  );
  cv.line(rightX - 3.5, y, rightX - 3.5, y + 40, { width: 0.5 });
  caption(cv, ctx, 'Arc-flash boundary', rightX, y, rightW, 6);
  cv.text(displayText(d.arcFlashBoundary), rightX, y + 9, rightW, { font: f.monoBold, size: 14, minSize: 8 });
  cv.text(d.arcFlashBoundary.secondary ?? '', rightX, y + 27, rightW, { font: f.mono, size: 8, minSize: 6 });
  y += 42;

  cv.line(L, y, R, y, { width: 0.5 });
  y += 3;
  const arcW = CW * 0.34;
  valueCell(cv, ctx, 'Minimum arc rating', displayText(d.minimumArcRating), null, L, y, arcW, {
    caption: 6,
    value: 9.5,
    second: 7,
  });
  const ppeX = L + arcW + 6;
  const ppeW = R - ppeX;
  if (ppeRefused(d, c)) {
    noPpeBox(cv, ctx, d.ppeLevel.value, ppeX, y, ppeW, 19, 8.5);
  } else {
    caption(cv, ctx, 'PPE level', ppeX, y, ppeW, 6);
    const lv = cv.text(d.ppeLevel.value, ppeX, y + 7, ppeW, {
      font: f.textBold,
      size: d.ppeLevel.secondary ? 8 : 9,
      minSize: 6,
      maxLines: d.ppeLevel.secondary ? 1 : 2,
    });
    if (d.ppeLevel.secondary)
      cv.text(d.ppeLevel.secondary, ppeX, y + 7 + lv.height, ppeW, {
        font: f.text,
        size: 6,
        minSize: 6,
        maxLines: 2,
        lineHeight: 1.1,
      });
  }
  y += d.ppeLevel.secondary ? 29 : 23;
  cv.line(L, y, R, y, { width: 1 });

  y += 3;
  const third = (CW - 10) / 3;
  const sizes = { caption: 6, value: 8, second: 6.5 };
  valueCell(cv, ctx, 'Nominal voltage', displayText(d.nominalVoltage), null, L, y, third, { ...sizes, value: 10 });
  valueCell(cv, ctx, 'Glove class', displayText(d.gloveClass), null, L + third + 5, y, third, { ...sizes, value: 10 });
  const approach = (a: DisplayValue) => (a.secondary ? `${displayText(a)} (${a.secondary})` : displayText(a));
  valueCell(cv, ctx, 'Restricted approach', approach(d.restrictedApproach), null, L + 2 * (third + 5), y, third, sizes);
  y += 20;
  const half = (CW - 6) / 2;
  valueCell(cv, ctx, 'Limited approach, movable', approach(d.limitedApproachMovable), null, L, y, half, sizes);
  valueCell(
    cv,
    ctx,
    'Limited approach, fixed part',
    approach(d.limitedApproachFixed),
    null,
    L + half + 6,
    y,
    half,
    sizes,
  );
  y += 20;
  cv.line(L, y, R, y, { width: 1 });

  y += 3;
  const top = y;
  const qrSize = 72;
  const qrX = R - qrSize + 2.5;
  const eqW = qrX - L - 1;
  y += cv.text(d.equipmentTag.value, L, y, eqW, { font: f.monoBold, size: 10.5, minSize: 6 }).height;
  y += cv.text(d.equipmentName.value, L, y, eqW, { font: f.textBold, size: 8.5, minSize: 6, maxLines: 2 }).height;
  y += cv.text(d.siteName.value, L, y, eqW, { font: f.text, size: 6.5, minSize: 6 }).height + 2;
  y += cv.text(clearedByLine(c, d.clearedBy), L, y, eqW, { font: f.text, size: 6, minSize: 6, maxLines: 3 }).height + 2;
  y += cv.text(`Study date ${d.studyDate.value}  ·  Review by ${d.reviewByDate.value}`, L, y, eqW, {
    font: f.monoBold,
    size: 6,
    minSize: 6,
  }).height;
  y += cv.text(`Study: ${d.studyTitle.value}, revision ${d.studyRevision.value}`, L, y, eqW, {
    font: f.text,
    size: 6,
    minSize: 6,
  }).height;
  cv.text(`Approved by ${d.approvedBy.value}`, L, y, eqW, { font: f.text, size: 6, minSize: 6, maxLines: 2 });
  drawQr(cv, ctx, qr, checkUrl, qrX, top - 2, qrSize, false);

  cv.text(d.caution.value, L, H - 19.5, CW, { font: f.text, size: 6, minSize: 6, maxLines: 2 });
}

function drawCutLines(page: PDFPage, size: 'letter' | 'a4'): void {
  const { width, height } = PAGE[size];
  const { columns, rows, margin, gutter } = SHEET_GRID;
  const cells = sheetCells(size);
  const cw = cells[0].width;
  const ch = cells[0].height;
  const dash = [3, 3];
  const opts = { thickness: 0.3, color: BLACK, dashArray: dash };
  for (let c = 1; c < columns; c += 1) {
    const x = margin + c * cw + (c - 0.5) * gutter;
    page.drawLine({ start: { x, y: margin * 0.4 }, end: { x, y: height - margin * 0.4 }, ...opts });
  }
  for (let r = 1; r < rows; r += 1) {
    const yTop = margin + r * ch + (r - 0.5) * gutter;
    const y = height - yTop;
    page.drawLine({ start: { x: margin * 0.4, y }, end: { x: width - margin * 0.4, y }, ...opts });
  }
}

/**
 * Renders labels into one PDF. 4×6 and 4×4: one label per page. Letter and A4: six per page (2 × 3) with cut
 * lines. Fonts are embedded once per document; each label's QR code is embedded as a PNG image.
 */
export async function renderLabels(
  labels: readonly LabelToRender[],
  size: LabelPdfSize,
  opts: RenderLabelsOptions = {},
): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  doc.setTitle(
    labels.length === 1 ? `Arc-flash label ${labels[0].content.equipmentTag}` : `Arc-flash labels (${labels.length})`,
  );
  doc.setCreator('Emberline');
  doc.setProducer('Emberline');
  const ctx: Ctx = { fonts: await embedFonts(doc) };
  const total = labels.length;
  const sheet = size === 'letter' || size === 'a4';
  const cells = sheet ? sheetCells(size) : [];
  let page: PDFPage | null = null;
  for (let i = 0; i < total; i += 1) {
    const { content, checkUrl } = labels[i];
    const qr = embedQrImage(doc, checkUrl).ref;
    if (size === '4x6') {
      page = doc.addPage([PAGE['4x6'].width, PAGE['4x6'].height]);
      const cv = new Canvas(page, TALL_H);
      cv.minPrintedPt = MIN_PRINTED_TEXT_PT;
      drawTall(cv, ctx, content, qr, checkUrl);
    } else if (size === '4x4') {
      page = doc.addPage([PAGE['4x4'].width, PAGE['4x4'].height]);
      const cv = new Canvas(page, COMPACT);
      cv.minPrintedPt = MIN_PRINTED_TEXT_PT;
      drawCompact(cv, ctx, content, qr, checkUrl);
    } else {
      const slot = i % cells.length;
      if (slot === 0 || page === null) {
        page = doc.addPage([PAGE[size].width, PAGE[size].height]);
        drawCutLines(page, size);
      }
      const cell = cells[slot];
      const scale = Math.min(cell.width / COMPACT, cell.height / COMPACT);
      const box = {
        left: cell.left + (cell.width - COMPACT * scale) / 2,
        top: cell.top + (cell.height - COMPACT * scale) / 2,
        width: COMPACT,
        height: COMPACT,
      };
      const cv = Canvas.at(page, box, scale);
      cv.minPrintedPt = MIN_PRINTED_TEXT_PT;
      drawCompact(cv, ctx, content, qr, checkUrl);
      cv.close();
    }
    opts.onProgress?.(i + 1, total);
  }
  if (total === 0) doc.addPage([PAGE[size].width, PAGE[size].height]); // a valid, empty document
  return doc.save();
}
