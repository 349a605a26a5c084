/**
 * Issue 16 (high): a workbook upload is checked before it is unpacked. Archives are built here with jszip (the zip
 * library the workbook reader itself uses), from a workbook the export writes; the bombs are entries of zeros,
 * which deflate about 1000:1. The limits (2000 parts, 25 MB a part, 50 MB of sheets, 500 MB declared, 200:1) are
 * common practice, no source. Memory is printed only (no timed or memory assertions).
 */
import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import request from 'supertest';
import { modelSchema } from '../../shared/schemas/model';
import { exportModelWorkbook } from '../../server/io';
import { smallModel } from '../fixtures/smallModel';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

jest.setTimeout(60_000);

let t: TestApp;
let siteId = '';
let workbook: Buffer;
beforeAll(async () => {
  t = await makeTestApp();
  siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ name: 'Bomb site' })
  ).body.id;
  workbook = await exportModelWorkbook(modelSchema.parse(smallModel()));
});
afterAll(async () => t.close());

const eng = () => bearer(t.orgA.users.engineer.token);

async function newStudy(title: string): Promise<string> {
  const res = await request(t.app)
    .post(`/api/sites/${siteId}/studies`)
    .set(...eng())
    .send({ title });
  return res.body.id as string;
}

/** The exported workbook with extra entries added. */
async function workbookWith(extra: Record<string, Buffer>): Promise<Buffer> {
  const zip = await JSZip.loadAsync(workbook);
  for (const [name, data] of Object.entries(extra)) zip.file(name, data);
  return zip.generateAsync({ type: 'nodebuffer', compression: 'DEFLATE', compressionOptions: { level: 9 } });
}

/** Overwrites the uncompressed size an archive's central directory declares for one entry (a lying archive). */
function declareSize(zip: Buffer, entryName: string, size: number): Buffer {
  const out = Buffer.from(zip);
  for (let i = out.length - 46; i >= 0; i -= 1) {
    if (out.readUInt32LE(i) !== 0x02014b50) continue;
    const nameLength = out.readUInt16LE(i + 28);
    if (out.toString('utf8', i + 46, i + 46 + nameLength) === entryName) {
      out.writeUInt32LE(size, i + 24);
      return out;
    }
  }
  throw new Error(`no central directory entry ${entryName}`);
}

async function importFile(studyId: string, file: Buffer) {
  const rssBefore = process.memoryUsage().rss;
  const [res, health] = await Promise.all([
    request(t.app)
      .post(`/api/studies/${studyId}/import`)
      .set(...eng())
      .attach('files', file, 'plant.xlsx'),
    request(t.app).get('/api/health'),
  ]);
  expect(health.status).toBe(200);
  console.log(
    `upload ${Math.round(file.length / 1024)} KB → ${res.status}; rss ${Math.round(rssBefore / 2 ** 20)} → ` +
      `${Math.round(process.memoryUsage().rss / 2 ** 20)} MB`,
  );
  return res;
}

describe('workbook archives are checked before unpacking', () => {
  it('a plain workbook still imports, and one with a small picture too (the picture is not read)', async () => {
    const plain = await importFile(await newStudy('Plain'), workbook);
    expect(plain.status).toBe(200);
    expect(plain.body.issues).toEqual([]);
    const picture = Buffer.alloc(20_000);
    for (let i = 0; i < picture.length; i += 1) picture[i] = (i * 7919) % 251;
    const withPicture = await importFile(
      await newStudy('With picture'),
      await workbookWith({ 'xl/media/image1.png': picture }),
    );
    expect(withPicture.status).toBe(200);
    expect(withPicture.body.model.buses).toHaveLength(smallModel().buses.length);
  });

  it('a workbook with a picture, a comment and a hyperlink drawn on a sheet imports (they are dropped)', async () => {
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(workbook as unknown as ArrayBuffer);
    const sheet = book.worksheets[0];
    const png = Buffer.from(
      'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==',
      'base64',
    );
    sheet.addImage(book.addImage({ buffer: png as unknown as ExcelJS.Buffer, extension: 'png' }), 'M2:N4');
    sheet.getCell('A1').note = 'Checked on site';
    const decorated = Buffer.from(await book.xlsx.writeBuffer());
    const res = await importFile(await newStudy('Decorated'), decorated);
    expect(res.status).toBe(200);
    expect(res.body.issues).toEqual([]);
  });

  it('refuses a media entry of 64 MB of zeros (a zip bomb) with 422, without unpacking it', async () => {
    const bomb = await workbookWith({ 'xl/media/image1.png': Buffer.alloc(64 * 1024 * 1024) });
    expect(bomb.length).toBeLessThan(1024 * 1024); // the upload itself is small
    const res = await importFile(await newStudy('Media bomb'), bomb);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/xl\/media\/image1\.png.*compressed/);
    expect(res.body.error.fields).toHaveProperty('files');
  });

  it('refuses a sheet of 64 MB of zeros with 422', async () => {
    const bomb = await workbookWith({ 'xl/worksheets/sheet99.xml': Buffer.alloc(64 * 1024 * 1024) });
    const res = await importFile(await newStudy('Sheet bomb'), bomb);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/sheet99\.xml/);
  });

  it('refuses an archive that declares 4 GB unpacked with 413, reading only its directory', async () => {
    const small = await workbookWith({ 'xl/media/huge.bin': Buffer.from('tiny') });
    const lying = declareSize(small, 'xl/media/huge.bin', 0xfffffff0);
    const res = await importFile(await newStudy('Declared 4 GB'), lying);
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/more than 500 MB/);
  });

  it('refuses a sheet that unpacks to more than it declares (damaged or forged) with 422', async () => {
    const sheet = Buffer.alloc(200_000, 'x');
    const lying = declareSize(
      await workbookWith({ 'xl/worksheets/sheet98.xml': sheet }),
      'xl/worksheets/sheet98.xml',
      100,
    );
    const res = await importFile(await newStudy('Forged size'), lying);
    expect(res.status).toBe(422);
  });

  it('refuses an archive of 2500 parts with 422', async () => {
    const extra: Record<string, Buffer> = {};
    for (let i = 0; i < 2500; i += 1) extra[`xl/media/p${i}.bin`] = Buffer.from('x');
    const res = await importFile(await newStudy('Many parts'), await workbookWith(extra));
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/parts/);
  });
});
