import jwt from 'jsonwebtoken';
import request from 'supertest';
import { bearer, makeTestApp, TEST_PASSWORD, TEST_SECRET, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

function expectErrorShape(body: unknown, code: string): void {
  expect(body).toEqual({ error: expect.objectContaining({ code, message: expect.any(String) }) });
}

describe('sign-in', () => {
  it('returns a token and the user on the right password', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: 'engineer@org-a.example', password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email: 'engineer@org-a.example', role: 'engineer' });
    const claims = jwt.decode(res.body.token) as { exp: number; iat: number };
    // Expiry at most 12 h (the product's rule, docs/API.md, Authentication and access).
    expect(claims.exp - claims.iat).toBeLessThanOrEqual(12 * 3600);
  });

  it('is case-insensitive on the e-mail address', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: 'Engineer@ORG-A.example', password: TEST_PASSWORD });
    expect(res.status).toBe(200);
  });

  it('gives the same 401 message for a wrong password and an unknown user', async () => {
    const wrong = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: 'engineer@org-a.example', password: 'not-the-password' });
    const unknown = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: 'nobody@org-a.example', password: TEST_PASSWORD });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expectErrorShape(wrong.body, 'unauthorized');
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
  });

  it('names the field of a bad body', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').send({ email: 'not-an-email', password: '' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['email', 'password']));
  });

  it('refuses a body that is not JSON', async () => {
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .set('Content-Type', 'application/json')
      .send('{"email":');
    expect(res.status).toBe(400);
    expectErrorShape(res.body, 'bad_request');
  });
});

describe('tokens', () => {
  it('accepts a valid token on /auth/me', async () => {
    const res = await request(t.app)
      .get('/api/auth/me')
      .set(...bearer(t.orgA.users.safety.token));
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ role: 'safety', organization: { id: t.orgA.id } });
  });

  it('refuses a missing token', async () => {
    const res = await request(t.app).get('/api/auth/me');
    expect(res.status).toBe(401);
    expectErrorShape(res.body, 'unauthorized');
  });

  it('refuses a garbage token', async () => {
    const res = await request(t.app).get('/api/auth/me').set('Authorization', 'Bearer abc.def.ghi');
    expect(res.status).toBe(401);
    expectErrorShape(res.body, 'unauthorized');
  });

  it('refuses an expired token', async () => {
    const u = t.orgA.users.engineer;
    const decoded = jwt.decode(u.token) as Record<string, unknown>;
    const expired = jwt.sign(
      {
        org: decoded.org,
        role: decoded.role,
        ver: decoded.ver,
        sub: decoded.sub,
        jti: 'expired-one',
        exp: Math.floor(Date.now() / 1000) - 60,
      },
      TEST_SECRET,
    );
    const res = await request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${expired}`);
    expect(res.status).toBe(401);
    expectErrorShape(res.body, 'unauthorized');
  });

  it('refuses a token signed with another secret', async () => {
    const decoded = jwt.decode(t.orgA.users.engineer.token) as Record<string, unknown>;
    const forged = jwt.sign({ ...decoded, role: 'admin' }, 'another-secret-another-secret-another-secret');
    const res = await request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${forged}`);
    expect(res.status).toBe(401);
  });

  it('refuses a token after sign-out', async () => {
    const signIn = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: 'electrician@org-a.example', password: TEST_PASSWORD });
    const token = signIn.body.token as string;
    expect(
      (
        await request(t.app)
          .post('/api/auth/sign-out')
          .set(...bearer(token))
      ).status,
    ).toBe(200);
    const res = await request(t.app)
      .get('/api/auth/me')
      .set(...bearer(token));
    expect(res.status).toBe(401);
  });
});

