/**
 * The model checks kept by model text (server/services/modelCheck.ts): the answer is parseModel's, whether it was
 * just computed or kept, and a run started after a save stores the snapshot a fresh check gives.
 */
import request from 'supertest';
import { plausibilityWarnings } from '../../shared/modelPlausibility';
import { parseModel } from '../../shared/schemas/model';
import { Study, StudyRun } from '../../server/db/models';
import { checkModelText } from '../../server/services/modelCheck';
import { smallModel } from '../fixtures/smallModel';
import { draftStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

describe('checkModelText', () => {
  it('gives parseModel’s answer for a sound model, the same answer again from the cache', () => {
    const text = JSON.stringify(smallModel());
    const parsed = parseModel(JSON.parse(text));
    if (!parsed.success) throw new Error('the fixture must be sound');
    const first = checkModelText(text);
    expect(first.issues).toEqual([]);
    expect(first.snapshot).toBe(JSON.stringify(parsed.model));
    expect(first.hasEquipment).toBe(true);
    expect(first.warnings).toEqual(plausibilityWarnings(parsed.model));
    // A different string with the same text: the kept answer.
    expect(checkModelText(` ${text}`.slice(1))).toBe(first);
  });

  it('gives parseModel’s issues for a model with problems, and no snapshot', () => {
    const model = smallModel();
    (model.cables as { toBus: string }[])[0].toBus = 'NO-SUCH-BUS';
    const text = JSON.stringify(model);
    const parsed = parseModel(JSON.parse(text));
    expect(parsed.success).toBe(false);
    const c = checkModelText(text);
    expect(c.snapshot).toBeNull();
    expect(c.issues).toEqual(parsed.success ? [] : parsed.issues);
    expect(c.warnings).toEqual([]);
  });

  it('a model without labelled equipment is sound but has nothing to label', () => {
    const model = smallModel();
    for (const b of model.buses as { equipment?: unknown }[]) delete b.equipment;
    const c = checkModelText(JSON.stringify(model));
    expect(c.issues).toEqual([]);
    expect(c.hasEquipment).toBe(false);
  });
});

describe('a run started after a save', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await makeTestApp();
  }, 60_000);
  afterAll(async () => t.close());

  it('stores the snapshot a fresh check of the stored model gives', async () => {
    const studyId = await draftStudy(t, 'Model check site', 'Model check study', smallModel());
    const run = await request(t.app)
      .post(`/api/studies/${studyId}/run`)
      .set(...bearer(t.orgA.users.engineer.token));
    expect(run.status).toBe(202);
    await t.ctx.jobs.idle();
    const stored = (await Study.findByPk(studyId))!.model;
    const fresh = parseModel(JSON.parse(stored));
    if (!fresh.success) throw new Error('the stored model must be sound');
    const row = await StudyRun.findByPk(run.body.id as string);
    expect(row!.modelSnapshot).toBe(JSON.stringify(fresh.model));
  });
});
