import request from 'supertest';
import { smallModel } from '../fixtures/smallModel';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

/**
 * A JSON model with a misspelt key is refused through the API with the key's path, and nothing is saved
 * (docs/MODEL-FORMAT.md, Import and export; common practice, no source: a typo must not pass silently and let a
 * default stand in for the value written).
 */

let t: TestApp;
let studyId = '';
const eng = () => bearer(t.orgA.users.engineer.token);

beforeAll(async () => {
  t = await makeTestApp();
  const siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...eng())
      .send({ name: 'Unknown keys site' })
  ).body.id as string;
  studyId = (
    await request(t.app)
      .post(`/api/sites/${siteId}/studies`)
      .set(...eng())
      .send({ title: 'Unknown keys' })
  ).body.id as string;
});
afterAll(async () => t.close());

it('refuses buses[3].equipment.workingDistanceMM with its path and a suggestion; nothing is saved', async () => {
  const before = (
    await request(t.app)
      .get(`/api/studies/${studyId}/model`)
      .set(...eng())
  ).body;
  const model = JSON.parse(JSON.stringify(smallModel()));
  model.buses[3].equipment.workingDistanceMM = 914;
  const res = await request(t.app)
    .post(`/api/studies/${studyId}/import`)
    .set(...eng())
    .attach('files', Buffer.from(JSON.stringify(model)), 'plant.json');
  expect(res.status).toBe(400);
  expect(res.body.error.message).toContain('nothing was changed');
  expect(res.body.error.message).toContain(
    'plant.json buses[3].equipment.workingDistanceMM (PNL): unknown field — did you mean workingDistanceMm?',
  );
  expect(res.body.error.fields).toEqual({
    'plant.json buses[3].equipment.workingDistanceMM (PNL)': 'unknown field — did you mean workingDistanceMm?',
  });
  const after = (
    await request(t.app)
      .get(`/api/studies/${studyId}/model`)
      .set(...eng())
  ).body;
  expect(after.version).toBe(before.version);
  expect(after.model).toEqual(before.model);

  // The same file with the key spelt right imports, and keeps the value written.
  delete model.buses[3].equipment.workingDistanceMM;
  model.buses[3].equipment.workingDistanceMm = 914;
  const ok = await request(t.app)
    .post(`/api/studies/${studyId}/import`)
    .set(...eng())
    .attach('files', Buffer.from(JSON.stringify(model)), 'plant.json');
  expect(ok.status).toBe(200);
  expect(ok.body.model.buses[3].equipment.workingDistanceMm).toBe(914);
});
