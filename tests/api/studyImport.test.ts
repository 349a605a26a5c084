import ExcelJS from 'exceljs';
import request from 'supertest';
import { modelSchema } from '../../shared/schemas/model';
import { exportModelCsv, exportModelWorkbook } from '../../server/io';
import { smallModel } from '../fixtures/smallModel';
import { isClose } from '../helpers/approx';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let siteId = '';
beforeAll(async () => {
  t = await makeTestApp();
  siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ name: 'Import site' })
  ).body.id;
});
afterAll(async () => t.close());

const eng = () => bearer(t.orgA.users.engineer.token);
const newStudy = async (title: string) =>
  (
    await request(t.app)
      .post(`/api/sites/${siteId}/studies`)
      .set(...eng())
      .send({ title })
  ).body.id as string;

async function runResults(studyId: string) {
  expect(
    (
      await request(t.app)
        .post(`/api/studies/${studyId}/run`)
        .set(...eng())
    ).status,
  ).toBe(202);
  await t.ctx.jobs.idle();
  const page = (
    await request(t.app)
      .get(`/api/studies/${studyId}/results?pageSize=500`)
      .set(...eng())
  ).body as {
    rows: { busId: string; incidentEnergyCalPerCm2: number; arcFlashBoundaryMm: number; clearingDeviceId: string }[];
  };
  return { buses: page.rows };
}

function sameResults(a: Awaited<ReturnType<typeof runResults>>, b: Awaited<ReturnType<typeof runResults>>): void {
  expect(b.buses.map((x) => x.busId)).toEqual(a.buses.map((x) => x.busId));
  a.buses.forEach((x, i) => {
    expect(isClose(b.buses[i].incidentEnergyCalPerCm2, x.incidentEnergyCalPerCm2, 1e-9)).toBe(true);
    expect(isClose(b.buses[i].arcFlashBoundaryMm, x.arcFlashBoundaryMm, 1e-9)).toBe(true);
    expect(b.buses[i].clearingDeviceId).toBe(x.clearingDeviceId);
  });
}

describe('import and export of the model through the API', () => {
  let original: Awaited<ReturnType<typeof runResults>>;
  let firstId = '';

  it('imports a workbook, runs it', async () => {
    firstId = await newStudy('From workbook');
    const xlsx = await exportModelWorkbook(modelSchema.parse(smallModel()));
    const res = await request(t.app)
      .post(`/api/studies/${firstId}/import`)
      .set(...eng())
      .attach('files', xlsx, 'plant.xlsx');
    expect(res.status).toBe(200);
    expect(res.body.issues).toEqual([]);
    original = await runResults(firstId);
    expect(original.buses).toHaveLength(3);
  });

  it.each(['xlsx', 'json'] as const)(
    'export as %s → import into a new study gives the same model and the same results',
    async (format) => {
      const exported = await request(t.app)
        .get(`/api/studies/${firstId}/export?format=${format}`)
        .set(...eng())
        .buffer(true)
        .parse((res, cb) => {
          const chunks: Buffer[] = [];
          res.on('data', (c: Buffer) => chunks.push(c));
          res.on('end', () => cb(null, Buffer.concat(chunks)));
        });
      expect(exported.status).toBe(200);
      const id = await newStudy(`Round trip ${format}`);
      const imported = await request(t.app)
        .post(`/api/studies/${id}/import`)
        .set(...eng())
        .attach('files', exported.body as Buffer, `plant.${format}`);
      expect(imported.status).toBe(200);
      const a = (
        await request(t.app)
          .get(`/api/studies/${firstId}/model`)
          .set(...eng())
      ).body.model;
      expect(imported.body.model).toEqual(a);
      sameResults(original, await runResults(id));
    },
  );

  it('CSV files, one per element type, round-trip too', async () => {
    const csv = exportModelCsv(modelSchema.parse(smallModel()));
    const id = await newStudy('From CSV');
    let req = request(t.app)
      .post(`/api/studies/${id}/import`)
      .set(...eng());
    for (const [table, text] of Object.entries(csv)) req = req.attach('files', Buffer.from(text), `${table}.csv`);
    const res = await req;
    expect(res.status).toBe(200);
    sameResults(original, await runResults(id));
  });

  it('an import with one bad row writes nothing and names the sheet, row and column', async () => {
    const id = await newStudy('Bad import');
    const before = (
      await request(t.app)
        .get(`/api/studies/${id}/model`)
        .set(...eng())
    ).body;
    const book = new ExcelJS.Workbook();
    await book.xlsx.load((await exportModelWorkbook(modelSchema.parse(smallModel()))) as unknown as ArrayBuffer);
    const cables = book.getWorksheet('Cables')!;
    const header = cables.getRow(1).values as unknown[];
    const col = header.indexOf('lengthM');
    cables.getRow(3).getCell(col).value = 'thirty';
    const bad = Buffer.from(await book.xlsx.writeBuffer());
    const res = await request(t.app)
      .post(`/api/studies/${id}/import`)
      .set(...eng())
      .attach('files', bad, 'plant.xlsx');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toContain('nothing was changed');
    const where = Object.keys(res.body.error.fields)[0];
    expect(where).toContain('Cables');
    expect(where).toContain('row 3');
    expect(where).toContain('lengthM');
    const after = (
      await request(t.app)
        .get(`/api/studies/${id}/model`)
        .set(...eng())
    ).body;
    expect(after.version).toBe(before.version);
    expect(after.model).toEqual(before.model);
  });

  it('refuses other file types and needs at least one file', async () => {
    const id = await newStudy('Wrong file');
    const png = await request(t.app)
      .post(`/api/studies/${id}/import`)
      .set(...eng())
      .attach('files', Buffer.from('x'), 'plant.png');
    expect(png.status).toBe(415);
    const none = await request(t.app)
      .post(`/api/studies/${id}/import`)
      .set(...eng());
    expect(none.status).toBe(400);
  });
});
