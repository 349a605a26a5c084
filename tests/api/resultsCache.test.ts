/**
 * GET /api/studies/:id/results (pages) and /results/buses/:busId answer from caches of the parsed run
 * (server/services/results.ts). These checks hold them to what the database says: a cached answer is the cold answer
 * byte for byte and matches the run row, a newer run replaces it at once, and being cached never lets another
 * organization or a role that may not see the study read it.
 */
import request from 'supertest';
import { StudyRun } from '../../server/db/models';
import { clearResultsCache } from '../../server/services/results';
import { smallModel } from '../fixtures/smallModel';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';
import { parseStoredResults } from '../../server/engine/study/storedResults';

let t: TestApp;
let studyId = '';

const eng = () => bearer(t.orgA.users.engineer.token);
const results = (token: string, headers: Record<string, string> = {}, path = '') =>
  request(t.app)
    .get(`/api/studies/${studyId}/results${path}`)
    .set(...bearer(token))
    .set(headers);

/** Saves `model` as the draft's model and runs it to the end; returns the run id. */
async function saveAndRun(model: ReturnType<typeof smallModel>): Promise<string> {
  const env = await request(t.app)
    .get(`/api/studies/${studyId}/model`)
    .set(...eng());
  const put = await request(t.app)
    .put(`/api/studies/${studyId}/model`)
    .set(...eng())
    .send({ model, version: env.body.version });
  expect(put.status).toBe(200);
  const run = await request(t.app)
    .post(`/api/studies/${studyId}/run`)
    .set(...eng());
  expect(run.status).toBe(202);
  await t.ctx.jobs.idle();
  return run.body.id as string;
}

beforeAll(async () => {
  t = await makeTestApp();
  const site = await request(t.app)
    .post('/api/sites')
    .set(...eng())
    .send({ name: 'Results cache site' });
  const study = await request(t.app)
    .post(`/api/sites/${site.body.id}/studies`)
    .set(...eng())
    .send({ title: 'Results cache study' });
  studyId = study.body.id;
  await saveAndRun(smallModel());
}, 60_000);

afterAll(async () => {
  await t.close();
});

