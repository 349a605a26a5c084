import { execFileSync } from 'node:child_process';
import path from 'node:path';

/**
 * Text and images of a PDF, read with pdf-parse in a separate Node process: pdf.js sets up its worker with a
 * dynamic import, which jest's module sandbox does not allow. Whitespace in the text is folded to single spaces;
 * images come back as PNG, page by page.
 */
export function readPdf(
  bytes: Uint8Array | Buffer,
  opts: { images?: boolean } = {},
): { text: string; pages: number; images: Buffer[][] } {
  const script = `
    const { PDFParse } = require('pdf-parse');
    const chunks = [];
    process.stdin.on('data', (c) => chunks.push(c));
    process.stdin.on('end', async () => {
      const parser = new PDFParse({ data: new Uint8Array(Buffer.concat(chunks)) });
      const t = await parser.getText();
      let images = [];
      if (${opts.images ? 'true' : 'false'}) {
        const im = await parser.getImage({ imageThreshold: 0, imageDataUrl: false });
        images = im.pages.map((p) => p.images.map((i) => Buffer.from(i.data).toString('base64')));
      }
      await parser.destroy();
      process.stdout.write(JSON.stringify({ text: t.text, pages: t.total, images }));
    });`;
  const out = execFileSync(process.execPath, ['-e', script], {
    input: Buffer.from(bytes),
    cwd: path.resolve(__dirname, '../..'),
    maxBuffer: 256 * 1024 * 1024,
  });
  const r = JSON.parse(out.toString()) as { text: string; pages: number; images: string[][] };
  return {
    text: r.text.replace(/\s+/g, ' '),
    pages: r.pages,
    images: r.images.map((p) => p.map((b) => Buffer.from(b, 'base64'))),
  };
}

export function pdfText(bytes: Uint8Array | Buffer): string {
  return readPdf(bytes).text;
}
