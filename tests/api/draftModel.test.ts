/**
 * The draft model on the wire (DraftModel in shared/schemas/studies.ts): a draft is saved with its problems and reads
 * back exactly as saved, its problems listed beside it; the save refuses only what is not a model's structure (not an
 * object, an element list that is not an array of objects), naming the field, and changes nothing then.
 */
import request from 'supertest';
import { smallModel } from '../fixtures/smallModel';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let studyId = '';
beforeAll(async () => {
  t = await makeTestApp();
  const site = await request(t.app)
    .post('/api/sites')
    .set(...eng())
    .send({ name: 'Draft model site' });
  const study = await request(t.app)
    .post(`/api/sites/${site.body.id}/studies`)
    .set(...eng())
    .send({ title: 'Draft model study' });
  studyId = study.body.id;
});
afterAll(async () => t.close());

const eng = () => bearer(t.orgA.users.engineer.token);
const getModel = () =>
  request(t.app)
    .get(`/api/studies/${studyId}/model`)
    .set(...eng());
const putModel = (model: unknown, version: number) =>
  request(t.app)
    .put(`/api/studies/${studyId}/model`)
    .set(...eng())
    .send({ model, version });

describe('draft model', () => {
  it('saves a draft with problems and reads it back unchanged, the problems named', async () => {
    const model = smallModel() as unknown as { buses: Record<string, unknown>[] };
    // A bus without its voltage and an unknown field: the editor's work in progress.
    const draft = {
      ...model,
      buses: [{ ...model.buses[0], nominalKv: undefined, note: 'half done' }, ...model.buses.slice(1)],
    };
    const before = await getModel();
    const put = await putModel(draft, before.body.version);
    expect(put.status).toBe(200);
    expect(put.body.issues.length).toBeGreaterThan(0);
    const back = await getModel();
    expect(back.status).toBe(200);
    expect(back.body.version).toBe(put.body.version);
    expect(back.body.model).toEqual(JSON.parse(JSON.stringify(draft)));
    expect(back.body.issues.some((i: { path: string }) => i.path.includes('buses'))).toBe(true);
  });

  it('refuses an element list that is not a list of objects, naming it, and keeps the saved draft', async () => {
    const before = await getModel();
    const notAList = await putModel({ ...smallModel(), buses: 5 }, before.body.version);
    expect(notAList.status).toBe(400);
    expect(Object.keys(notAList.body.error.fields)).toContain('model.buses');
    const notObjects = await putModel({ ...smallModel(), cables: ['C-1'] }, before.body.version);
    expect(notObjects.status).toBe(400);
    expect(Object.keys(notObjects.body.error.fields)).toContain('model.cables[0]');
    const notAModel = await putModel([smallModel()], before.body.version);
    expect(notAModel.status).toBe(400);
    expect(Object.keys(notAModel.body.error.fields)).toContain('model');
    const after = await getModel();
    expect(after.body.version).toBe(before.body.version);
    expect(after.body.model).toEqual(before.body.model);
  });
});
