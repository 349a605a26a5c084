import jpeg from 'jpeg-js';
import { PNG } from 'pngjs';

/**
 * Photos larger than this on either side, or in total, are refused before they are decoded. Decoding runs on the
 * server's main thread (pure JS, about a second or more per 12 MP on a small machine), so the cap also bounds how long
 * one upload holds the server; phone cameras save 12 MP by default.
 */
export const MAX_PHOTO_SIDE_PX = 8000;
export const MAX_PHOTO_MEGAPIXELS = 25;
/** Stored photos are reduced (by a whole factor) until their longer side is at most this. */
export const STORED_PHOTO_MAX_SIDE_PX = 3000;

export class PhotoRefused extends Error {
  constructor(
    message: string,
    readonly reason: 'unreadable' | 'too-large',
  ) {
    super(message);
  }
}

interface Rgba {
  width: number;
  height: number;
  data: Uint8Array;
}

/**
 * Decodes a JPEG or PNG photo and encodes it again from its pixels: what is stored holds no metadata (location,
 * camera, comments, anything appended), and a file that only starts like an image is refused. A JPEG's EXIF
 * orientation is applied to the pixels first, so the photo still shows upright. Large photos are reduced.
 */
export function reencodePhoto(buffer: Buffer, type: 'image/jpeg' | 'image/png'): Buffer {
  const { width, height } = type === 'image/png' ? pngSize(buffer) : jpegSize(buffer);
  checkSize(width, height);
  let img: Rgba;
  try {
    if (type === 'image/png') {
      const png = PNG.sync.read(buffer);
      img = { width: png.width, height: png.height, data: png.data };
    } else {
      img = jpeg.decode(buffer, {
        useTArray: true,
        formatAsRGBA: true,
        tolerantDecoding: false,
        maxResolutionInMP: MAX_PHOTO_MEGAPIXELS,
        maxMemoryUsageInMB: 400,
      });
      img = orient(img, exifOrientation(buffer));
    }
  } catch (e) {
    throw new PhotoRefused(
      `The photo could not be decoded (${e instanceof Error ? e.message : String(e)})`,
      'unreadable',
    );
  }
  if (!img.width || !img.height || img.data.length < img.width * img.height * 4)
    throw new PhotoRefused('The photo could not be decoded (no pixels)', 'unreadable');
  img = reduce(img, STORED_PHOTO_MAX_SIDE_PX);
  if (type === 'image/png') {
    const png = new PNG({ width: img.width, height: img.height });
    png.data = Buffer.from(img.data.buffer, img.data.byteOffset, img.data.length);
    return PNG.sync.write(png);
  }
  return jpeg.encode({ width: img.width, height: img.height, data: img.data }, 85).data;
}

function checkSize(width: number, height: number): void {
  if (!(width > 0 && height > 0)) throw new PhotoRefused('The photo has no width or height', 'unreadable');
  if (width > MAX_PHOTO_SIDE_PX || height > MAX_PHOTO_SIDE_PX || width * height > MAX_PHOTO_MEGAPIXELS * 1e6)
    throw new PhotoRefused(
      `The photo is ${width} × ${height} px; at most ${MAX_PHOTO_SIDE_PX} px a side and ${MAX_PHOTO_MEGAPIXELS} megapixels`,
      'too-large',
    );
}

/** Width and height from a PNG's IHDR chunk (it must come first). */
function pngSize(b: Buffer): { width: number; height: number } {
  if (b.length < 24 || b.toString('latin1', 12, 16) !== 'IHDR')
    throw new PhotoRefused('The PNG has no image header', 'unreadable');
  return { width: b.readUInt32BE(16), height: b.readUInt32BE(20) };
}

/** Width and height from a JPEG's first start-of-frame marker. */
function jpegSize(b: Buffer): { width: number; height: number } {
  let i = 2;
  while (i + 9 < b.length) {
    if (b[i] !== 0xff) throw new PhotoRefused('The JPEG is malformed (no marker where one is due)', 'unreadable');
    const marker = b[i + 1];
    if (marker === 0xff) {
      i++;
      continue;
    }
    if (marker === 0xd8 || marker === 0x01 || (marker >= 0xd0 && marker <= 0xd7)) {
      i += 2;
      continue;
    }
    const len = b.readUInt16BE(i + 2);
    if (marker >= 0xc0 && marker <= 0xcf && marker !== 0xc4 && marker !== 0xc8 && marker !== 0xcc)
      return { height: b.readUInt16BE(i + 5), width: b.readUInt16BE(i + 7) };
    if (marker === 0xda || marker === 0xd9 || len < 2) break;
    i += 2 + len;
  }
  throw new PhotoRefused('The JPEG has no frame header', 'unreadable');
}

