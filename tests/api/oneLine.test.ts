/**
 * GET /studies/:studyId/one-line.svg: the study's one-line diagram as SVG, with the hazard at each bus from the
 * study's results. Checked: content type, every element id present, well-formed XML, the hazard text equal to the
 * stored result's label values (formatted as on the label), access by role, and another organization's study a 404.
 */
import request from 'supertest';
import { DOMParser } from '@xmldom/xmldom';
import { parseModel } from '../../shared/schemas/model';
import { formatCalPerCm2 } from '../../shared/labelDisplay';
import type { StudyResults } from '../../shared/schemas/studyResults';
import { StudyRun } from '../../server/db/models';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { solidsBuildingModel } from '../../server/seed/solidsBuildingModel';
import { draftStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

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
    const results = JSON.parse(stored!.results!) as StudyResults;
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

  test('an unknown scenario is a 400 naming the field', async () => {
    const res = await request(t.app)
      .get(`/api/studies/${studyId}/one-line.svg?scenario=nope`)
      .set(...bearer(t.orgA.users.engineer.token));
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('scenario');
  });
});
