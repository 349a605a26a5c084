/**
 * Text fitting for the PDFs: wrap to a width, at most N lines, then shrink, then (only at the smallest size) cut
 * with an ellipsis. Every returned line measures at most the width with the font's own metrics, so nothing
 * drawn ever overflows its box.
 */
import type { PDFFont } from 'pdf-lib';
import { printable } from './fonts';

/** Anything that measures text like a pdf-lib font (tests can pass a fake). */
export interface MeasuringFont {
  widthOfTextAtSize(text: string, size: number): number;
}

const charWidthCache = new WeakMap<object, Map<string, number>>();

/**
 * Width of `text` at size 1, added up character by character from a per-font cache. pdf-lib measures a string as
 * the sum of its glyphs' advance widths, and with layout features off (fonts.ts) each character is one glyph, so
 * the sum is the font's own measure (the tests check returned lines with `widthOfTextAtSize` itself).
 */
export function unitWidth(font: MeasuringFont, text: string): number {
  let cache = charWidthCache.get(font);
  if (!cache) {
    cache = new Map();
    charWidthCache.set(font, cache);
  }
  let total = 0;
  for (const ch of text) {
    let w = cache.get(ch);
    if (w === undefined) {
      w = font.widthOfTextAtSize(ch, 1);
      cache.set(ch, w);
    }
    total += w;
  }
  return total;
}

export function textWidth(font: MeasuringFont, text: string, size: number): number {
  return unitWidth(font, text) * size;
}

/** Splits a word wider than the line into pieces that each fit, at least one character per piece. */
function breakByCharacter(font: MeasuringFont, word: string, maxWidth: number, size: number): string[] {
  const pieces: string[] = [];
  let current = '';
  for (const ch of word) {
    const next = current + ch;
    if (current !== '' && textWidth(font, next, size) > maxWidth) {
      pieces.push(current);
      current = ch;
    } else {
      current = next;
    }
  }
  if (current !== '') pieces.push(current);
  return pieces;
}

/**
 * Breaks one word that is wider than the line: after hyphens, slashes and underscores where it can
 * ("Thermal-" / "magnetic"), by character where it must.
 */
function breakWord(font: MeasuringFont, word: string, maxWidth: number, size: number): string[] {
  const parts = word.match(/[^-/_]+[-/_]*|[-/_]+/g) ?? [word];
  const pieces: string[] = [];
  let current = '';
  for (const part of parts) {
    const next = current + part;
    if (textWidth(font, next, size) <= maxWidth) {
      current = next;
      continue;
    }
    if (current !== '') pieces.push(current);
    if (textWidth(font, part, size) <= maxWidth) {
      current = part;
    } else {
      const chars = breakByCharacter(font, part, maxWidth, size);
      pieces.push(...chars.slice(0, -1));
      current = chars[chars.length - 1] ?? '';
    }
  }
  if (current !== '') pieces.push(current);
  return pieces;
}

/**
 * Greedy word wrap at a given size. Words wider than the line are broken by character. Whitespace runs collapse.
 * A single character wider than the line (a very narrow box) is still one line: `fitText` then shrinks it.
 */
export function wrapText(font: MeasuringFont, text: string, maxWidth: number, size: number): string[] {
  const words = text.split(/\s+/).filter((w) => w !== '');
  const lines: string[] = [];
  let line = '';
  for (const word of words) {
    const candidate = line === '' ? word : `${line} ${word}`;
    if (textWidth(font, candidate, size) <= maxWidth) {
      line = candidate;
      continue;
    }
    if (line !== '') lines.push(line);
    if (textWidth(font, word, size) <= maxWidth) {
      line = word;
    } else {
      const pieces = breakWord(font, word, maxWidth, size);
      lines.push(...pieces.slice(0, -1));
      line = pieces[pieces.length - 1] ?? '';
    }
  }
  if (line !== '') lines.push(line);
  return lines;
}

export interface FitOptions {
  maxWidth: number;
  /** Preferred size, pt. */
  size: number;
  /** Smallest size tried before cutting, pt (default: 60 % of size). */
  minSize?: number;
  /** Most lines (default 1). */
  maxLines?: number;
}

export interface FittedText {
  lines: string[];
  size: number;
  /** True when even the smallest size needed more lines and the text was cut (ends with "…"). */
  truncated: boolean;
}

/** Cuts `line` and adds an ellipsis so that the whole measures at most maxWidth. */
function withEllipsis(font: MeasuringFont, line: string, maxWidth: number, size: number): string {
  let base = line.trimEnd();
  while (base !== '' && textWidth(font, `${base}…`, size) > maxWidth)
    base = Array.from(base).slice(0, -1).join('').trimEnd();
  return base === '' ? (textWidth(font, '…', size) <= maxWidth ? '…' : '') : `${base}…`;
}

/**
 * Fits text in a box `maxWidth` wide and `maxLines` lines high: wraps at the preferred size, and shrinks in
 * steps of 0.25 pt (down to minSize) until the lines fit. At minSize it cuts the last line with an ellipsis.
 * Layout convention (common practice, no source).
 */
export function fitText(font: MeasuringFont, text: string, opts: FitOptions): FittedText {
  const maxLines = Math.max(1, Math.floor(opts.maxLines ?? 1));
  const minSize = Math.min(opts.size, opts.minSize ?? opts.size * 0.6);
  const maxWidth = Math.max(0, opts.maxWidth);
  const clean = text.trim();
  if (clean === '') return { lines: [], size: opts.size, truncated: false };
  // Lines are measured by the cached sum (see unitWidth) against a width a hair narrower than the box, so that
  // float rounding can never put the font's own measure of a returned line above maxWidth.
  const limit = maxWidth * (1 - 1e-9);
  for (let size = opts.size; size >= minSize - 1e-9; size -= 0.25) {
    const lines = wrapText(font, clean, limit, size);
    if (lines.length <= maxLines && lines.every((l) => textWidth(font, l, size) <= limit)) {
      return { lines, size, truncated: false };
    }
  }
  // Still too long at the smallest size: keep the first lines and cut the last one with an ellipsis.
  const size = minSize;
  const kept = wrapText(font, clean, limit, size).slice(0, maxLines);
  kept[kept.length - 1] = withEllipsis(font, kept[kept.length - 1], limit, size);
  return { lines: kept.filter((l) => l !== '' && textWidth(font, l, size) <= limit), size, truncated: true };
}

/** `fitText` on text cleaned for the font (see `printable`). */
export function fitPrintable(font: PDFFont, text: string, opts: FitOptions): FittedText {
  return fitText(font, printable(text, font), opts);
}
