/**
 * Label PDFs: what a printed label says (read back from the PDF with pdf-parse), the QR code (read back from the
 * image embedded in the PDF with jsQR), the signal-word panel colours, page sizes and sheet page counts, and the
 * text fitting that keeps every line inside its box.
 *
 * Sources: the label content is NFPA 70E 130.5(H) (nominal voltage, arc-flash boundary, incident energy at the
 * working distance, minimum arc rating, site PPE level); the header is ANSI Z535.4 (DANGER: white on safety red,
 * WARNING: black on safety orange). The 25.4 mm inch is exact by definition (international inch). Layout choices
 * (sizes, 2 × 3 sheets, rounding hazard values up) are conventions: "common practice, no source".
 */
import * as fc from 'fast-check';
import { PDFArray, PDFDocument, decodePDFRawStream, PDFRawStream, type PDFFont } from 'pdf-lib';
import type { LabelContent } from '../../shared/schemas/labels';
import { SAFETY_COLORS } from '../../shared/safetyColors';
import { embedFonts, printable } from '../../server/pdf/fonts';
import {
  ceilTo,
  codeFromCheckUrl,
  feetInchesUp,
  formatBoundary,
  formatCalPerCm2,
  formatJPerCm2,
  formatVoltage,
  formatWorkingDistance,
  groupCode,
} from '../../server/pdf/format';
import { NO_ADEQUATE_PPE_TEXT, labelsPerPage, pageCountFor, renderLabels, sheetCells } from '../../server/pdf/labels';
import { qrModules, qrPng } from '../../server/pdf/qr';
import { decodeQrPng } from '../helpers/qr';
import { fitText, wrapText, type MeasuringFont } from '../../server/pdf/text';
import { readPdf } from '../helpers/pdfText';
import { expectClose } from '../helpers/approx';

// ---------------------------------------------------------------------------------------------
// Fixtures (invented)

const warning: LabelContent = {
  signalWord: 'WARNING',
  equipmentTag: 'MCC-2',
  equipmentName: 'Motor control centre 2 — influent pumps',
  siteName: 'Larkspur Valley Water Reclamation Facility',
  nominalVoltageV: 480,
  incidentEnergyCalPerCm2: 8.734,
  incidentEnergyJPerCm2: 36.543,
  workingDistanceMm: 457.2,
  arcFlashBoundaryMm: 1834.6,
  minimumArcRatingCalPerCm2: 9,
  ppeLevel: 'PPE level 3',
  noAdequatePpe: false,
  limitedApproachMovable: '3.0 m (10 ft 0 in)',
  limitedApproachFixed: '1.0 m (3 ft 6 in)',
  restrictedApproach: '0.3 m (1 ft 0 in)',
  gloveClass: 'Class 00',
  clearingDevice: 'CB-MCC2 (MCC 2 feeder breaker)',
  governingCase: 'reduced arcing current',
  studyTitle: 'Plant-wide incident energy study',
  studyRevision: 2,
  studyDate: '2025-03-14',
  reviewByDate: '2030-03-14',
  approvedBy: 'Dana Okafor, licence PE-40921 (Oregon)',
  caution:
    'Values from an engineering study (IEEE 1584-2018). De-energize where possible; follow the electrical safety program.',
};

const danger: LabelContent = {
  ...warning,
  signalWord: 'DANGER',
  equipmentTag: 'SWGR-A',
  equipmentName: 'Main switchgear, 12.47 kV service entrance',
  nominalVoltageV: 12470,
  incidentEnergyCalPerCm2: 54.21,
  incidentEnergyJPerCm2: 226.81,
  workingDistanceMm: 914.4,
  arcFlashBoundaryMm: 12840,
  minimumArcRatingCalPerCm2: 55,
  ppeLevel: null,
  noAdequatePpe: true,
  limitedApproachFixed: '1.5 m (5 ft 0 in)',
  restrictedApproach: '0.7 m (2 ft 2 in)',
  gloveClass: 'Class 2',
  clearingDevice: 'R-UTIL (Utility service relay)',
  governingCase: 'full arcing current, line side of the main',
  reviewByDate: '2029-11-30',
  approvedBy: 'Morgan Ilves, licence 77-1234 (Nevada)',
};

