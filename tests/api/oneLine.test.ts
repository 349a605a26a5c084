/**
 * GET /studies/:studyId/one-line.svg: the study's one-line diagram as SVG, with the hazard at each bus from the
 * study's results. Checked: content type, every element id present, well-formed XML, the hazard text equal to the
 * stored result's label values (formatted as on the label), access by role, and another organization's study a 404.
 */
import request from 'supertest';
import { DOMParser } from '@xmldom/xmldom';
import { parseModel } from '../../shared/schemas/model';
import { formatCalPerCm2 } from '../../shared/labelDisplay';
import { StudyRun } from '../../server/db/models';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { solidsBuildingModel } from '../../server/seed/solidsBuildingModel';
import { generatedPlant } from '../../server/seed/generatedPlant';
import { draftStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';
import { parseStoredResults } from '../../server/engine/study/storedResults';

let t: TestApp;
let studyId: string;

beforeAll(async () => {
  t = await makeTestApp();
  studyId = await draftStudy(t, 'One-line site', 'One-line study', larkspurModel());
}, 60_000);
afterAll(async () => t.close());

const get = (token: string, id = studyId, query = '') =>
  request(t.app)
    .get(`/api/studies/${id}/one-line.svg${query}`)
    .set(...bearer(token))
    .buffer(true)
    .parse((res, cb) => {
      let data = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => (data += c));
      res.on('end', () => cb(null, data));
    });

