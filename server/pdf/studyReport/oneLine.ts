/**
 * Section 3, inputs, continued: the one-line diagram drawn from the model (shared/oneLine, the same drawing as the app
 * and the SVG route), with the hazard at each labelled bus. A large drawing is split into sheets, left to right then
 * top to bottom, each marked with its place; sheets with nothing on them are left out, and past MAX_SHEETS the rest is
 * named (the whole drawing is in the app and its SVG).
 */
import { clip, endPath, popGraphicsState, pushGraphicsState, rectangle } from 'pdf-lib';
import { layoutOneLine } from '../../../shared/oneLine/layout';
import { hazardsFromResults } from '../../../shared/oneLine/hazards';
import type { Box, OneLineDrawing, Shape, Tone } from '../../../shared/oneLine/geometry';
import { ONE_LINE_PALETTE } from '../../../shared/oneLine/svg';
import type { Model } from '../../../shared/schemas/model';
import type { StudyResults } from '../../../shared/schemas/studyResults';
import { Canvas, hexColor } from '../canvas';
import { CONTENT_W, MARGIN_X, type ReportWriter } from './writer';

/** Drawing px to page points: 11 px text prints at 6.6 pt (common practice for drawings, no source). */
const SCALE = 0.6;
const SHEET_H = 600;
export const MAX_SHEETS = 24;

const color = (t: Tone) => hexColor(ONE_LINE_PALETTE[t]);

function drawShape(cv: Canvas, s: Shape, w: ReportWriter): void {
  const dash = 'dashed' in s && s.dashed ? [5, 4] : undefined;
  switch (s.t) {
    case 'line':
      for (let i = 2; i < s.pts.length; i += 2) {
        cv.line(s.pts[i - 2], s.pts[i - 1], s.pts[i], s.pts[i + 1], { width: s.width, color: color(s.tone), dash });
      }
      return;
    case 'rect':
      cv.rect(s.x, s.y, s.w, s.h, {
        fill: s.fill ? color(s.fill) : undefined,
        stroke: color(s.tone),
        lineWidth: 1.2,
        dash,
      });
      return;
    case 'circle':
      cv.circle(s.cx, s.cy, s.r, { fill: s.fill ? color(s.fill) : undefined, stroke: color(s.tone), lineWidth: 1.2 });
      return;
    case 'text': {
      const font = s.bold ? w.fonts.textBold : w.fonts.text;
      const width = font.widthOfTextAtSize(s.text, s.size);
      const x = s.anchor === 'middle' ? s.x - width / 2 : s.anchor === 'end' ? s.x - width : s.x;
      cv.textAt(s.text, x, s.y, font, s.size, color(s.tone));
    }
  }
}

const intersects = (a: Box, b: Box) => a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;

/** The sheets (drawing px) a drawing is split into, those with something on them. */
export function oneLineSheets(d: OneLineDrawing): Box[] {
  const tw = CONTENT_W / SCALE;
  const th = SHEET_H / SCALE;
  const sheets: Box[] = [];
  for (let y = 0; y < d.height; y += th) {
    for (let x = 0; x < d.width; x += tw) {
      const tile = { x, y, w: tw, h: th };
      if (d.elements.some((e) => intersects(e.box, tile))) sheets.push(tile);
    }
  }
  return sheets;
}

export function renderOneLine(w: ReportWriter, results: StudyResults, model: Model): void {
  const d = layoutOneLine(model, { hazards: hazardsFromResults(results) });
  const sheets = oneLineSheets(d);
  const shown = sheets.slice(0, MAX_SHEETS);
  shown.forEach((tile, i) => {
    w.newPage();
    w.heading(sheets.length > 1 ? `One-line diagram (sheet ${i + 1} of ${sheets.length})` : 'One-line diagram', 2);
    if (i === 0) {
      w.paragraph(
        'Drawn from the model: sources at the top, power flowing down; at each labelled bus its incident energy and signal word (and the governing scenario where the study has several). ' +
          d.notes.join(' '),
        { size: 8 },
      );
    }
    const top = w.y + 4;
    const page = w.pages[w.pages.length - 1];
    const pageH = page.getHeight();
    // Clip to the sheet so what lies on the next sheet is not drawn here.
    page.pushOperators(
      pushGraphicsState(),
      rectangle(MARGIN_X, pageH - top - tile.h * SCALE, tile.w * SCALE, tile.h * SCALE),
      clip(),
      endPath(),
    );
    const cv = Canvas.at(
      page,
      { left: MARGIN_X - tile.x * SCALE, top: top - tile.y * SCALE, width: d.width, height: d.height },
      SCALE,
    );
    const near = { x: tile.x - 400, y: tile.y - 100, w: tile.w + 800, h: tile.h + 200 };
    for (const c of d.connections) {
      const xs = c.pts.filter((_, k) => k % 2 === 0);
      const ys = c.pts.filter((_, k) => k % 2 === 1);
      const b = {
        x: Math.min(...xs),
        y: Math.min(...ys),
        w: Math.max(...xs) - Math.min(...xs) + 1,
        h: Math.max(...ys) - Math.min(...ys) + 1,
      };
      if (intersects(b, tile)) drawShape(cv, { t: 'line', pts: c.pts, tone: 'ink', width: 1.2, dashed: c.dashed }, w);
    }
    for (const e of d.elements) {
      if (!intersects(e.box, near)) continue;
      for (const s of e.shapes) drawShape(cv, s, w);
    }
    cv.close();
    page.pushOperators(popGraphicsState());
    w.y = top + tile.h * SCALE + 8;
  });
  if (sheets.length > shown.length) {
    w.paragraph(
      `${sheets.length - shown.length} further sheet(s) of the one-line diagram are not printed here; the whole drawing is in the study's One-line view and its SVG.`,
      { size: 8.5 },
    );
  }
}
