/**
 * The model checks kept by model text (server/services/modelCheck.ts): the answer is parseModel's, whether it was
 * just computed or kept, and a run started after a save stores the snapshot a fresh check gives.
 */
import request from 'supertest';
import { plausibilityWarnings } from '../../shared/modelPlausibility';
import { parseModel } from '../../shared/schemas/model';
import { Study, StudyRun } from '../../server/db/models';
import { checkModelText, markAcceptedModel } from '../../server/services/modelCheck';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { solidsBuildingModel } from '../../server/seed/solidsBuildingModel';
import { generatedPlant } from '../../server/seed/generatedPlant';
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

  it('a model parseModel has just accepted gets, without a second check, exactly the answer a fresh check gives', () => {
    // The demo plant (generator, motors), a plant with operating scenarios, a generated plant, and a model with a
    // plausibility warning (a 480 V feeder of 5 km: a length in the wrong unit).
    const odd = smallModel();
    (odd.cables as { lengthM: number }[])[0].lengthM = 5000;
    for (const input of [larkspurModel(), solidsBuildingModel(), generatedPlant(3, 9), odd]) {
      const accepted = parseModel(input);
      if (!accepted.success) throw new Error('the fixture must be sound');
      markAcceptedModel(accepted.model);
      const text = JSON.stringify(accepted.model);
      const kept = checkModelText(text, accepted.model);
      const fresh = parseModel(JSON.parse(text));
      if (!fresh.success) throw new Error('the text must check again');
      expect(kept.issues).toEqual([]);
      expect(kept.snapshot).toBe(JSON.stringify(fresh.model));
      expect(kept.warnings).toEqual(plausibilityWarnings(fresh.model));
      expect(kept.hasEquipment).toBe(fresh.model.buses.some((b) => b.equipment));
    }
    expect(checkModelText(JSON.stringify(odd), odd).warnings.length).toBeGreaterThan(0);
  });

  it('a model not marked as accepted is checked from its text, whatever object is given with it', () => {
    const model = smallModel();
    (model.cables as { toBus: string }[])[0].toBus = 'ANOTHER-UNKNOWN-BUS';
    const c = checkModelText(JSON.stringify(model), model);
    expect(c.snapshot).toBeNull();
    expect(c.issues.length).toBeGreaterThan(0);
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

  it('after an import (checked as it was read, not again) stores the snapshot and warnings a fresh check gives', async () => {
    const studyId = await draftStudy(t, 'Model check site', 'Imported model study', smallModel());
    const model = smallModel();
    (model.cables as { lengthM: number }[])[0].lengthM = 5000;
    const imported = await request(t.app)
      .post(`/api/studies/${studyId}/import`)
      .set(...bearer(t.orgA.users.engineer.token))
      .attach('files', Buffer.from(JSON.stringify(model)), 'plant.json');
    expect(imported.status).toBe(200);
    const stored = (await Study.findByPk(studyId))!.model;
    const fresh = parseModel(JSON.parse(stored));
    if (!fresh.success) throw new Error('the stored model must be sound');
    expect(imported.body.issues).toEqual([]);
    expect(imported.body.warnings).toEqual(plausibilityWarnings(fresh.model));
    expect(imported.body.warnings.length).toBeGreaterThan(0);
    const run = await request(t.app)
      .post(`/api/studies/${studyId}/run`)
      .set(...bearer(t.orgA.users.engineer.token));
    expect(run.status).toBe(202);
    await t.ctx.jobs.idle();
    const row = await StudyRun.findByPk(run.body.id as string);
    expect(row!.modelSnapshot).toBe(JSON.stringify(fresh.model));
  });
});
