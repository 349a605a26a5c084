/**
 * A drawing surface in top-down points over a pdf-lib page: (0, 0) is the top-left corner of a box placed on the
 * page, optionally scaled (labels on sheets). Text goes through `fitText`, so it never leaves its box.
 */
import {
  beginText,
  concatTransformationMatrix,
  drawObject,
  endText,
  moveText,
  setFillingColor,
  setFontAndSize,
  showText,
  popGraphicsState,
  pushGraphicsState,
  rgb,
  type PDFFont,
  type PDFName,
  type PDFPage,
  type PDFRef,
  type RGB,
} from 'pdf-lib';
import { encodeForFont, fontFor, printable } from './fonts';
import { fitText, textWidth, type FittedText } from './text';

export const BLACK = rgb(0, 0, 0);
export const WHITE = rgb(1, 1, 1);

/** "#C8102E" → pdf-lib colour. */
export function hexColor(hex: string): RGB {
  const m = /^#?([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) throw new Error(`Not a colour: ${hex}`);
  return rgb(parseInt(m[1], 16) / 255, parseInt(m[2], 16) / 255, parseInt(m[3], 16) / 255);
}

/** Line height as a multiple of the font size. */
export const LINE_HEIGHT = 1.18;
/**
 * Baseline below the top of a line box, as a multiple of the size: centres Inter's cap height (0.73 em) in a
 * 1.18 em line (layout convention, common practice, no source).
 */
const BASELINE = (LINE_HEIGHT + 0.73) / 2;

export type Align = 'left' | 'center' | 'right';

export interface TextBoxOptions {
  font: PDFFont;
  size: number;
  minSize?: number;
  maxLines?: number;
  align?: Align;
  color?: RGB;
  lineHeight?: number;
}

/** Each page's resource name for each font, registered once (pdf-lib's drawText adds one per call). */
const fontNames = new WeakMap<PDFPage, Map<PDFFont, PDFName>>();

function fontName(page: PDFPage, font: PDFFont): PDFName {
  let names = fontNames.get(page);
  if (!names) {
    names = new Map();
    fontNames.set(page, names);
  }
  let name = names.get(font);
  if (!name) {
    name = page.node.newFontDictionary(font.name, font.ref);
    names.set(font, name);
  }
  return name;
}

export class Canvas {
  /** Smallest text size as printed, points: text is never fitted or drawn smaller than this on the page. */
  minPrintedPt = 0;

  constructor(
    readonly page: PDFPage,
    /** Local height of the box, points (before scaling). */
    readonly height: number,
    /** Scale from local points to page points (labels drawn into sheet cells). */
    readonly scale = 1,
  ) {}

  /** The smallest local text size that prints at `minPrintedPt`. */
  private get floorPt(): number {
    return this.minPrintedPt / this.scale;
  }

  /** A canvas for a box whose top-left corner is at (left, top) in page points (top-down), drawn at `scale`. */
  static at(page: PDFPage, box: { left: number; top: number; width: number; height: number }, scale = 1): Canvas {
    const pageHeight = page.getHeight();
    const bottom = pageHeight - box.top - box.height * scale;
    page.pushOperators(pushGraphicsState(), concatTransformationMatrix(scale, 0, 0, scale, box.left, bottom));
    return new Canvas(page, box.height, scale);
  }

  /** Ends a canvas opened with `at`. */
  close(): void {
    this.page.pushOperators(popGraphicsState());
  }

  private y(top: number): number {
    return this.height - top;
  }

  rect(
    x: number,
    y: number,
    w: number,
    h: number,
    opts: { fill?: RGB; stroke?: RGB; lineWidth?: number; dash?: number[] } = {},
  ): void {
    this.page.drawRectangle({
      x,
      y: this.y(y + h),
      width: w,
      height: h,
      color: opts.fill,
      borderColor: opts.stroke,
      borderWidth: opts.stroke ? (opts.lineWidth ?? 1) : 0,
      borderDashArray: opts.dash,
    });
  }

  line(
    x1: number,
    y1: number,
    x2: number,
    y2: number,
    opts: { width?: number; color?: RGB; dash?: number[] } = {},
  ): void {
    this.page.drawLine({
      start: { x: x1, y: this.y(y1) },
      end: { x: x2, y: this.y(y2) },
      thickness: opts.width ?? 0.75,
      color: opts.color ?? BLACK,
      dashArray: opts.dash,
    });
  }

  /** An SVG path (y down) whose origin is at (x, y). */
  path(
    d: string,
    x: number,
    y: number,
    opts: { fill?: RGB; stroke?: RGB; lineWidth?: number; dash?: number[] } = {},
  ): void {
    this.page.drawSvgPath(d, {
      x,
      y: this.y(y),
      color: opts.fill,
      borderColor: opts.stroke,
      borderWidth: opts.stroke ? (opts.lineWidth ?? 1) : undefined,
      borderDashArray: opts.dash,
    });
  }

