/**
 * The study report's mitigation appendix (GET /studies/:id/report.pdf?mitigationAboveCalPerCm2=…): the buses above the
 * chosen energy, each with the options of the mitigation view toward that energy, read back from the PDF's text.
 *
 * What the options are (settings, energies, selectivity) is checked against hand-worked cases in
 * tests/engine/mitigation-*.test.ts and tests/api/mitigation.test.ts; here the report must print the same options as
 * POST /studies/:id/mitigate gives for the same bus and target, and only for the buses above the energy. Which buses are
 * above it comes from the stored results, not from numbers typed here.
 */
import request from 'supertest';
import { formatCalPerCm2 } from '../../shared/labelDisplay';
import type { MitigationResponse } from '../../shared/schemas/mitigation';
import type { ResultsPage } from '../../shared/schemas/resultsPage';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { MITIGATION_APPENDIX_HEADING } from '../../server/pdf/studyReport';
import { approveStudy } from '../helpers/flows';
import { readPdf } from '../helpers/pdfText';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

jest.setTimeout(180_000);

let t: TestApp;
let studyId: string;
const TARGET = 8;
const eng = () => bearer(t.orgA.users.engineer.token);

const norm = (s: string) => s.replace(/\s+/g, ' ').trim();

async function reportText(
  query: string,
  auth: [string, string],
): Promise<{ status: number; text: string; body: unknown }> {
  const res = await request(t.app)
    .get(`/api/studies/${studyId}/report.pdf${query}`)
    .set(...auth)
    .buffer(true)
    .parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    });
  if (res.status !== 200) return { status: res.status, text: '', body: JSON.parse((res.body as Buffer).toString()) };
  return { status: 200, text: norm(readPdf(res.body as Buffer).text), body: null };
}

beforeAll(async () => {
  t = await makeTestApp();
  const site = await request(t.app)
    .post('/api/sites')
    .set(...eng())
    .send({ name: 'Report appendix plant (invented)' });
  studyId = await approveStudy(t, site.body.id as string, larkspurModel());
});

afterAll(async () => {
  await t.close();
});

describe('study report: mitigation appendix', () => {
  it('lists every bus above the energy with the best options the mitigation view gives, and no bus at or below it', async () => {
    const results = await request(t.app)
      .get(`/api/studies/${studyId}/results?pageSize=500`)
      .set(...eng());
    expect(results.status).toBe(200);
    const buses = (results.body as ResultsPage).rows;
    expect(buses.length).toBeGreaterThan(0);
    const above = buses.filter((b) => (b.incidentEnergyCalPerCm2 ?? 0) > TARGET);
    const below = buses.filter((b) => b.incidentEnergyCalPerCm2 !== undefined && b.incidentEnergyCalPerCm2 <= TARGET);
    expect(above.length).toBeGreaterThan(0);
    expect(below.length).toBeGreaterThan(0);

    const { status, text } = await reportText(`?mitigationAboveCalPerCm2=${TARGET}`, eng());
    expect(status).toBe(200);
    const at = text.indexOf(MITIGATION_APPENDIX_HEADING);
    expect(at).toBeGreaterThan(0);
    const appendix = text.slice(at);
    expect(appendix).toContain('reviewed, coordinated and sealed by a qualified (licensed) engineer');

    let printedOptions = 0;
    for (const b of above) {
      expect(appendix).toContain(
        norm(`${b.busId} · ${b.busName}: ${formatCalPerCm2(b.incidentEnergyCalPerCm2 as number)} cal/cm²`),
      );
      const res = await request(t.app)
        .post(`/api/studies/${studyId}/mitigate`)
        .set(...eng())
        .send({ busId: b.busId, targetCalPerCm2: TARGET });
      expect(res.status).toBe(200);
      const r = res.body as MitigationResponse;
      const best = r.options[0];
      if (!best) continue;
      printedOptions++;
      expect(appendix).toContain(norm(`Option 1: ${best.title}`));
      expect(appendix).toContain(
        `Energy ${formatCalPerCm2(r.before.incidentEnergyCalPerCm2)} → ${formatCalPerCm2(best.result.incidentEnergyCalPerCm2)} cal/cm²`,
      );
      expect(appendix).toContain(norm(best.selectivity.sentence));
    }
    // The demo's worst bus has options (maintenance switch at least): the appendix is not only headings.
    expect(printedOptions).toBeGreaterThan(0);
    for (const b of below) expect(appendix).not.toContain(`${b.busId} · ${b.busName}:`);
  });

  it('has no appendix without the parameter', async () => {
    const { status, text } = await reportText('', eng());
    expect(status).toBe(200);
    expect(text).not.toContain(MITIGATION_APPENDIX_HEADING);
  });

  it('refuses a bad energy (400 naming the parameter) and a role that may not mitigate (403)', async () => {
    const bad = await reportText('?mitigationAboveCalPerCm2=0', eng());
    expect(bad.status).toBe(400);
    expect(JSON.stringify(bad.body)).toContain('mitigationAboveCalPerCm2');

    const safety = await reportText(`?mitigationAboveCalPerCm2=${TARGET}`, bearer(t.orgA.users.safety.token));
    expect(safety.status).toBe(403);
    expect(JSON.stringify(safety.body)).toContain('mitigationAboveCalPerCm2');
    // The report itself stays theirs.
    expect((await reportText('', bearer(t.orgA.users.safety.token))).status).toBe(200);
  });
});
