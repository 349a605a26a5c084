/**
 * The shipped fonts (fonts/README.md), read once per process and embedded once per PDF document.
 * Inter for text, IBM Plex Mono for numbers (tabular figures). Embedded whole (`subset: false`): pdf-lib's
 * subsetting dropped glyphs with these files.
 *
 * Text that neither face can print (Chinese, Japanese, Korean) falls back to Noto Sans SC (CJK ideographs, kana)
 * or Noto Sans KR (Hangul): each is read from disk only when some text needs it, and embedded only into the
 * documents whose text uses it, as a subset of the glyphs used (each file is several MB; the tests read the
 * subset text back and check its glyphs are the font's own).
 */
import fs from 'node:fs';
import path from 'node:path';
import fontkit from '@pdf-lib/fontkit';
import { CustomFontSubsetEmbedder, PDFFont, PDFHexString, type EmbedFontOptions, type PDFDocument } from 'pdf-lib';

export const FONT_DIR = path.resolve(__dirname, '../../fonts');

export const FONT_FILES = {
  text: 'Inter-Regular.ttf',
  textBold: 'Inter-Bold.ttf',
  mono: 'IBMPlexMono-Regular.ttf',
  monoBold: 'IBMPlexMono-SemiBold.ttf',
} as const;

export type FontKey = keyof typeof FONT_FILES;
export const FONT_KEYS = Object.keys(FONT_FILES) as FontKey[];

/**
 * Fallback faces for scripts the text and mono faces lack, in the order they are tried. No bold weight: CJK text
 * in a bold line prints in the regular weight.
 */
export const FALLBACK_FONT_FILES = {
  /** CJK ideographs (simplified and traditional Chinese, Japanese kanji), kana, CJK punctuation. */
  han: 'NotoSansSC-Regular.ttf',
  /** Korean Hangul (and hanja, kana). */
  hangul: 'NotoSansKR-Regular.ttf',
} as const;

export type FallbackKey = keyof typeof FALLBACK_FONT_FILES;
const FALLBACK_KEYS = Object.keys(FALLBACK_FONT_FILES) as FallbackKey[];
type AnyFontKey = FontKey | FallbackKey;

/** The fonts of one document: each embedded once, with the key it was loaded under. */
export type PdfFonts = Record<FontKey, PDFFont>;

/** fontkit's parsed font (the part used here). */
interface FontkitFont {
  hasGlyphForCodePoint(cp: number): boolean;
}

interface LoadedFont {
  bytes: Uint8Array;
  /** fontkit's parsed font: asked which characters it has glyphs for, and shared by the fallback embedders. */
  parsed: FontkitFont;
  hasGlyph: (codePoint: number) => boolean;
}

let loaded: Record<FontKey, LoadedFont> | null = null;
const fallbackLoaded: Partial<Record<FallbackKey, LoadedFont>> = {};

/**
 * Zero bytes appended after the last table. In IBM Plex Mono the empty glyphs (space, no-break space) sit at the
 * very end of the `glyf` table, which is the last table of the file; pdf-lib's fontkit reads a glyph header even
 * for an empty glyph and so runs past the end of the file. Padding the file (tables are found through the table
 * directory, so trailing bytes are ignored by font readers) lets it read zeros instead.
 */
const FONT_PADDING_BYTES = 64;

