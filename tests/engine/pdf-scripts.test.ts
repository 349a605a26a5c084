/**
 * Non-Latin text on labels and study reports: accents and Greek print with the shipped fonts (Inter has Greek;
 * where the mono face has no glyph the text face of the same weight is used), Chinese, Japanese and Korean with
 * the CJK fallback faces (fonts/README.md), instead of "?". A fallback face goes only into a PDF whose text needs
 * it, as a subset; the subset's glyphs are checked outline by outline against the font file's own.
 */
import fs from 'node:fs';
import path from 'node:path';
import fontkit from '@pdf-lib/fontkit';
import { PDFDict, PDFDocument, PDFName, PDFRawStream, decodePDFRawStream, type PDFRef } from 'pdf-lib';
import type { LabelContent } from '../../shared/schemas/labels';
import { CAUTIONS } from '../../shared/cautions';
import { modelSchema } from '../../shared/schemas/model';
import type { StudyDto } from '../../shared/schemas/studies';
import { runStudy } from '../../server/engine/study';
import { FALLBACK_FONT_FILES, FONT_DIR } from '../../server/pdf/fonts';
import { renderLabels } from '../../server/pdf/labels';
import { renderStudyReport } from '../../server/pdf/studyReport';
import { smallModel } from '../fixtures/smallModel';
import { readPdf } from '../helpers/pdfText';

const content: LabelContent = {
  signalWord: 'WARNING',
  equipmentTag: 'ΠΙΝ-Ω1',
  equipmentName: 'Πίνακας διανομής — Tableau général',
  siteName: 'Station d’épuration de Ærøskøbing',
  nominalVoltageV: 480,
  incidentEnergyCalPerCm2: 6.2,
  incidentEnergyJPerCm2: 25.95,
  workingDistanceMm: 457.2,
  arcFlashBoundaryMm: 1500,
  minimumArcRatingCalPerCm2: 7,
  ppeLevel: 'PPE level 2',
  noAdequatePpe: false,
  limitedApproachMovable: '3.0 m (10 ft 0 in)',
  limitedApproachFixed: '1.0 m (3 ft 6 in)',
  restrictedApproach: '0.3 m (1 ft 0 in)',
  gloveClass: 'Class 00',
  clearingDevice: 'Q-Δ1 (Διακόπτης)',
  governingCase: 'full arcing current',
  studyTitle: 'Μελέτη ενέργειας τόξου',
  studyRevision: 1,
  studyDate: '2026-03-14',
  reviewByDate: '2031-03-14',
  approvedBy: 'Zoë Ångström, licence PE-1 (Oregon)',
  caution: 'Values from an engineering study.',
};

it.each(['4x6', '4x4', 'letter'] as const)('prints Greek and accented names on a %s label', async (size) => {
  const bytes = await renderLabels([{ content, checkUrl: 'https://emberline.example/l/7K3M9QXW2R4TBH6N' }], size);
  const text = readPdf(bytes).text;
  for (const s of ['ΠΙΝ-Ω1', 'Πίνακας διανομής', 'Ærøskøbing', 'Q-Δ1 (Διακόπτης)', 'Zoë Ångström'])
    expect(text).toContain(s);
  expect(text).not.toContain('?');
});

// Equipment names in the three scripts (invented): Chinese (simplified), Japanese (kanji and katakana), Korean.
const CHINESE = '主配电盘';
const JAPANESE = 'モーター制御盤';
const KOREAN = '분전반';

const cjkContent: LabelContent = {
  ...content,
  equipmentTag: `${CHINESE}-1`,
  equipmentName: `${JAPANESE} ${KOREAN}`,
  siteName: 'Larkspur Valley 净水厂',
  clearingDevice: 'CB-1 (主断路器)',
  studyTitle: 'Arc-flash study',
  approvedBy: 'Dana Okafor, licence PE-1 (Oregon)',
};

interface EmbeddedFont {
  baseFont: string;
  /** The embedded font program (FontFile2) and its glyph id → text map (ToUnicode). */
  program: Uint8Array;
  toUnicode: Map<number, string>;
}

