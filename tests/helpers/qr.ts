/** Reading QR codes back in tests (pngjs + jsQR): what a phone camera would read from a label. */
import jsQR from 'jsqr';
import { PNG } from 'pngjs';

function upscale(png: PNG, factor: number): { data: Uint8ClampedArray; width: number; height: number } {
  const width = png.width * factor;
  const height = png.height * factor;
  const data = new Uint8ClampedArray(width * height * 4);
  for (let y = 0; y < height; y += 1) {
    const sy = Math.floor(y / factor);
    for (let x = 0; x < width; x += 1) {
      const s = (sy * png.width + Math.floor(x / factor)) * 4;
      const d = (y * width + x) * 4;
      data[d] = png.data[s];
      data[d + 1] = png.data[s + 1];
      data[d + 2] = png.data[s + 2];
      data[d + 3] = png.data[s + 3];
    }
  }
  return { data, width, height };
}

/** Reads a QR code from a PNG; null when none is found. Small images are enlarged (nearest neighbour) first. */
export function decodeQrPng(png: Buffer): string | null {
  const image = PNG.sync.read(png);
  const attempts = image.width < 200 ? [4, 1] : [1];
  for (const factor of attempts) {
    const { data, width, height } =
      factor === 1
        ? { data: new Uint8ClampedArray(image.data), width: image.width, height: image.height }
        : upscale(image, factor);
    const found = jsQR(data, width, height);
    if (found) return found.data;
  }
  return null;
}