function readFont(file: string): LoadedFont {
  const data = fs.readFileSync(path.join(FONT_DIR, file));
  const bytes = new Uint8Array(data.length + FONT_PADDING_BYTES);
  bytes.set(data);
  const parsed = fontkit.create(bytes) as unknown as FontkitFont;
  const cache = new Map<number, boolean>();
  return {
    bytes,
    parsed,
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

/** Reads and parses the TTFs on first use (synchronously; a few hundred KB each). */
export function loadFonts(): Record<FontKey, LoadedFont> {
  if (loaded) return loaded;
  const out = {} as Record<FontKey, LoadedFont>;
  for (const key of FONT_KEYS) out[key] = readFont(FONT_FILES[key]);
  loaded = out;
  return out;
}

/** A fallback face, read and parsed the first time any text needs it (once per process). */
function loadFallback(key: FallbackKey): LoadedFont {
  let f = fallbackLoaded[key];
  if (!f) {
    f = readFont(FALLBACK_FONT_FILES[key]);
    fallbackLoaded[key] = f;
  }
  return f;
}

function loadedFont(key: AnyFontKey): LoadedFont {
  return key in FONT_FILES ? loadFonts()[key as FontKey] : loadFallback(key as FallbackKey);
}

/**
 * Code points the CJK fallback faces are for: Hangul Jamo, CJK radicals to CJK ideographs (with kana, CJK
 * punctuation, Bopomofo), Hangul syllables, compatibility ideographs and forms, full- and half-width forms, and the
 * supplementary ideograph planes. Text without them never loads a fallback file.
 */
function isCjk(cp: number): boolean {
  return (
    (cp >= 0x1100 && cp <= 0x11ff) ||
    (cp >= 0x2e80 && cp <= 0x9fff) ||
    (cp >= 0xa960 && cp <= 0xa97f) ||
    (cp >= 0xac00 && cp <= 0xd7ff) ||
    (cp >= 0xf900 && cp <= 0xfaff) ||
    (cp >= 0xfe30 && cp <= 0xfe4f) ||
    (cp >= 0xff00 && cp <= 0xffef) ||
    (cp >= 0x20000 && cp <= 0x3ffff)
  );
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

const fontKeyOf = new WeakMap<PDFFont, AnyFontKey>();

/** One document's fonts: the shipped faces, and the fallback faces embedded so far (on first use). */
interface DocFonts {
  doc: PDFDocument;
  family: PdfFonts;
  fallback: Partial<Record<FallbackKey, PDFFont>>;
}
const docFontsOf = new WeakMap<PDFFont, DocFonts>();

/** pdf-lib's subset embedder, built directly (its constructor is not in pdf-lib's types). */
const SubsetEmbedder = CustomFontSubsetEmbedder as unknown as new (
  font: unknown,
  fontData: Uint8Array,
  customName: string | undefined,
  features: EmbedFontOptions['features'],
) => CustomFontSubsetEmbedder;

/** The part of fontkit's TrueType subset used here. */
interface TtfSubset {
  glyf: Uint8Array[];
  offset: number;
  _addGlyph(gid: number): number;
}

/**
 * Pads every glyph fontkit copies into a subset to an even length. fontkit writes the subset's `loca` in the short
 * format (offsets halved) whenever the glyph data is under 128 KB, but copies glyphs back to back: after a glyph of
 * odd length every later offset is odd, halving drops its last bit, and the glyphs after it come out wrong or empty
 * (the glyphs "dropped" when subsetting; the Noto faces have odd-length glyphs). Two-byte alignment of glyph data is
 * what the TrueType `loca` table requires for the short format.
 */
function padGlyphsToEvenLength(subset: TtfSubset): void {
  const addGlyph = subset._addGlyph;
  subset._addGlyph = function padded(this: TtfSubset, gid: number): number {
    const index = addGlyph.call(this, gid);
    const data = this.glyf[index];
    if (data && data.length % 2 === 1) {
      // The same buffer class as fontkit's own (its bundled Buffer; its encoder takes no other).
      const padded = (data.constructor as unknown as { alloc(n: number): Uint8Array }).alloc(data.length + 1);
      padded.set(data);
      this.glyf[index] = padded;
      this.offset += 1;
    }
    return index;
  };
}

/**
 * The document's fallback face `key`, embedded on first use. `doc.embedFont` is asynchronous and text is laid out
 * synchronously, so the font is built the way `embedFont` builds it (a subset embedder over the parsed font, a
 * PDFFont on a new reference, added to the document's fonts, which `save` writes out).
 */
function fallbackFont(d: DocFonts, key: FallbackKey): PDFFont {
  const existing = d.fallback[key];
  if (existing) return existing;
  const f = loadFallback(key);
  const embedder = new SubsetEmbedder(f.parsed, f.bytes, undefined, NO_FEATURES as EmbedFontOptions['features']);
  padGlyphsToEvenLength((embedder as unknown as { subset: TtfSubset }).subset);
  const font = PDFFont.of(d.doc.context.nextRef(), d.doc, embedder);
  const docFonts = (d.doc as unknown as { fonts?: PDFFont[] }).fonts;
  if (!Array.isArray(docFonts)) throw new Error('pdf-lib: the document keeps no list of fonts to embed');
  docFonts.push(font);
  fontKeyOf.set(font, key);
  docFontsOf.set(font, d);
  d.fallback[key] = font;
  return font;
}

/** The text face of the same weight, for text the mono face has no glyphs for (Greek, for one). */
const TEXT_FALLBACK: Partial<Record<FontKey, FontKey>> = { mono: 'text', monoBold: 'textBold' };

/** Characters of `text` (spaces and controls aside) the face `key` has no glyph for. */
function missingCount(key: AnyFontKey, cps: number[]): number {
  const { hasGlyph } = loadedFont(key);
  let n = 0;
  for (const cp of cps) if (!hasGlyph(cp)) n += 1;
  return n;
}

/**
 * The font to draw `text` with: `font` itself; or, when it lacks glyphs the document's text face of the same
 * weight has, that text face (Greek in the mono face); or, for Chinese, Japanese or Korean text, the CJK fallback
 * face that prints the most of it — so names in other scripts print instead of turning into "?". The whole text
 * goes in one face (the fallback faces have Latin letters and digits too), and a face is only taken when it prints
 * strictly more of the text than the ones before it.
 */
export function fontFor(text: string, font: PDFFont): PDFFont {
  const key = fontKeyOf.get(font);
  const d = docFontsOf.get(font);
  if (!key || !d) return font;
  const cps: number[] = [];
  for (const ch of text) {
    const cp = ch.codePointAt(0) as number;
    if (cp > 0x20) cps.push(cp);
  }
  let best: AnyFontKey = key;
  let bestMissing = missingCount(key, cps);
  if (bestMissing === 0) return font;
  const textKey = key in TEXT_FALLBACK ? TEXT_FALLBACK[key as FontKey] : undefined;
  if (textKey) {
    const m = missingCount(textKey, cps);
    if (m < bestMissing) [best, bestMissing] = [textKey, m];
  }
  if (bestMissing > 0 && cps.some(isCjk)) {
    for (const k of FALLBACK_KEYS) {
      if (k === best) continue;
      const m = missingCount(k, cps);
      if (m < bestMissing) [best, bestMissing] = [k, m];
    }
  }
  if (best === key) return font;
  return best in FONT_FILES ? d.family[best as FontKey] : fallbackFont(d, best as FallbackKey);
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
  const d: DocFonts = { doc, family: out, fallback: {} };
  for (const key of FONT_KEYS) docFontsOf.set(out[key], d);
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
  const { hasGlyph } = loadedFont(key);
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