/** The composite (Type0) fonts a PDF embeds, read with pdf-lib. */
async function embeddedFonts(bytes: Uint8Array): Promise<EmbeddedFont[]> {
  const doc = await PDFDocument.load(bytes);
  const out: EmbeddedFont[] = [];
  for (const [, obj] of doc.context.enumerateIndirectObjects()) {
    if (!(obj instanceof PDFDict) || obj.get(PDFName.of('Subtype'))?.toString() !== '/Type0') continue;
    const baseFont = (obj.get(PDFName.of('BaseFont'))?.toString() ?? '').replace(/^\//, '');
    const stream = (ref: unknown) =>
      Buffer.from(decodePDFRawStream(doc.context.lookup(ref as PDFRef) as PDFRawStream).decode());
    const cmap = stream(obj.get(PDFName.of('ToUnicode'))).toString('latin1');
    const toUnicode = new Map<number, string>();
    for (const m of cmap.matchAll(/<([0-9A-Fa-f]{4})>\s*<([0-9A-Fa-f]+)>/g)) {
      const units = (m[2].match(/.{4}/g) ?? []).map((h) => parseInt(h, 16));
      toUnicode.set(parseInt(m[1], 16), String.fromCharCode(...units));
    }
    const descendant = doc.context.lookup(
      (doc.context.lookup(obj.get(PDFName.of('DescendantFonts'))) as unknown as { get(i: number): PDFRef }).get(0),
    ) as PDFDict;
    const descriptor = doc.context.lookup(descendant.get(PDFName.of('FontDescriptor'))) as PDFDict;
    out.push({ baseFont, program: stream(descriptor.get(PDFName.of('FontFile2'))), toUnicode });
  }
  return out;
}

interface Outlines {
  glyphForCodePoint(cp: number): { path: { toSVG(): string } };
  getGlyph(id: number): { path: { toSVG(): string } };
}

/**
 * Every glyph of an embedded subset has the outline the font file draws for the character the PDF says it is (so
 * the subset dropped or swapped no glyph). Returns how many glyphs were compared.
 */
function checkSubsetOutlines(font: EmbeddedFont, file: string): number {
  const original = fontkit.create(fs.readFileSync(path.join(FONT_DIR, file))) as unknown as Outlines;
  const subset = fontkit.create(Buffer.from(font.program)) as unknown as Outlines;
  let n = 0;
  for (const [gid, ch] of font.toUnicode) {
    const cp = ch.codePointAt(0) as number;
    expect({ ch, path: subset.getGlyph(gid).path.toSVG() }).toEqual({
      ch,
      path: original.glyphForCodePoint(cp).path.toSVG(),
    });
    n += 1;
  }
  return n;
}

const fallbackNames = Object.values(FALLBACK_FONT_FILES).map((f) => f.replace(/\.ttf$/, ''));

it.each(['4x6', '4x4', 'letter'] as const)(
  'prints Chinese, Japanese and Korean names on a %s label, with the glyphs of the CJK faces',
  async (size) => {
    const bytes = await renderLabels(
      [{ content: cjkContent, checkUrl: 'https://emberline.example/l/7K3M9QXW2R4TBH6N' }],
      size,
    );
    const text = readPdf(bytes).text;
    for (const s of [CHINESE, JAPANESE, KOREAN, '净水厂', '主断路器']) expect(text).toContain(s);
    expect(text).not.toContain('?');
    const fonts = await embeddedFonts(bytes);
    const cjk = fonts.filter((f) => fallbackNames.some((n) => f.baseFont.startsWith(n)));
    expect(cjk.length).toBeGreaterThan(0);
    for (const f of cjk) {
      const file = Object.values(FALLBACK_FONT_FILES).find((x) => f.baseFont.startsWith(x.replace(/\.ttf$/, '')));
      expect(checkSubsetOutlines(f, file as string)).toBeGreaterThan(3);
    }
    // Subsets, not the whole multi-megabyte files.
    expect(bytes.length).toBeLessThan(2_000_000);
  },
);

it('embeds no CJK face in a label without CJK text', async () => {
  const bytes = await renderLabels([{ content, checkUrl: 'https://emberline.example/l/7K3M9QXW2R4TBH6N' }], '4x6');
  const names = (await embeddedFonts(bytes)).map((f) => f.baseFont);
  expect(names.some((n) => n.startsWith('Inter-Regular'))).toBe(true);
  expect(names.filter((n) => fallbackNames.some((f) => n.startsWith(f)))).toEqual([]);
});

describe('study report', () => {
  const study: StudyDto = {
    id: 'st-1',
    siteId: 'site-1',
    siteName: '',
    revision: 1,
    title: 'Incident energy study',
    status: 'draft',
    modelVersion: 1,
    modelUpdatedAt: '2026-02-01T10:00:00Z',
    lastEditedBy: null,
    parentStudyId: null,
    submittedAt: null,
    approval: null,
    supersededAt: null,
    pastReview: false,
    stale: false,
    latestRun: null,
    resultsCurrent: true,
    createdAt: '2026-01-20T08:00:00Z',
  };

  async function report(names: Record<string, string>, siteName: string): Promise<Uint8Array> {
    const input = smallModel();
    input.buses = input.buses.map((b) => ({ ...b, name: names[b.id] ?? b.name }));
    const model = modelSchema.parse(input);
    return renderStudyReport({
      organizationName: 'Larkspur Valley Water',
      site: { name: siteName, address: '1 Valley Road, Larkspur Valley' },
      study: { ...study, siteName },
      results: runStudy(model),
      model,
      cautions: CAUTIONS,
    });
  }

  it('prints Chinese, Japanese and Korean bus names', async () => {
    const bytes = await report({ SWBD: CHINESE, MCC: JAPANESE, PNL: KOREAN }, 'Larkspur Valley 净水厂');
    const { text } = readPdf(bytes);
    for (const s of [CHINESE, JAPANESE, KOREAN, '净水厂']) expect(text).toContain(s);
    const names = (await embeddedFonts(bytes)).map((f) => f.baseFont);
    for (const f of fallbackNames) expect(names.some((n) => n.startsWith(f))).toBe(true);
  });

  it('embeds no CJK face when the text has none', async () => {
    const bytes = await report({}, 'Larkspur Valley water works');
    const names = (await embeddedFonts(bytes)).map((f) => f.baseFont);
    expect(names.filter((n) => fallbackNames.some((f) => n.startsWith(f)))).toEqual([]);
  });
});