describe('cached study results', () => {
  it('a cached answer is the cold answer byte for byte, matches the run row, and carries an ETag that yields a 304', async () => {
    clearResultsCache();
    const cold = await results(t.orgA.users.engineer.token);
    expect(cold.status).toBe(200);
    expect(cold.headers['content-type']).toMatch(/^application\/json/);
    const warm = await results(t.orgA.users.engineer.token);
    expect(warm.status).toBe(200);
    expect(warm.text).toBe(cold.text);
    expect(warm.headers.etag).toBeTruthy();
    expect(warm.headers.etag).toBe(cold.headers.etag);

    const row = await StudyRun.findByPk(cold.body.run.id as string);
    expect(row?.status).toBe('done');
    expect(cold.body.run.finishedAt).toBe(row!.finishedAt!.toISOString());
    const stored = parseStoredResults(row!.results!);
    expect(cold.body.rows.map((r: { busId: string }) => r.busId)).toEqual(stored.buses.map((b) => b.busId).sort());
    for (const r of cold.body.rows as { busId: string }[]) {
      const { cases: _cases, ...rest } = stored.buses.find((b) => b.busId === r.busId)!;
      expect(r).toMatchObject(rest);
    }

    const notModified = await results(t.orgA.users.engineer.token, { 'If-None-Match': cold.headers.etag });
    expect(notModified.status).toBe(304);
    expect(notModified.text ?? '').toBe('');
    const otherTag = await results(t.orgA.users.engineer.token, { 'If-None-Match': '"not-this-one"' });
    expect(otherTag.status).toBe(200);
    expect(otherTag.text).toBe(cold.text);

    // Another query is another entity.
    const sorted = await results(t.orgA.users.engineer.token, { 'If-None-Match': cold.headers.etag }, '?sort=energy');
    expect(sorted.status).toBe(200);
    expect(sorted.headers.etag).not.toBe(cold.headers.etag);

    // One bus: cold and warm alike, with its own tag.
    clearResultsCache();
    const busCold = await results(t.orgA.users.engineer.token, {}, '/buses/PNL');
    expect(busCold.status).toBe(200);
    const busWarm = await results(t.orgA.users.engineer.token, {}, '/buses/PNL');
    expect(busWarm.text).toBe(busCold.text);
    expect(busCold.body.bus).toEqual(stored.buses.find((b) => b.busId === 'PNL'));
    expect(
      (await results(t.orgA.users.engineer.token, { 'If-None-Match': busCold.headers.etag }, '/buses/PNL')).status,
    ).toBe(304);
  });

  it('after another run finishes, the answer is the new run’s, not the cached one', async () => {
    const before = await results(t.orgA.users.engineer.token);
    expect(before.status).toBe(200);
    // A longer feeder to the panel: less fault current at PNL, so the results differ as well as the run id.
    const model = smallModel();
    model.cables!.find((c) => c.id === 'F-PNL')!.lengthM = 60;
    const newRunId = await saveAndRun(model);
    expect(newRunId).not.toBe(before.body.run.id);

    const after = await results(t.orgA.users.engineer.token);
    expect(after.status).toBe(200);
    expect(after.body.run.id).toBe(newRunId);
    expect(after.headers.etag).not.toBe(before.headers.etag);
    const pnl = (r: { body: { rows: { busId: string }[] } }) =>
      JSON.stringify(r.body.rows.find((b) => b.busId === 'PNL'));
    expect(pnl(after)).not.toBe(pnl(before));
    const bus = await results(t.orgA.users.engineer.token, {}, '/buses/PNL');
    expect(bus.body.run.id).toBe(newRunId);
    // The old ETag no longer matches.
    expect((await results(t.orgA.users.engineer.token, { 'If-None-Match': before.headers.etag })).status).toBe(200);
  }, 60_000);

  it('concurrent cold requests for several buses (and one unknown) each get their own answer', async () => {
    clearResultsCache();
    const page = await results(t.orgA.users.engineer.token);
    const ids = (page.body.rows as { busId: string }[]).map((r) => r.busId);
    // The page left the traces alone: these are the first bus requests of the run, all at once.
    const cold = await Promise.all(
      [...ids, 'NO-SUCH-BUS'].map((id) => results(t.orgA.users.engineer.token, {}, `/buses/${id}`)),
    );
    expect(cold.map((r) => r.status)).toEqual([...ids.map(() => 200), 404]);
    cold.slice(0, -1).forEach((r, i) => expect(r.body.bus.busId).toBe(ids[i]));
    const stored = parseStoredResults((await StudyRun.findByPk(page.body.run.id as string))!.results!);
    for (const [i, id] of ids.entries()) {
      expect(cold[i].body.bus).toEqual(stored.buses.find((b) => b.busId === id));
      const warm = await results(t.orgA.users.engineer.token, {}, `/buses/${id}`);
      expect(warm.text).toBe(cold[i].text);
    }
  });

  it('results stored before the stored form (plain JSON of the results) answer byte for byte the same', async () => {
    clearResultsCache();
    const page = await results(t.orgA.users.engineer.token, {}, '?sort=energy');
    const bus = await results(t.orgA.users.engineer.token, {}, '/buses/PNL');
    expect(page.status).toBe(200);
    expect(bus.status).toBe(200);
    const row = (await StudyRun.findByPk(page.body.run.id as string))!;
    const storedText = row.results!;
    // Shorter than the plain JSON (the repeated label values once), and the plain JSON reads back the same.
    const plain = JSON.stringify(parseStoredResults(storedText));
    expect(storedText.length).toBeLessThan(plain.length);
    try {
      await StudyRun.update({ results: plain }, { where: { id: row.id }, hooks: false });
      clearResultsCache();
      const pageBefore = await results(t.orgA.users.engineer.token, {}, '?sort=energy');
      const busBefore = await results(t.orgA.users.engineer.token, {}, '/buses/PNL');
      expect(pageBefore.text).toBe(page.text);
      expect(busBefore.text).toBe(bus.text);
    } finally {
      await StudyRun.update({ results: storedText }, { where: { id: row.id }, hooks: false });
      clearResultsCache();
    }
  });

  it('another organization and an electrician (draft) get 404 even while the answer is cached', async () => {
    expect((await results(t.orgA.users.engineer.token)).status).toBe(200);
    expect((await results(t.orgA.users.engineer.token, {}, '/buses/PNL')).status).toBe(200);
    for (const token of [t.orgB.users.engineer.token, t.orgB.users.admin.token, t.orgA.users.electrician.token]) {
      const res = await results(token);
      expect(res.status).toBe(404);
      expect(res.text).not.toContain('"rows"');
      const bus = await results(token, {}, '/buses/PNL');
      expect(bus.status).toBe(404);
      expect(bus.text).not.toContain('"bus"');
    }
    expect((await results(t.orgA.users.safety.token)).status).toBe(200);
  });
});