const url = (code: string) => `https://emberline.example/l/${code}`;

// ---------------------------------------------------------------------------------------------
// Helpers

async function pdfText(bytes: Uint8Array): Promise<{ text: string; pages: number }> {
  const { text, pages } = readPdf(bytes);
  return { text, pages };
}

/** Every image in the PDF, page by page, decoded as a QR code. */
async function pdfQrCodes(bytes: Uint8Array): Promise<(string | null)[][]> {
  return readPdf(bytes, { images: true }).images.map((page) => page.map((png) => decodeQrPng(png)));
}

/** The decoded content streams of a page, as text (to find fill-colour operators). */
async function pageOperators(bytes: Uint8Array, index = 0): Promise<string> {
  const doc = await PDFDocument.load(bytes);
  const page = doc.getPage(index);
  const contents = page.node.Contents();
  const streams: PDFRawStream[] = [];
  if (contents instanceof PDFRawStream) streams.push(contents);
  else if (contents instanceof PDFArray) {
    for (let i = 0; i < contents.size(); i += 1) {
      const s = contents.lookup(i);
      if (s instanceof PDFRawStream) streams.push(s);
    }
  }
  return streams.map((s) => Buffer.from(decodePDFRawStream(s).decode()).toString('latin1')).join('\n');
}

/** "#C8102E" → a pattern of the PDF fill operator for it: "0.78\d* 0.06\d* 0.18\d* rg". */
function fillPattern(hex: string): RegExp {
  const parts = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255);
  const num = (v: number) =>
    `${(Math.floor(v * 100) / 100).toFixed(2).replace(/0+$/, '').replace(/\.$/, '').replace('.', '\\.')}\\d*`;
  return new RegExp(parts.map((p) => (p === 0 || p === 1 ? `${p}` : num(p))).join(' ') + ' rg');
}

async function fonts(): Promise<Record<'text' | 'textBold' | 'mono' | 'monoBold', PDFFont>> {
  const doc = await PDFDocument.create();
  return embedFonts(doc);
}

// ---------------------------------------------------------------------------------------------
// Text fitting

