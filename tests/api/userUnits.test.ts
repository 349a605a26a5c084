/**
 * The unit system is a preference of each user, stored on the user (migration 011-user-units): read with
 * GET /api/auth/me, set with PUT /api/auth/me/preferences. It changes what the screens show, never a stored value.
 */
import request from 'supertest';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

describe('PUT /api/auth/me/preferences', () => {
  it('is null until chosen, then kept on the user and read back by /auth/me; other users keep theirs', async () => {
    const engineer = bearer(t.orgA.users.engineer.token);
    const before = await request(t.app)
      .get('/api/auth/me')
      .set(...engineer);
    expect(before.status).toBe(200);
    expect(before.body.units).toBeNull();

    const set = await request(t.app)
      .put('/api/auth/me/preferences')
      .set(...engineer)
      .send({ units: 'us' });
    expect(set.status).toBe(200);
    expect(set.body).toEqual({ units: 'us' });
    expect(
      (
        await request(t.app)
          .get('/api/auth/me')
          .set(...engineer)
      ).body.units,
    ).toBe('us');
    expect(
      (
        await request(t.app)
          .get('/api/auth/me')
          .set(...bearer(t.orgA.users.electrician.token))
      ).body.units,
    ).toBeNull();

    // Back to the organization's default.
    await request(t.app)
      .put('/api/auth/me/preferences')
      .set(...engineer)
      .send({ units: null });
    expect(
      (
        await request(t.app)
          .get('/api/auth/me')
          .set(...engineer)
      ).body.units,
    ).toBeNull();
  });

  it('refuses an unknown unit system or key with a 400 naming the field, and changes nothing', async () => {
    const engineer = bearer(t.orgA.users.engineer.token);
    await request(t.app)
      .put('/api/auth/me/preferences')
      .set(...engineer)
      .send({ units: 'si' });
    const bad = await request(t.app)
      .put('/api/auth/me/preferences')
      .set(...engineer)
      .send({ units: 'imperial' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(['units']);
    expect(bad.body.error.fields.units).toMatch(/choose one of: us, si$/i);
    const extra = await request(t.app)
      .put('/api/auth/me/preferences')
      .set(...engineer)
      .send({ units: 'us', theme: 'dark' });
    expect(extra.status).toBe(400);
    expect(
      (
        await request(t.app)
          .get('/api/auth/me')
          .set(...engineer)
      ).body.units,
    ).toBe('si');
  });

  it('needs a signed-in user', async () => {
    const res = await request(t.app).put('/api/auth/me/preferences').send({ units: 'us' });
    expect(res.status).toBe(401);
  });
});
