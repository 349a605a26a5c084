/**
 * QR codes of label check addresses (error-correction level M, 4-module quiet zone), from bwip-js:
 * - `qrPng`: a PNG (bwip-js `toBuffer`), for anything that wants a picture;
 * - `qrModules` + `embedQrImage`: the module matrix (bwip-js `raw`) embedded in a PDF as a grey image, which
 *   skips drawing, compressing and decoding a PNG per label (measured: about 3 ms a label instead of 11).
 * Tests read the codes back with `decodeQrPng` in tests/helpers/qr.ts.
 */
import { deflateSync } from 'node:zlib';
import bwipjs from 'bwip-js';
import type { PDFDocument, PDFRef } from 'pdf-lib';

/**
 * bwip-js scale: BWIPP draws a QR module 2 units wide, so scale 1 gives 2 px per module. Drawn in the PDF without
 * interpolation, that prints as sharp as a larger image, and costs less.
 */
export const QR_SCALE = 1;
/** BWIPP units per QR module. */
const UNITS_PER_MODULE = 2;
/** Quiet zone around the symbol, modules (ISO/IEC 18004 asks for 4). */
export const QR_QUIET_ZONE_MODULES = 4;

type EcLevel = 'L' | 'M' | 'Q' | 'H';
const EC_LEVEL: EcLevel = 'M';

/** The QR code of `text` as a PNG (black modules on white, with its quiet zone). */
export async function qrPng(text: string, scale: number = QR_SCALE): Promise<Buffer> {
  // `eclevel` is a BWIPP option the typings leave out.
  const options: bwipjs.RenderOptions & { eclevel: EcLevel } = {
    bcid: 'qrcode',
    text,
    scale,
    eclevel: EC_LEVEL,
    padding: QR_QUIET_ZONE_MODULES * UNITS_PER_MODULE,
    backgroundcolor: 'FFFFFF',
  };
  return bwipjs.toBuffer(options);
}

export interface QrModules {
  /** Modules per side, without the quiet zone. */
  size: number;
  /** Row by row from the top, 1 = dark. */
  dark: Uint8Array;
}

/** The module matrix of the QR code of `text` (the same symbol as `qrPng`). */
export function qrModules(text: string): QrModules {
  const options: bwipjs.RenderOptions & { eclevel: EcLevel } = { bcid: 'qrcode', text, eclevel: EC_LEVEL };
  const [symbol] = bwipjs.raw(options) as unknown as { pixs: number[]; pixx: number; pixy: number }[];
  if (!symbol || symbol.pixx !== symbol.pixy || symbol.pixs.length !== symbol.pixx * symbol.pixy) {
    throw new Error('Unexpected QR symbol from bwip-js');
  }
  return { size: symbol.pixx, dark: Uint8Array.from(symbol.pixs) };
}

/**
 * Embeds a QR code as a grey image XObject, one pixel per module with the quiet zone included (8 bits per pixel:
 * 0 black, 255 white; a few hundred bytes once compressed). Drawn larger, PDF viewers and printers keep its pixels
 * square (no /Interpolate). Returns its reference and its side in pixels.
 */
export function embedQrImage(doc: PDFDocument, text: string): { ref: PDFRef; pixels: number } {
  const { size, dark } = qrModules(text);
  const q = QR_QUIET_ZONE_MODULES;
  const n = size + 2 * q;
  const pixels = new Uint8Array(n * n).fill(255);
  for (let y = 0; y < size; y += 1) {
    for (let x = 0; x < size; x += 1) {
      if (dark[y * size + x]) pixels[(y + q) * n + x + q] = 0;
    }
  }
  // Node's zlib rather than pdf-lib's JavaScript deflate: for many small images its set-up cost dominates.
  const stream = doc.context.stream(deflateSync(pixels), {
    Filter: 'FlateDecode',
    Type: 'XObject',
    Subtype: 'Image',
    Width: n,
    Height: n,
    ColorSpace: 'DeviceGray',
    BitsPerComponent: 8,
  });
  return { ref: doc.context.register(stream), pixels: n };
}