  circle(cx: number, cy: number, r: number, opts: { fill?: RGB; stroke?: RGB; lineWidth?: number } = {}): void {
    this.page.drawCircle({
      x: cx,
      y: this.y(cy),
      size: r,
      color: opts.fill,
      borderColor: opts.stroke,
      borderWidth: opts.stroke ? (opts.lineWidth ?? 1) : 0,
    });
  }

  /** An image XObject already in the document (e.g. a QR code), scaled to w × h. */
  xObject(ref: PDFRef, x: number, y: number, w: number, h: number): void {
    const name = this.page.node.newXObject('Image', ref);
    this.page.pushOperators(
      pushGraphicsState(),
      concatTransformationMatrix(w, 0, 0, h, x, this.y(y + h)),
      drawObject(name),
      popGraphicsState(),
    );
  }

  /** One line of already-fitting text with its baseline at `baseline` (top-down). */
  textAt(text: string, x: number, baseline: number, font: PDFFont, size: number, color: RGB = BLACK): void {
    if (text === '') return;
    size = Math.max(size, this.floorPt);
    this.page.pushOperators(
      pushGraphicsState(),
      setFillingColor(color),
      beginText(),
      setFontAndSize(fontName(this.page, font), size),
      moveText(x, this.y(baseline)),
      showText(encodeForFont(font, text)),
      endText(),
      popGraphicsState(),
    );
  }

  /** Fits `text` into a box `w` wide without drawing it (in the font that prints it, see `fontFor`). */
  fit(text: string, w: number, opts: TextBoxOptions): FittedText & { height: number; font: PDFFont } {
    const font = fontFor(text, opts.font);
    const floor = this.floorPt;
    const fitted = fitText(font, printable(text, font), {
      maxWidth: w,
      size: Math.max(opts.size, floor),
      minSize: Math.max(opts.minSize ?? opts.size * 0.6, floor),
      maxLines: opts.maxLines ?? 1,
    });
    return { ...fitted, font, height: fitted.lines.length * fitted.size * (opts.lineHeight ?? LINE_HEIGHT) };
  }

  /**
   * Draws fitted lines in a box `w` wide starting at `top`, in the font they were fitted in (`fitted.font`, else
   * the font `fontFor` picks for the lines, which is the same one: see `fontFor`).
   */
  drawFitted(fitted: FittedText & { font?: PDFFont }, x: number, top: number, w: number, opts: TextBoxOptions): void {
    const font = fitted.font ?? fontFor(fitted.lines.join(' '), opts.font);
    const lh = fitted.size * (opts.lineHeight ?? LINE_HEIGHT);
    fitted.lines.forEach((line, i) => {
      const lw = textWidth(font, line, fitted.size);
      const dx = opts.align === 'center' ? (w - lw) / 2 : opts.align === 'right' ? w - lw : 0;
      this.textAt(line, x + dx, top + i * lh + fitted.size * BASELINE, font, fitted.size, opts.color);
    });
  }

  /**
   * Fits `text` into a box `w` wide starting at `top`, and draws it. Returns the fitted text and the height used.
   */
  text(text: string, x: number, top: number, w: number, opts: TextBoxOptions): FittedText & { height: number } {
    const fitted = this.fit(text, w, opts);
    this.drawFitted(fitted, x, top, w, opts);
    return fitted;
  }
}

/**
 * The safety alert symbol (an equilateral triangle with an exclamation mark) `h` high, as two SVG paths with
 * their origin at the top-left of the triangle's bounding box.
 */
export function safetyAlertPaths(h: number): {
  triangle: string;
  mark: string;
  dot: { cx: number; cy: number; r: number };
} {
  const w = (2 * h) / Math.sqrt(3);
  const r = h * 0.06; // softened corners
  const triangle = [
    `M ${w / 2 - r} ${r * 1.2}`,
    `Q ${w / 2} ${-r * 0.4} ${w / 2 + r} ${r * 1.2}`,
    `L ${w - r * 0.2} ${h - r * 1.4}`,
    `Q ${w + r * 0.3} ${h} ${w - r * 1.6} ${h}`,
    `L ${r * 1.6} ${h}`,
    `Q ${-r * 0.3} ${h} ${r * 0.2} ${h - r * 1.4}`,
    'Z',
  ].join(' ');
  const cx = w / 2;
  const top = h * 0.32;
  const bottom = h * 0.72;
  const half = h * 0.065;
  const mark = `M ${cx - half} ${top} L ${cx + half} ${top} L ${cx + half * 0.55} ${bottom} L ${cx - half * 0.55} ${bottom} Z`;
  return { triangle, mark, dot: { cx, cy: h * 0.83, r: h * 0.068 } };
}

export function safetyAlertWidth(h: number): number {
  return (2 * h) / Math.sqrt(3);
}
