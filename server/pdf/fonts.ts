/**
 * The shipped fonts (fonts/README.md), read once per process and embedded once per PDF document.
 * Inter for text, IBM Plex Mono for numbers (tabular figures). Embedded whole (`subset: false`): pdf-lib's
 * subsetting dropped glyphs with these files.
 */
import fs from 'node:fs';
import path from 'node:path';
import fontkit from '@pdf-lib/fontkit';
import { PDFHexString, type EmbedFontOptions, type PDFDocument, type PDFFont } from 'pdf-lib';

export const FONT_DIR = path.resolve(__dirname, '../../fonts');

export const FONT_FILES = {
  text: 'Inter-Regular.ttf',
  textBold: 'Inter-Bold.ttf',
  mono: 'IBMPlexMono-Regular.ttf',
  monoBold: 'IBMPlexMono-SemiBold.ttf',
} as const;

export type FontKey = keyof typeof FONT_FILES;
export const FONT_KEYS = Object.keys(FONT_FILES) as FontKey[];

/** The fonts of one document: each embedded once, with the key it was loaded under. */
export type PdfFonts = Record<FontKey, PDFFont>;

interface LoadedFont {
  bytes: Uint8Array;
  /** fontkit's parsed font, used only to ask which characters it has glyphs for. */
  hasGlyph: (codePoint: number) => boolean;
}

let loaded: Record<FontKey, LoadedFont> | null = null;

/**
 * Zero bytes appended after the last table. In IBM Plex Mono the empty glyphs (space, no-break space) sit at the
 * very end of the `glyf` table, which is the last table of the file; pdf-lib's fontkit reads a glyph header even
 * for an empty glyph and so runs past the end of the file. Padding the file (tables are found through the table
 * directory, so trailing bytes are ignored by font readers) lets it read zeros instead.
 */
const FONT_PADDING_BYTES = 64;

/** Reads and parses the TTFs on first use (synchronously; a few hundred KB each). */
export function loadFonts(): Record<FontKey, LoadedFont> {
  if (loaded) return loaded;
  const out = {} as Record<FontKey, LoadedFont>;
  for (const key of FONT_KEYS) {
    const file = fs.readFileSync(path.join(FONT_DIR, FONT_FILES[key]));
    const bytes = new Uint8Array(file.length + FONT_PADDING_BYTES);
    bytes.set(file);
    const parsed = fontkit.create(bytes) as unknown as { hasGlyphForCodePoint(cp: number): boolean };
    const cache = new Map<number, boolean>();
    out[key] = {
      bytes,
      hasGlyph: (cp) => {
        let v = cache.get(cp);
        if (v === undefined) {
          v = parsed.hasGlyphForCodePoint(cp);
          cache.set(cp, v);
        }
        return v;
      },
    };
  }
  loaded = out;
  return out;
}

/**
 * OpenType features switched off for layout. pdf-lib draws glyphs at their advance widths and ignores GPOS
 * positioning (kerning) anyway; switching every feature off makes each character one glyph (text widths then add
 * up character by character) and makes fontkit's layout about 30 times faster with Inter.
 */
const NO_FEATURES: Record<string, false> = Object.fromEntries(
  [
    'rvrn',
    'ltra',
    'ltrm',
    'ccmp',
    'locl',
    'rlig',
    'mark',
    'mkmk',
    'calt',
    'clig',
    'liga',
    'rclt',
    'curs',
    'kern',
    'frac',
    'numr',
    'dnom',
  ].map((f) => [f, false]),
);

const fontKeyOf = new WeakMap<PDFFont, FontKey>();
const familyOf = new WeakMap<PDFFont, PdfFonts>();

/** The text face of the same weight, for text the mono face has no glyphs for (Greek, for one). */
const TEXT_FALLBACK: Partial<Record<FontKey, FontKey>> = { mono: 'text', monoBold: 'textBold' };

/**
 * The font to draw `text` with: `font` itself, or — when it lacks glyphs the document's text face of the same
 * weight has — that text face, so names in other scripts print instead of turning into "?".
 */
export function fontFor(text: string, font: PDFFont): PDFFont {
  const key = fontKeyOf.get(font);
  const fallbackKey = key ? TEXT_FALLBACK[key] : undefined;
  const family = familyOf.get(font);
  if (!key || !fallbackKey || !family) return font;
  const fonts = loadFonts();
  let missing = 0;
  let fallbackMissing = 0;
  for (const ch of text) {
    const cp = ch.codePointAt(0) as number;
    if (cp <= 0x20) continue;
    if (!fonts[key].hasGlyph(cp)) missing += 1;
    if (!fonts[fallbackKey].hasGlyph(cp)) fallbackMissing += 1;
  }
  return missing > fallbackMissing ? family[fallbackKey] : font;
}

/**
 * Registers fontkit on the document and embeds each font once (remembering which key each PDFFont has, so that
 * `printable` can check its glyphs).
 */
export async function embedFonts(doc: PDFDocument): Promise<PdfFonts> {
  const fonts = loadFonts();
  doc.registerFontkit(fontkit);
  const out = {} as PdfFonts;
  for (const key of FONT_KEYS) {
    out[key] = await doc.embedFont(fonts[key].bytes, {
      subset: false,
      features: NO_FEATURES as EmbedFontOptions['features'],
    });
    fontKeyOf.set(out[key], key);
  }
  for (const key of FONT_KEYS) familyOf.set(out[key], out);
  return out;
}

/**
 * Text as it can be drawn with `font`: line breaks and tabs become spaces, other control characters go, and a
 * character the font has no glyph for becomes "?" (never a blank box or a missing character).
 */
export function printable(text: string, font: PDFFont): string {
  const key = fontKeyOf.get(font);
  const cleaned = text.replace(/[\r\n\t\u2028\u2029]+/g, ' ').replace(/[\u0000-\u001f\u007f-\u009f]/g, '');
  if (!key) return cleaned;
  const { hasGlyph } = loadFonts()[key];
  let out = '';
  for (const ch of cleaned) {
    const cp = ch.codePointAt(0) as number;
    out += cp === 0x20 || hasGlyph(cp) ? ch : '?';
  }
  return out;
}

const glyphHexCache = new WeakMap<PDFFont, Map<string, string>>();

/**
 * The font's encoding of `text` (Identity-H glyph ids), built character by character from a cache. With layout
 * features off and the whole font embedded, pdf-lib encodes each character to one glyph id independently, so
 * this equals `font.encodeText(text)` and skips a layout run per string.
 */
export function encodeForFont(font: PDFFont, text: string): PDFHexString {
  let cache = glyphHexCache.get(font);
  if (!cache) {
    cache = new Map();
    glyphHexCache.set(font, cache);
  }
  let hex = '';
  for (const ch of text) {
    let h = cache.get(ch);
    if (h === undefined) {
      h = font.encodeText(ch).asString();
      cache.set(ch, h);
    }
    hex += h;
  }
  return PDFHexString.of(hex);
}