describe('fitText (labels and report keep text inside its box; common practice, no source)', () => {
  const longName =
    'Lighting and receptacle panelboard serving the north annex laboratory, emergency branch, second floor east corridor near the chemical storage room';

  it('wraps a very long equipment name into at most maxLines lines, each no wider than the box (font metrics)', async () => {
    const f = await fonts();
    const r = fitText(f.textBold, longName, { maxWidth: 180, size: 10, minSize: 6.5, maxLines: 2 });
    expect(r.lines.length).toBeLessThanOrEqual(2);
    expect(r.lines.length).toBeGreaterThan(0);
    for (const line of r.lines) expect(f.textBold.widthOfTextAtSize(line, r.size)).toBeLessThanOrEqual(180);
    // Too long for two lines even at the smallest size: shrunk to it, then cut with an ellipsis.
    expect(r.size).toBe(6.5);
    expect(r.truncated).toBe(true);
    expect(r.lines[r.lines.length - 1].endsWith('…')).toBe(true);
    expect(longName.startsWith(r.lines[0])).toBe(true);
  });

  it('shrinks before it cuts: a name that fits two lines at a smaller size keeps every word', async () => {
    const f = await fonts();
    const name = 'Main switchgear, 12.47 kV service entrance, north bay';
    const atPreferred = wrapText(f.textBold, name, 150, 12);
    expect(atPreferred.length).toBeGreaterThan(2); // needs shrinking
    const r = fitText(f.textBold, name, { maxWidth: 150, size: 12, minSize: 6, maxLines: 2 });
    expect(r.truncated).toBe(false);
    expect(r.size).toBeLessThan(12);
    expect(r.size).toBeGreaterThanOrEqual(6);
    expect(r.lines.join(' ')).toBe(name);
    for (const line of r.lines) expect(f.textBold.widthOfTextAtSize(line, r.size)).toBeLessThanOrEqual(150);
  });

  it('keeps short text at the preferred size on one line', async () => {
    const f = await fonts();
    const r = fitText(f.text, 'MCC-2', { maxWidth: 200, size: 12 });
    expect(r).toEqual({ lines: ['MCC-2'], size: 12, truncated: false });
  });

  it('breaks a single word wider than the box by character', async () => {
    const f = await fonts();
    const word = 'PNL-LP-2B-NORTH-ANNEX-EMERGENCY-SECOND-FLOOR-EAST';
    const lines = wrapText(f.monoBold, word, 60, 10);
    expect(lines.length).toBeGreaterThan(1);
    expect(lines.join('')).toBe(word);
    for (const line of lines) expect(f.monoBold.widthOfTextAtSize(line, 10)).toBeLessThanOrEqual(60);
  });

  it('returns no line wider than the box, and no more lines than allowed, for any text (property)', async () => {
    const f = await fonts();
    const font = f.text;
    fc.assert(
      fc.property(
        fc.string({
          unit: fc.constantFrom(...'abcdefghijklmnopqrstuvwxyz ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789-,.()/—²'.split('')),
          maxLength: 300,
        }),
        fc.double({ min: 20, max: 300, noNaN: true }),
        fc.integer({ min: 1, max: 4 }),
        (text, maxWidth, maxLines) => {
          const r = fitText(font, text, { maxWidth, size: 11, minSize: 6, maxLines });
          expect(r.lines.length).toBeLessThanOrEqual(maxLines);
          expect(r.size).toBeGreaterThanOrEqual(6);
          expect(r.size).toBeLessThanOrEqual(11);
          for (const line of r.lines) expect(font.widthOfTextAtSize(line, r.size)).toBeLessThanOrEqual(maxWidth);
          // Nothing lost unless cut: the same characters, in order, apart from whitespace.
          if (!r.truncated) expect(r.lines.join('').replace(/\s/g, '')).toBe(text.replace(/\s/g, ''));
        },
      ),
      { numRuns: 150 },
    );
  });

  it('works with any measuring font (a fixed-advance fake: 0.5 em per character)', () => {
    const fake: MeasuringFont = { widthOfTextAtSize: (t, s) => Array.from(t).length * 0.5 * s };
    const r = fitText(fake, 'aaaa bbbb cccc dddd', { maxWidth: 20, size: 10, maxLines: 2, minSize: 5 });
    // 10 pt: 5 pt a character, 4 characters a line → 4 lines; 5 pt: 2.5 pt, 8 characters → "aaaa", "bbbb"... still
    // one word a line ("aaaa bbbb" is 9 characters = 22.5 pt), so cut at 5 pt.
    expect(r.size).toBe(5);
    expect(r.truncated).toBe(true);
    expect(r.lines).toHaveLength(2);
    for (const l of r.lines) expect(fake.widthOfTextAtSize(l, r.size)).toBeLessThanOrEqual(20);
  });

  it('replaces characters the font has no glyph for, and line breaks, so nothing draws as a missing box', async () => {
    const f = await fonts();
    expect(printable('Panel\nA\tB', f.text)).toBe('Panel A B');
    // IBM Plex Mono has no safety-sign glyph (U+26A0); Inter has it.
    expect(printable('⚠ MCC', f.mono)).toBe('? MCC');
    expect(printable('⚠ MCC', f.text)).toBe('⚠ MCC');
  });
});

// ---------------------------------------------------------------------------------------------
// Number formats

