/** Names: other scripts are kept as typed; control characters and text-direction overrides are refused by field. */
import request from 'supertest';
import { NAME_FORBIDDEN_MESSAGE } from '../../shared/schemas/text';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

const eng = () => bearer(t.orgA.users.engineer.token);

it('refuses NUL and bidi overrides in a site name with a 400 naming the field, and stores nothing', async () => {
  for (const name of ['Pump\u0000house', 'Station \u202Eevil', 'Line\u0007bell']) {
    const res = await request(t.app)
      .post('/api/sites')
      .set(...eng())
      .send({ name });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.name).toBe(NAME_FORBIDDEN_MESSAGE);
  }
  const list = await request(t.app)
    .get('/api/sites')
    .set(...eng());
  expect((list.body.sites as { name: string }[]).some((s) => /Pump|evil|bell/.test(s.name))).toBe(false);
});

it('keeps accents, Greek and CJK as typed', async () => {
  const name = 'Station d’épuration Ωμέγα 浄水場';
  const res = await request(t.app)
    .post('/api/sites')
    .set(...eng())
    .send({ name });
  expect(res.status).toBe(201);
  expect(res.body.name).toBe(name);
});
