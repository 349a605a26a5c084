/**
 * The short-lived read caches of the hot routes (server/db/readCache.ts): the run a study's results stand on
 * (server/services/results.ts) and the public label check's reads (server/services/labels.ts). Every write of a
 * watched model drops them at once, and again when its transaction commits; a read that began before a write never
 * stores its older answer. A newer run replacing the cached one is checked in resultsCache.test.ts.
 */
import request from 'supertest';
import { Label, Study, StudyRun } from '../../server/db/models';
import { changeCounter, ReadCache } from '../../server/db/readCache';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let siteId = '';
let studyId = '';

beforeAll(async () => {
  t = await makeTestApp();
  siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ name: 'Read cache site' })
  ).body.id;
  studyId = await approveStudy(t, siteId, smallModel());
}, 60_000);
afterAll(async () => t.close());

const labelsOf = async (id: string) =>
  (
    await request(t.app)
      .get(`/api/studies/${id}/labels`)
      .set(...bearer(t.orgA.users.electrician.token))
  ).body.labels as { id: string; code: string; equipmentTag: string }[];

describe('the public label check while its reads are cached', () => {
  it('says superseded, with the current values, as soon as a new revision is approved', async () => {
    const [label] = await labelsOf(studyId);
    const first = await request(t.app).get(`/api/labels/${label.code}`);
    expect(first.status).toBe(200);
    expect(first.body.status).toBe('current');
    // Answered from the cache now: the same content.
    const again = await request(t.app).get(`/api/labels/${label.code}`);
    expect(again.body.content).toEqual(first.body.content);

    const changed = smallModel();
    (changed.cables as { lengthM: number }[])[0].lengthM = 120;
    const revision = await approveStudy(t, siteId, changed, studyId);
    const after = await request(t.app).get(`/api/labels/${label.code}`);
    expect(after.body.status).toBe('superseded');
    const newer = (await labelsOf(revision)).find((l) => l.equipmentTag === label.equipmentTag)!;
    const newerRow = await Label.findByPk(newer.id);
    expect(after.body.current).toEqual(JSON.parse(newerRow!.content));
  }, 60_000);

  it('is past review as soon as the clock passes the review date (the status is worked out at every check)', async () => {
    const list = await request(t.app)
      .get(`/api/sites/${siteId}/labels?current=1`)
      .set(...bearer(t.orgA.users.electrician.token));
    const code = (list.body.labels as { code: string }[])[0].code;
    const row = await Label.findOne({ where: { code } });
    expect((await request(t.app).get(`/api/labels/${code}`)).body.status).toBe('current');
    t.setNow(new Date(row!.reviewBy.getTime() + 60_000));
    try {
      expect((await request(t.app).get(`/api/labels/${code}`)).body.status).toBe('past-review');
    } finally {
      t.setNow(null);
    }
  });
});

describe('change counters', () => {
  it('move on every kind of write of a watched model, and again when its transaction commits', async () => {
    const studies = () => changeCounter('studies');
    const labels = () => changeCounter('labels');
    const study = (await Study.findByPk(studyId))!;

    let before = studies();
    await study.update({ title: 'Read cache study (renamed)' });
    expect(studies()).toBeGreaterThan(before);

    before = studies();
    await Study.update({ title: 'Read cache study' }, { where: { id: studyId } });
    expect(studies()).toBeGreaterThan(before);

    before = studies();
    const run = (await StudyRun.findOne({ where: { studyId } }))!;
    const message = run.message;
    await run.update({ message: `${message} (edited)` });
    await StudyRun.update({ message }, { where: { id: run.id } });
    expect(studies()).toBeGreaterThanOrEqual(before + 2);

    before = labels();
    const label = (await Label.findOne({ where: { studyId } }))!;
    await label.update({ printedAt: new Date() });
    expect(labels()).toBeGreaterThan(before);
    before = labels();
    await Label.update({ printedAt: null }, { where: { id: label.id } });
    expect(labels()).toBeGreaterThan(before);

    // In a transaction: once when the statement runs, once more at commit (a read in between saw the old row).
    let inside = 0;
    before = labels();
    await t.db.sequelize.transaction(async (transaction) => {
      await Label.update({ printedAt: new Date() }, { where: { id: label.id }, transaction });
      inside = labels();
    });
    expect(inside).toBe(before + 1);
    expect(labels()).toBe(before + 2);
  });

  it('an entry is dropped when its tables change, and a read that began before a change is not stored', async () => {
    const cache = new ReadCache<{ v: number }>('labels', 10);
    const at = cache.counter();
    cache.set('a', { v: 1 }, at);
    expect(cache.get('a')).toEqual({ v: 1 });
    await Label.update({ printedAt: null }, { where: { studyId } });
    expect(cache.get('a')).toBeUndefined();

    const readBegan = cache.counter();
    await Label.update({ printedAt: new Date() }, { where: { studyId } });
    cache.set('b', { v: 2 }, readBegan);
    expect(cache.get('b')).toBeUndefined();

    // Another table's writes leave it alone.
    const now = cache.counter();
    cache.set('c', { v: 3 }, now);
    await Study.update({ title: 'Read cache study' }, { where: { id: studyId } });
    expect(cache.get('c')).toEqual({ v: 3 });
  });
});