describe('printed values', () => {
  it('prints the boundary in metres and feet-inches, each rounded up (25.4 mm/in exact; rounding up: common practice, no source)', () => {
    // 4605.36 mm = 4.60536 m → 4.61 m; 4605.36 / 25.4 = 181.31 in → 182 in = 15 ft 2 in.
    expect(formatBoundary(4605.36)).toBe('4.61 m (15 ft 2 in)');
    // Exactly 1219.2 mm = 48 in = 4 ft 0 in (no rounding up of an exact value).
    expect(feetInchesUp(1219.2)).toBe('4 ft 0 in');
    expect(feetInchesUp(250)).toBe('10 in');
  });

  it('prints the working distance as entered, rounded to mm and inch (609.6 mm = 24 in exactly)', () => {
    expect(formatWorkingDistance(609.6)).toBe('610 mm (24 in)');
    expect(formatWorkingDistance(914.4)).toBe('914 mm (36 in)');
  });

  it('never prints an energy below the computed one (rounded up; common practice, no source)', () => {
    expect(formatCalPerCm2(30.253)).toBe('30.3');
    expect(formatCalPerCm2(40.01)).toBe('40.1'); // not "40.0", which would read as at or below 40
    expect(formatCalPerCm2(0.158)).toBe('0.16');
    expect(formatJPerCm2(126.58)).toBe('126.6');
    expectClose(ceilTo(4.2, 1), 4.2); // float noise (4.2000000001) does not round up
    // 1 cal = 4.184 J (thermochemical calorie): 1.2 cal/cm² = 5.0208 J/cm²
    expect(formatJPerCm2(1.2 * 4.184)).toBe('5.1');
  });

  it('prints voltage and the check code', () => {
    expect(formatVoltage(480)).toBe('480 V');
    expect(formatVoltage(12470)).toBe('12.47 kV');
    expect(formatVoltage(4160)).toBe('4.16 kV');
    expect(codeFromCheckUrl('https://emberline.example/l/7K3M9QXW2R4TBH6N')).toBe('7K3M9QXW2R4TBH6N');
    expect(groupCode('7K3M9QXW2R4TBH6N')).toBe('7K3M 9QXW 2R4T BH6N');
  });
});

// ---------------------------------------------------------------------------------------------
// QR codes

describe('QR codes', () => {
  it('qrPng encodes the check address and decodes back to it', async () => {
    const address = url('7K3M9QXW2R4TBH6N');
    const png = await qrPng(address);
    expect(png.subarray(0, 8).toString('hex')).toBe('89504e470d0a1a0a');
    expect(decodeQrPng(png)).toBe(address);
  });

  it('the module matrix has a QR size (21 + 4·k modules per side, ISO/IEC 18004) and finder patterns in three corners', () => {
    const { size, dark } = qrModules(url('7K3M9QXW2R4TBH6N'));
    expect((size - 21) % 4).toBe(0);
    const at = (x: number, y: number) => dark[y * size + x];
    // Finder pattern: a 7 × 7 dark ring, a light ring, a 3 × 3 dark centre.
    for (const [ox, oy] of [
      [0, 0],
      [size - 7, 0],
      [0, size - 7],
    ]) {
      expect(at(ox, oy)).toBe(1);
      expect(at(ox + 6, oy + 6)).toBe(1);
      expect(at(ox + 1, oy + 1)).toBe(0);
      expect(at(ox + 3, oy + 3)).toBe(1);
    }
    // Timing patterns: row 6 and column 6 alternate dark and light between the finders, dark on even indices.
    for (let i = 8; i <= size - 9; i += 1) {
      expect(at(i, 6)).toBe(i % 2 === 0 ? 1 : 0);
      expect(at(6, i)).toBe(i % 2 === 0 ? 1 : 0);
    }
  });
});

// ---------------------------------------------------------------------------------------------
// Labels

