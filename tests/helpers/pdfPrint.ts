import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import jsQR from 'jsqr';
import { PNG } from 'pngjs';

/**
 * How a PDF prints: the size of every piece of text as it lands on the page (pdf.js text items, their transform
 * including any scaling of the drawing), and the page rasterized as a scan would see it (pdftoppm from
 * poppler-utils). pdf.js runs in a separate Node process (its worker setup needs a dynamic import).
 */
export function printedTextSizes(bytes: Uint8Array): { page: number; text: string; sizePt: number }[] {
  const script = `
    const chunks = [];
    process.stdin.on('data', (c) => chunks.push(c));
    process.stdin.on('end', async () => {
      const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
      const doc = await pdfjs.getDocument({ data: new Uint8Array(Buffer.concat(chunks)), verbosity: 0 }).promise;
      const out = [];
      for (let p = 1; p <= doc.numPages; p += 1) {
        const page = await doc.getPage(p);
        const content = await page.getTextContent();
        for (const it of content.items) {
          if (!it.str || !it.str.trim()) continue;
          const [, , c, d] = it.transform;
          out.push({ page: p, text: it.str, sizePt: Math.hypot(c, d) });
        }
      }
      process.stdout.write(JSON.stringify(out));
    });`;
  const out = execFileSync(process.execPath, ['-e', script], {
    input: Buffer.from(bytes),
    cwd: path.resolve(__dirname, '../..'),
    maxBuffer: 256 * 1024 * 1024,
  });
  return JSON.parse(out.toString()) as { page: number; text: string; sizePt: number }[];
}

/** Page `page` (1-based) rendered at `dpi` in grey as a scanner would, as a PNG. */
export function rasterizePage(bytes: Uint8Array, page: number, dpi: number): PNG {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'emberline-scan-'));
  try {
    const pdf = path.join(dir, 'in.pdf');
    fs.writeFileSync(pdf, bytes);
    execFileSync('pdftoppm', [
      '-r',
      String(dpi),
      '-f',
      String(page),
      '-l',
      String(page),
      '-gray',
      '-png',
      pdf,
      path.join(dir, 'out'),
    ]);
    const file = fs.readdirSync(dir).find((f) => f.startsWith('out') && f.endsWith('.png'));
    if (!file) throw new Error('pdftoppm made no image');
    return PNG.sync.read(fs.readFileSync(path.join(dir, file)));
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** The QR code text in a region of a raster (points of the page at `dpi`), or null when none decodes. */
export function decodeQrIn(
  png: PNG,
  dpi: number,
  region: { left: number; top: number; width: number; height: number } | null = null,
): string | null {
  const k = dpi / 72;
  const x0 = region ? Math.max(0, Math.floor(region.left * k)) : 0;
  const y0 = region ? Math.max(0, Math.floor(region.top * k)) : 0;
  const w = region ? Math.min(png.width - x0, Math.ceil(region.width * k)) : png.width;
  const h = region ? Math.min(png.height - y0, Math.ceil(region.height * k)) : png.height;
  const data = new Uint8ClampedArray(w * h * 4);
  for (let y = 0; y < h; y += 1) {
    const from = ((y0 + y) * png.width + x0) * 4;
    data.set(png.data.subarray(from, from + w * 4), y * w * 4);
  }
  return jsQR(data, w, h)?.data ?? null;
}
