/**
 * Labels as they print: no text below 6 pt on any size (sheets included, where labels are drawn scaled into their
 * cells), every QR code on a letter or A4 sheet decodes from a 150 dpi scan of the area around it, and the 4×6 and 4×4 QR codes decode
 * at 100 dpi. Pages are rasterized with pdftoppm (poppler-utils) and decoded with jsQR. The 6 pt floor and the
 * scan resolutions are conventions of label printing (common practice, no source).
 */
import { sheetCells, renderLabels, MIN_PRINTED_TEXT_PT } from '../../server/pdf/labels';
import { groupLabelCode } from '../../shared/labelCode';
import { sampleLabelContents } from '../helpers/labelContentArb';
import { decodeQrIn, printedTextSizes, rasterizePage } from '../helpers/pdfPrint';
import { readPdf } from '../helpers/pdfText';

const CODES = ['7K3M9QXW2R4TBH6N', 'Z9Y8X7W6V5T4S3R2', '0123456789ABCDEF', 'HJKMNPQRSTVWXYZ0', 'GHJK2345MNPQ6789'];
const contents = sampleLabelContents(40);
const labels = contents.map((content, i) => ({
  content,
  checkUrl: `https://emberline.example/l/${CODES[i % CODES.length]}`,
}));

describe.each(['4x6', '4x4', 'letter', 'a4'] as const)('%s', (size) => {
  let bytes: Uint8Array;
  beforeAll(async () => {
    bytes = await renderLabels(labels, size);
  });

  it('prints no text smaller than 6 pt, and cuts none of it', () => {
    const sizes = printedTextSizes(bytes);
    expect(sizes.length).toBeGreaterThan(100);
    const small = sizes.filter((s) => s.sizePt < MIN_PRINTED_TEXT_PT - 0.01);
    expect(small.slice(0, 5)).toEqual([]);
    expect(MIN_PRINTED_TEXT_PT).toBe(6);
    const text = readPdf(bytes).text;
    expect(text.includes('…') ? text.slice(Math.max(0, text.indexOf('…') - 120), text.indexOf('…') + 5) : '').toBe('');
    expect(text).toContain(groupLabelCode(CODES[0]));
  });

  it(`every QR code decodes from a ${size === 'letter' || size === 'a4' ? 150 : 100} dpi scan`, () => {
    const sheet = size === 'letter' || size === 'a4';
    const dpi = sheet ? 150 : 100;
    const png = rasterizePage(bytes, 1, dpi);
    if (sheet) {
      const cells = sheetCells(size);
      expect(cells.length).toBeGreaterThanOrEqual(4);
      // Framed as a phone frames it: the lower right of each cell, where the code sits.
      cells.forEach((cell, i) =>
        expect(
          decodeQrIn(png, dpi, {
            left: cell.left + cell.width * 0.6,
            top: cell.top + cell.height * 0.45,
            width: cell.width * 0.4,
            height: cell.height * 0.5,
          }),
        ).toBe(labels[i].checkUrl),
      );
    } else {
      expect(decodeQrIn(png, dpi)).toBe(labels[0].checkUrl);
    }
  });
});
