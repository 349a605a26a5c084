/**
 * Plausibility warnings travel with the model (GET and PUT of the model, import): shown, never blocking. The rules
 * themselves are checked in tests/engine/modelPlausibility.test.ts (common practice, no source).
 */
import request from 'supertest';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { draftStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

describe('plausibility warnings on the model routes', () => {
  it('a 25 km low-voltage cable is saved, and the model comes back with a warning naming it', async () => {
    const model = larkspurModel();
    model.cables![0].lengthM = 25000;
    const studyId = await draftStudy(t, 'Warning site', 'Warnings', model);
    const env = await request(t.app)
      .get(`/api/studies/${studyId}/model`)
      .set(...bearer(t.orgA.users.engineer.token));
    expect(env.status).toBe(200);
    expect(env.body.issues).toEqual([]);
    expect(env.body.warnings).toEqual([
      expect.objectContaining({
        code: 'implausible',
        path: 'cables[0].lengthM',
        elementId: 'F-SWBD1',
        field: 'lengthM',
      }),
    ]);
    // The run is not blocked.
    const run = await request(t.app)
      .post(`/api/studies/${studyId}/run`)
      .set(...bearer(t.orgA.users.engineer.token));
    expect(run.status).toBe(202);
  });

  it('an ordinary model has none', async () => {
    const studyId = await draftStudy(t, 'Plain site', 'Plain', larkspurModel());
    const env = await request(t.app)
      .get(`/api/studies/${studyId}/model`)
      .set(...bearer(t.orgA.users.engineer.token));
    expect(env.body.warnings).toEqual([]);
  });
});