describe('GET /studies/:studyId/one-line.svg', () => {
  test('an SVG of the whole model: every element id, well-formed, before any run says so', async () => {
    const res = await get(t.orgA.users.engineer.token);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^image\/svg\+xml/);
    const svg = res.body as string;
    const errors: string[] = [];
    new DOMParser({ errorHandler: (l: string, m: unknown) => errors.push(`${l} ${String(m)}`) }).parseFromString(
      svg,
      'image/svg+xml',
    );
    expect(errors).toEqual([]);
    const p = parseModel(larkspurModel());
    if (!p.success) throw new Error('demo model');
    const m = p.model;
    for (const id of [...m.buses, ...m.sources, ...m.transformers, ...m.cables, ...m.motors, ...m.devices].map(
      (x) => x.id,
    )) {
      expect([id, svg.includes(`data-id="${id}"`)]).toEqual([id, true]);
    }
    expect(svg).toContain('No results yet');
  });

  test('after a run, each labelled bus shows its energy and signal word from the stored results', async () => {
    const run = await request(t.app)
      .post(`/api/studies/${studyId}/run`)
      .set(...bearer(t.orgA.users.engineer.token));
    expect(run.status).toBe(202);
    await t.ctx.jobs.idle();
    const stored = await StudyRun.findOne({ where: { studyId, status: 'done' } });
    const results = parseStoredResults(stored!.results!);
    const res = await get(t.orgA.users.safety.token);
    expect(res.status).toBe(200);
    const svg = res.body as string;
    let shown = 0;
    for (const b of results.buses) {
      if (!b.labelValues) continue;
      const text = `${formatCalPerCm2(b.labelValues.incidentEnergyCalPerCm2)} cal/cm² · ${b.labelValues.signalWord}`;
      expect([b.busId, svg.includes(`>${text}</text>`)]).toEqual([b.busId, true]);
      shown++;
    }
    expect(shown).toBeGreaterThan(3);
  }, 120_000);

  test('access: engineer, safety and admin; not the electrician; another organization’s study is a 404', async () => {
    expect((await get(t.orgA.users.admin.token)).status).toBe(200);
    expect((await get(t.orgA.users.electrician.token)).status).toBe(403);
    expect((await get(t.orgB.users.engineer.token)).status).toBe(404);
    expect((await request(t.app).get(`/api/studies/${studyId}/one-line.svg`)).status).toBe(401);
  });

  test('GET /studies/:studyId/one-line: the same drawing as geometry, every element once, for the app', async () => {
    const res = await request(t.app)
      .get(`/api/studies/${studyId}/one-line`)
      .set(...bearer(t.orgA.users.engineer.token));
    expect(res.status).toBe(200);
    const ids = (res.body.elements as { id: string }[]).map((e) => e.id).sort();
    const p = parseModel(larkspurModel());
    if (!p.success) throw new Error('demo model');
    const m = p.model;
    const expected = [...m.buses, ...m.sources, ...m.transformers, ...m.cables, ...m.ties, ...m.motors, ...m.devices]
      .map((x) => x.id)
      .sort();
    expect(ids).toEqual(expected);
    expect(
      (
        await request(t.app)
          .get(`/api/studies/${studyId}/one-line`)
          .set(...bearer(t.orgB.users.engineer.token))
      ).status,
    ).toBe(404);
  });

  test('with operating scenarios: the list, and a scenario’s open ties and stopped sources dashed', async () => {
    const input = solidsBuildingModel();
    const id = await draftStudy(t, 'Scenario one-line site', 'Scenarios', input);
    const p = parseModel(input);
    if (!p.success) throw new Error('demo model');
    const scenarios = p.model.scenarios ?? [];
    expect(scenarios.length).toBeGreaterThan(0);
    for (const sc of scenarios) {
      const res = await request(t.app)
        .get(`/api/studies/${id}/one-line?scenario=${encodeURIComponent(sc.id)}`)
        .set(...bearer(t.orgA.users.engineer.token));
      expect(res.status).toBe(200);
      expect(res.body.scenarioId).toBe(sc.id);
      expect((res.body.scenarios as { id: string }[]).map((x) => x.id)).toEqual(scenarios.map((x) => x.id));
      const byId = new Map((res.body.elements as { id: string; dashed?: boolean }[]).map((e) => [e.id, e]));
      for (const [sid, o] of Object.entries(sc.sources ?? {})) {
        if (o.inService === false) expect([sid, byId.get(sid)?.dashed]).toEqual([sid, true]);
      }
      for (const [tid, o] of Object.entries(sc.ties ?? {})) {
        expect([tid, byId.get(tid)?.dashed ?? false]).toEqual([tid, !o.closed]);
      }
    }
  });

  test('collapsed: the subtree of SWBD-1 is one box naming the highest label energy of its buses in the stored results', async () => {
    // Runs after the run above (same study). Under SWBD-1 in the demo model: MCC-1 and PP-1 on its feeders, LP-1
    // behind PP-1's transformer (server/seed/larkspurModel.ts).
    const stored = await StudyRun.findOne({ where: { studyId, status: 'done' } });
    const results = parseStoredResults(stored!.results!);
    const inside = results.buses.filter((b) => ['MCC-1', 'PP-1', 'LP-1'].includes(b.busId) && b.labelValues);
    expect(inside.length).toBeGreaterThan(0);
    const worst = inside.reduce((w, b) =>
      b.labelValues!.incidentEnergyCalPerCm2 > w.labelValues!.incidentEnergyCalPerCm2 ? b : w,
    );
    const res = await get(t.orgA.users.engineer.token, studyId, '?collapsed=SWBD-1');
    expect(res.status).toBe(200);
    const svg = res.body as string;
    expect(svg).toContain('>3 buses collapsed under SWBD-1</text>');
    expect(svg).toContain(
      `>Highest: ${formatCalPerCm2(worst.labelValues!.incidentEnergyCalPerCm2)} cal/cm² · ${worst.labelValues!.signalWord} at ${worst.busId}</text>`,
    );
    for (const id of ['MCC-1', 'PP-1', 'LP-1', 'B-101', 'CB-MCC1'])
      expect([id, svg.includes(`data-id="${id}"`)]).toEqual([id, false]);
    for (const id of ['SWBD-1', 'USS-1', 'MCC-2']) expect([id, svg.includes(`data-id="${id}"`)]).toEqual([id, true]);
    expect(svg.match(/data-kind="summary"/g)).toHaveLength(1);
  });

  test('a model of more than 150 buses opens with the subtrees below the second level collapsed; collapsed=… and expanded=all choose', async () => {
    const input = generatedPlant(2, 80);
    const id = await draftStudy(t, 'Large one-line site', 'Large plant', input);
    const tok = t.orgA.users.engineer.token;
    const byDefault = (await get(tok, id)).body as string;
    expect(byDefault.match(/data-kind="summary"/g)).toHaveLength(2);
    expect(byDefault).toContain('>80 buses collapsed under SUB-0</text>');
    expect(byDefault).toContain('>80 buses collapsed under SUB-1</text>');
    expect(byDefault).toContain('data-id="SUB-1"');
    expect(byDefault).not.toContain('data-id="MCC-0-7"');
    // One subtree collapsed by name: the other's buses are all drawn.
    const one = (await get(tok, id, '?collapsed=SUB-0')).body as string;
    expect(one.match(/data-kind="summary"/g)).toHaveLength(1);
    for (let i = 0; i < 80; i++) expect(one).toContain(`data-id="MCC-1-${i}"`);
    expect(one).not.toContain('data-id="MCC-0-0"');
    // Repeated: both; the geometry route says which are collapsed.
    const geo = await request(t.app)
      .get(`/api/studies/${id}/one-line?collapsed=SUB-0&collapsed=SUB-1`)
      .set(...bearer(tok));
    expect(geo.status).toBe(200);
    expect((geo.body.collapsed as string[]).sort()).toEqual(['SUB-0', 'SUB-1']);
    // Nothing collapsed: every element present.
    const all = (await get(tok, id, '?expanded=all')).body as string;
    expect(all).not.toContain('data-kind="summary"');
    const p = parseModel(input);
    if (!p.success) throw new Error('generated plant');
    for (const x of [...p.model.buses, ...p.model.cables, ...p.model.devices])
      expect(all).toContain(`data-id="${x.id}"`);
    // An unknown bus is a 400 naming the field.
    const bad = await get(tok, id, '?collapsed=NO-SUCH-BUS');
    expect(bad.status).toBe(400);
    expect((JSON.parse(bad.body as string) as { error: { fields: object } }).error.fields).toHaveProperty('collapsed');
  }, 60_000);

  test('an unknown scenario is a 400 naming the field', async () => {
    const res = await request(t.app)
      .get(`/api/studies/${studyId}/one-line.svg?scenario=nope`)
      .set(...bearer(t.orgA.users.engineer.token));
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('scenario');
  });
});
