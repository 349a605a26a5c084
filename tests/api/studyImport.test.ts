import ExcelJS from 'exceljs';
import request from 'supertest';
import { modelSchema } from '../../shared/schemas/model';
import { MODEL_TABLES, exportModelCsv, exportModelWorkbook } from '../../server/io';
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
    // A model without operating scenarios comes back without the key (docs/MODEL-FORMAT.md, Operating scenarios).
    expect(res.body.model).not.toHaveProperty('scenarios');
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

/** A file downloaded from the export route, as bytes. */
async function download(studyId: string, query: string): Promise<Buffer> {
  const res = await request(t.app)
    .get(`/api/studies/${studyId}/export?${query}`)
    .set(...eng())
    .buffer(true)
    .parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
  expect(res.status).toBe(200);
  return res.body as Buffer;
}

describe('operating scenarios through import and export (docs/MODEL-FORMAT.md, Operating scenarios)', () => {
  // Common practice, no source: export then import gives the same model, scenarios included.
  const scenarios = [
    { id: 'util-min', name: 'Utility minimum', sources: { UTIL: { shortCircuitMva: 100, xr: 6 } } },
    { id: 'pump-off', motors: { 'P-1': { inService: false } }, allMotorsOff: false },
    { id: 'no-motors', name: 'Motors stopped', allMotorsOff: true },
  ];
  const model = () => modelSchema.parse({ ...smallModel(), scenarios });
  let sourceId = '';

  it('a workbook with scenarios imports them', async () => {
    sourceId = await newStudy('Scenarios from workbook');
    const res = await request(t.app)
      .post(`/api/studies/${sourceId}/import`)
      .set(...eng())
      .attach('files', await exportModelWorkbook(model()), 'plant.xlsx');
    expect(res.status).toBe(200);
    expect(res.body.model.scenarios).toEqual(scenarios);
  });

  it('scenarios.csv is one of the CSV tables the export route gives', async () => {
    const text = (await download(sourceId, 'format=csv&element=scenarios')).toString('utf8');
    expect(text.replace(/^\uFEFF/, '').split('\r\n')).toEqual([
      'scenario,scenarioName,allMotorsOff,element,inService,shortCircuitMva,shortCircuitKa,xr,closed',
      'util-min,Utility minimum,,UTIL,,100,,6,',
      'pump-off,,false,P-1,false,,,,',
      'no-motors,Motors stopped,true,,,,,,',
      '',
    ]);
  });

  it.each(['xlsx', 'json', 'csv'] as const)('export as %s → import into a new study keeps them', async (format) => {
    const id = await newStudy(`Scenarios round trip ${format}`);
    let req = request(t.app)
      .post(`/api/studies/${id}/import`)
      .set(...eng());
    if (format === 'csv') {
      for (const table of MODEL_TABLES) {
        req = req.attach('files', await download(sourceId, `format=csv&element=${table}`), `${table}.csv`);
      }
    } else {
      req = req.attach('files', await download(sourceId, `format=${format}`), `plant.${format}`);
    }
    const res = await req;
    expect(res.status).toBe(200);
    const before = (
      await request(t.app)
        .get(`/api/studies/${sourceId}/model`)
        .set(...eng())
    ).body.model;
    expect(res.body.model).toEqual(before);
    expect(res.body.model.scenarios).toEqual(scenarios);
  });

  it('an unknown element in the Scenarios sheet: 400 naming sheet, row and column, nothing written', async () => {
    const id = await newStudy('Scenarios bad import');
    const before = (
      await request(t.app)
        .get(`/api/studies/${id}/model`)
        .set(...eng())
    ).body;
    const book = new ExcelJS.Workbook();
    await book.xlsx.load((await exportModelWorkbook(model())) as unknown as ArrayBuffer);
    book.getWorksheet('Scenarios')!.getCell('D3').value = 'P-9';
    const res = await request(t.app)
      .post(`/api/studies/${id}/import`)
      .set(...eng())
      .attach('files', Buffer.from(await book.xlsx.writeBuffer()), 'plant.xlsx');
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({
      'Scenarios row 3, element (D)': 'Unknown element "P-9": give the id of a source, tie or motor of the model',
    });
    const after = (
      await request(t.app)
        .get(`/api/studies/${id}/model`)
        .set(...eng())
    ).body;
    expect(after.version).toBe(before.version);
    expect(after.model).toEqual(before.model);
  });
});