describe('users (admin)', () => {
  it('lets an admin create a user, and that user signs in', async () => {
    const res = await request(t.app)
      .post('/api/users')
      .set(...bearer(t.orgA.users.admin.token))
      .send({
        email: 'new.engineer@org-a.example',
        name: 'New Engineer',
        role: 'engineer',
        password: 'a-long-password-1',
      });
    expect(res.status).toBe(201);
    const signIn = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: 'new.engineer@org-a.example', password: 'a-long-password-1' });
    expect(signIn.status).toBe(200);
  });

  it('refuses a short password, naming the field', async () => {
    const res = await request(t.app)
      .post('/api/users')
      .set(...bearer(t.orgA.users.admin.token))
      .send({ email: 'short@org-a.example', name: 'Short', role: 'engineer', password: 'short' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('password');
  });

  it('refuses a duplicate e-mail with 409', async () => {
    const res = await request(t.app)
      .post('/api/users')
      .set(...bearer(t.orgA.users.admin.token))
      .send({ email: 'engineer@org-a.example', name: 'Dup', role: 'engineer', password: 'a-long-password-1' });
    expect(res.status).toBe(409);
  });

  it('refuses other roles (role guard)', async () => {
    for (const role of ['engineer', 'electrician', 'safety'] as const) {
      const res = await request(t.app)
        .get('/api/users')
        .set(...bearer(t.orgA.users[role].token));
      expect(res.status).toBe(403);
      expectErrorShape(res.body, 'forbidden');
    }
  });

  it('lists only the own organization', async () => {
    const res = await request(t.app)
      .get('/api/users')
      .set(...bearer(t.orgA.users.admin.token));
    expect(res.status).toBe(200);
    const emails = (res.body.users as { email: string }[]).map((u) => u.email);
    expect(emails.some((e) => e.endsWith('@org-b.example'))).toBe(false);
  });

  it('stops the token of a deactivated user, and the user cannot sign in', async () => {
    const created = await request(t.app)
      .post('/api/users')
      .set(...bearer(t.orgA.users.admin.token))
      .send({ email: 'leaving@org-a.example', name: 'Leaving', role: 'electrician', password: 'a-long-password-1' });
    const signIn = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: 'leaving@org-a.example', password: 'a-long-password-1' });
    const token = signIn.body.token as string;
    expect(
      (
        await request(t.app)
          .get('/api/auth/me')
          .set(...bearer(token))
      ).status,
    ).toBe(200);
    const off = await request(t.app)
      .patch(`/api/users/${created.body.id}`)
      .set(...bearer(t.orgA.users.admin.token))
      .send({ active: false });
    expect(off.status).toBe(200);
    expect(off.body.active).toBe(false);
    const me = await request(t.app)
      .get('/api/auth/me')
      .set(...bearer(token));
    expect(me.status).toBe(401);
    expectErrorShape(me.body, 'unauthorized');
    const again = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: 'leaving@org-a.example', password: 'a-long-password-1' });
    expect(again.status).toBe(401);
  });

  it('changes a role, and the old token stops working', async () => {
    const created = await request(t.app)
      .post('/api/users')
      .set(...bearer(t.orgA.users.admin.token))
      .send({ email: 'mover@org-a.example', name: 'Mover', role: 'electrician', password: 'a-long-password-1' });
    const token = (
      await request(t.app)
        .post('/api/auth/sign-in')
        .send({ email: 'mover@org-a.example', password: 'a-long-password-1' })
    ).body.token;
    const res = await request(t.app)
      .patch(`/api/users/${created.body.id}`)
      .set(...bearer(t.orgA.users.admin.token))
      .send({ role: 'safety' });
    expect(res.body.role).toBe('safety');
    expect(
      (
        await request(t.app)
          .get('/api/auth/me')
          .set(...bearer(token))
      ).status,
    ).toBe(401);
  });

  it('cannot touch a user of another organization (404)', async () => {
    const res = await request(t.app)
      .patch(`/api/users/${t.orgB.users.electrician.id}`)
      .set(...bearer(t.orgA.users.admin.token))
      .send({ active: false });
    expect(res.status).toBe(404);
    expectErrorShape(res.body, 'not_found');
  });
});