describe('renderLabels', () => {
  it('DANGER 4×6: one 4 × 6 in page saying the values, with its QR code embedded', async () => {
    const checkUrl = url('DNGR0000SWGR00A1');
    const bytes = await renderLabels([{ content: danger, checkUrl }], '4x6');
    const doc = await PDFDocument.load(bytes);
    expect(doc.getPageCount()).toBe(1);
    const { width, height } = doc.getPage(0).getSize();
    expectClose(width, 4 * 72); // 72 pt per inch (PDF user space)
    expectClose(height, 6 * 72);

    const { text } = await pdfText(bytes);
    expect(text).toContain('DANGER');
    expect(text).not.toContain('WARNING');
    expect(text).toContain('ARC FLASH AND SHOCK HAZARD');
    expect(text).toContain('54.3 cal/cm²'); // 54.21 rounded up
    expect(text).toContain('226.9 J/cm²'); // 226.81 rounded up
    expect(text).toContain('914 mm (36 in)');
    expect(text).toContain('12.84 m');
    expect(text).toContain('42 ft 2 in'); // 12840 mm = 505.5 in → 506 in
    // Above 40 cal/cm² the minimum arc rating is no number but the statement (common practice, no source).
    expect(text).not.toContain('55 cal/cm²');
    expect(text).toContain('No arc-rated PPE is adequate');
    expect(text).toContain(NO_ADEQUATE_PPE_TEXT.replace(/\s+/g, ' '));
    expect(text).toContain('12.47 kV');
    expect(text).toContain('0.7 m');
    expect(text).toContain('1.5 m');
    expect(text).toContain('SWGR-A');
    expect(text).toContain('Main switchgear, 12.47 kV service entrance');
    expect(text).toContain('Larkspur Valley Water Reclamation Facility');
    expect(text).toContain('R-UTIL (Utility service relay)');
    expect(text).toContain('2025-03-14');
    expect(text).toContain('2029-11-30');
    expect(text).toContain('Morgan Ilves, licence 77-1234 (Nevada)');
    expect(text).toContain('DNGR 0000 SWGR 00A1');

    expect(await pdfQrCodes(bytes)).toEqual([[checkUrl]]);

    // ANSI Z535.4: DANGER panel in safety red with white lettering; no safety orange.
    const ops = await pageOperators(bytes);
    expect(ops).toMatch(fillPattern(SAFETY_COLORS['safety red']));
    expect(ops).not.toMatch(fillPattern(SAFETY_COLORS['safety orange']));
    expect(ops).toMatch(/\n1 1 1 rg/);
  });

  it('WARNING 4×4: one 4 × 4 in page with the PPE level, safety orange and black lettering', async () => {
    const checkUrl = url('WRNG0000MCC20002');
    const bytes = await renderLabels([{ content: warning, checkUrl }], '4x4');
    const doc = await PDFDocument.load(bytes);
    expect(doc.getPageCount()).toBe(1);
    const { width, height } = doc.getPage(0).getSize();
    expectClose(width, 4 * 72);
    expectClose(height, 4 * 72);

    const { text } = await pdfText(bytes);
    expect(text).toContain('WARNING');
    expect(text).not.toContain('DANGER');
    expect(text).toContain('8.8 cal/cm²'); // 8.734 rounded up
    expect(text).toContain('36.6 J/cm²');
    expect(text).toContain('457 mm (18 in)');
    expect(text).toContain('1.84 m');
    expect(text).toContain('6 ft 1 in'); // 1834.6 mm = 72.23 in → 73 in
    expect(text).toContain('PPE level 3');
    expect(text).not.toContain('NO ARC-RATED PPE');
    expect(text).toContain('480 V');
    expect(text).toContain('MCC-2');
    expect(text).toContain('Motor control centre 2 — influent pumps');
    expect(text).toContain('Review by 2030-03-14');
    expect(text).toContain('Dana Okafor, licence PE-40921 (Oregon)');

    expect(await pdfQrCodes(bytes)).toEqual([[checkUrl]]);

    const ops = await pageOperators(bytes);
    expect(ops).toMatch(fillPattern(SAFETY_COLORS['safety orange']));
    expect(ops).not.toMatch(fillPattern(SAFETY_COLORS['safety red']));
  });

  it('a very long equipment name still renders: its start is printed and the rest is cut with an ellipsis', async () => {
    const long = {
      ...warning,
      equipmentTag: 'PNL-LP-2B-NORTH-ANNEX-EMERGENCY-SECOND-FLOOR',
      equipmentName:
        'Lighting and receptacle panelboard serving the north annex laboratory, emergency branch, second floor east corridor near the chemical storage room and the generator annunciator',
    };
    for (const size of ['4x6', '4x4'] as const) {
      const bytes = await renderLabels([{ content: long, checkUrl: url('LONG000000000001') }], size);
      const { text, pages } = await pdfText(bytes);
      expect(pages).toBe(1);
      expect(text).toContain('Lighting and receptacle panelboard');
      expect(text).toContain('…');
      expect(text).not.toContain('generator annunciator');
    }
  });

  it('renders text the fonts cannot draw without failing (replaced by "?")', async () => {
    // Devanagari: none of the shipped faces has it (CJK prints with the fallback faces: pdf-scripts.test.ts).
    const bytes = await renderLabels(
      [{ content: { ...warning, equipmentName: 'पैनल Panel 3' }, checkUrl: url('GLYPH00000000001') }],
      '4x4',
    );
    const { text } = await pdfText(bytes);
    expect(text).toContain('???? Panel 3');
  });

  it('sheets: four labels a page in a 2 × 2 grid inside the page (no text below 6 pt), each with its own QR code, in order', async () => {
    expect(labelsPerPage('letter')).toBe(4);
    expect(labelsPerPage('4x6')).toBe(1);
    expect(pageCountFor('letter', 7)).toBe(2);
    expect(pageCountFor('a4', 12)).toBe(3);
    expect(pageCountFor('a4', 13)).toBe(4);
    for (const size of ['letter', 'a4'] as const) {
      const page = size === 'letter' ? { w: 612, h: 792 } : { w: (210 * 72) / 25.4, h: (297 * 72) / 25.4 };
      for (const cell of sheetCells(size)) {
        expect(cell.left).toBeGreaterThan(0);
        expect(cell.top).toBeGreaterThan(0);
        expect(cell.left + cell.width).toBeLessThan(page.w);
        expect(cell.top + cell.height).toBeLessThan(page.h);
      }
    }

    const seven = Array.from({ length: 7 }, (_, i) => ({
      content: { ...(i % 2 === 0 ? warning : danger), equipmentTag: `EQ-${i + 1}` },
      checkUrl: url(`SHEET00000000${String(i + 1).padStart(3, '0')}`),
    }));
    const progress: [number, number][] = [];
    const bytes = await renderLabels(seven, 'letter', { onProgress: (done, total) => progress.push([done, total]) });
    const doc = await PDFDocument.load(bytes);
    expect(doc.getPageCount()).toBe(2);
    expectClose(doc.getPage(0).getWidth(), 612); // US letter, 8.5 × 11 in
    expectClose(doc.getPage(0).getHeight(), 792);
    expect(progress).toEqual(seven.map((_, i) => [i + 1, 7]));

    const { text } = await pdfText(bytes);
    for (let i = 1; i <= 7; i += 1) expect(text).toContain(`EQ-${i}`);
    const codes = await pdfQrCodes(bytes);
    expect(codes.map((p) => p.length)).toEqual([4, 3]);
    expect(codes.flat()).toEqual(seven.map((l) => l.checkUrl));

    const a4 = await PDFDocument.load(await renderLabels(seven.slice(0, 4), 'a4'));
    expect(a4.getPageCount()).toBe(1);
    expectClose(a4.getPage(0).getWidth(), (210 * 72) / 25.4); // ISO 216 A4, 210 × 297 mm
    expectClose(a4.getPage(0).getHeight(), (297 * 72) / 25.4);
  });

  it('4×6 and 4×4 print one label a page', async () => {
    const three = [0, 1, 2].map((i) => ({ content: warning, checkUrl: url(`PAGE00000000000${i}`) }));
    expect((await PDFDocument.load(await renderLabels(three, '4x6'))).getPageCount()).toBe(3);
    expect((await PDFDocument.load(await renderLabels(three, '4x4'))).getPageCount()).toBe(3);
  });
});