/** The EXIF orientation (1–8) of a JPEG, 1 when there is none. */
export function exifOrientation(b: Buffer): number {
  let i = 2;
  while (i + 4 < b.length && b[i] === 0xff) {
    const marker = b[i + 1];
    const len = b.readUInt16BE(i + 2);
    if (marker === 0xda || len < 2) break;
    if (marker === 0xe1 && b.toString('latin1', i + 4, i + 10) === 'Exif\0\0') {
      const tiff = i + 10;
      const end = Math.min(b.length, i + 2 + len);
      if (tiff + 8 > end) return 1;
      const le = b.toString('latin1', tiff, tiff + 2) === 'II';
      const u16 = (o: number) => (le ? b.readUInt16LE(o) : b.readUInt16BE(o));
      const u32 = (o: number) => (le ? b.readUInt32LE(o) : b.readUInt32BE(o));
      const ifd = tiff + u32(tiff + 4);
      if (ifd + 2 > end) return 1;
      const n = u16(ifd);
      for (let k = 0; k < n; k++) {
        const e = ifd + 2 + k * 12;
        if (e + 12 > end) break;
        if (u16(e) === 0x0112) {
          const v = u16(e + 8);
          return v >= 1 && v <= 8 ? v : 1;
        }
      }
      return 1;
    }
    i += 2 + len;
  }
  return 1;
}

/** Applies an EXIF orientation to the pixels (2–8: mirror and/or rotate), so the result needs none. */
function orient(img: Rgba, o: number): Rgba {
  if (o <= 1 || o > 8) return img;
  const { width: w, height: h, data } = img;
  const swap = o >= 5;
  const W = swap ? h : w;
  const H = swap ? w : h;
  const out = new Uint8Array(W * H * 4);
  for (let y = 0; y < h; y++)
    for (let x = 0; x < w; x++) {
      let X: number;
      let Y: number;
      switch (o) {
        case 2:
          [X, Y] = [w - 1 - x, y];
          break;
        case 3:
          [X, Y] = [w - 1 - x, h - 1 - y];
          break;
        case 4:
          [X, Y] = [x, h - 1 - y];
          break;
        case 5:
          [X, Y] = [y, x];
          break;
        case 6:
          [X, Y] = [h - 1 - y, x];
          break;
        case 7:
          [X, Y] = [h - 1 - y, w - 1 - x];
          break;
        default:
          [X, Y] = [y, w - 1 - x]; // 8
      }
      const s = (y * w + x) * 4;
      const d = (Y * W + X) * 4;
      out[d] = data[s];
      out[d + 1] = data[s + 1];
      out[d + 2] = data[s + 2];
      out[d + 3] = data[s + 3];
    }
  return { width: W, height: H, data: out };
}

/** Averages f × f blocks, f the smallest whole factor that brings the longer side to at most `maxSide`. */
function reduce(img: Rgba, maxSide: number): Rgba {
  const f = Math.ceil(Math.max(img.width, img.height) / maxSide);
  if (f <= 1) return img;
  const W = Math.floor(img.width / f);
  const H = Math.floor(img.height / f);
  const out = new Uint8Array(W * H * 4);
  const n = f * f;
  for (let Y = 0; Y < H; Y++)
    for (let X = 0; X < W; X++)
      for (let c = 0; c < 4; c++) {
        let sum = 0;
        for (let dy = 0; dy < f; dy++) {
          const row = (Y * f + dy) * img.width;
          for (let dx = 0; dx < f; dx++) sum += img.data[(row + X * f + dx) * 4 + c];
        }
        out[(Y * W + X) * 4 + c] = Math.round(sum / n);
      }
  return { width: W, height: H, data: out };
}
