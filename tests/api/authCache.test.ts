/**
 * Signed-in requests read the user and the token's revocation through a short-lived in-process cache
 * (server/auth/cache.ts). A cached answer must never outlive a change in this process: after sign-out, a password
 * change, a role change or a deactivation, the old token is refused on the very next request, however warm the cache.
 */
import request from 'supertest';
import {
  authCacheEpoch,
  cachedRevoked,
  cachedUser,
  forgetUser,
  rememberRevoked,
  rememberUser,
} from '../../server/auth/cache';
import { bearer, makeTestApp, TEST_PASSWORD, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

const me = (token: string) =>
  request(t.app)
    .get('/api/auth/me')
    .set(...bearer(token));

async function signIn(email: string, password = TEST_PASSWORD): Promise<string> {
  const res = await request(t.app).post('/api/auth/sign-in').send({ email, password });
  expect(res.status).toBe(200);
  return res.body.token as string;
}

/** Several requests in a row so the user and the token are surely in the cache. */
async function warm(token: string): Promise<void> {
  for (let i = 0; i < 3; i++) expect((await me(token)).status).toBe(200);
}

describe('the auth cache never outlives a change in this process', () => {
  it('sign-out: the token is refused at once; another session of the same user goes on', async () => {
    const a = await signIn('electrician@org-a.example');
    const b = await signIn('electrician@org-a.example');
    await warm(a);
    await warm(b);
    const out = await request(t.app)
      .post('/api/auth/sign-out')
      .set(...bearer(a));
    expect(out.status).toBe(200);
    const after = await me(a);
    expect(after.status).toBe(401);
    expect(after.body.error.message).toMatch(/signed out/);
    expect((await me(b)).status).toBe(200);
  });

  it('password change: every old token is refused at once, the new one works', async () => {
    const email = 'safety@org-a.example';
    const old1 = await signIn(email);
    const old2 = await signIn(email);
    await warm(old1);
    await warm(old2);
    const changed = await request(t.app)
      .post('/api/auth/password')
      .set(...bearer(old1))
      .send({ currentPassword: TEST_PASSWORD, newPassword: 'another-long-password-2' });
    expect(changed.status).toBe(200);
    expect((await me(old1)).status).toBe(401);
    expect((await me(old2)).status).toBe(401);
    expect((await me(changed.body.token as string)).status).toBe(200);
  });

  it('role change: the old token is refused at once; the user signs in again with the new role', async () => {
    const userId = t.orgA.users.engineer.id;
    const token = await signIn('engineer@org-a.example');
    await warm(token);
    const patch = await request(t.app)
      .patch(`/api/users/${userId}`)
      .set(...bearer(t.orgA.users.admin.token))
      .send({ role: 'safety' });
    expect(patch.status).toBe(200);
    expect((await me(token)).status).toBe(401);
    const fresh = await signIn('engineer@org-a.example');
    const who = await me(fresh);
    expect(who.status).toBe(200);
    expect(who.body.role ?? who.body.user?.role).toBe('safety');
  });

  it('deactivation: the old token is refused at once, and so is signing in', async () => {
    const userId = t.orgB.users.electrician.id;
    const token = t.orgB.users.electrician.token;
    await warm(token);
    const patch = await request(t.app)
      .patch(`/api/users/${userId}`)
      .set(...bearer(t.orgB.users.admin.token))
      .send({ active: false });
    expect(patch.status).toBe(200);
    expect((await me(token)).status).toBe(401);
    expect(
      (
        await request(t.app)
          .post('/api/auth/sign-in')
          .send({ email: 'electrician@org-b.example', password: TEST_PASSWORD })
      ).status,
    ).toBe(401);
  });

  it('a rename shows at once (the cached name is dropped too)', async () => {
    const token = t.orgB.users.safety.token;
    await warm(token);
    const patch = await request(t.app)
      .patch(`/api/users/${t.orgB.users.safety.id}`)
      .set(...bearer(t.orgB.users.admin.token))
      .send({ name: 'Renamed Safety' });
    expect(patch.status).toBe(200);
    const who = await me(token);
    expect(who.status).toBe(200);
    expect(who.body.name ?? who.body.user?.name).toBe('Renamed Safety');
  });
});

describe('a read that began before an invalidation does not store its older answer', () => {
  const user = {
    id: 'race-user',
    organizationId: 'org',
    role: 'engineer' as const,
    email: 'r@example.com',
    name: 'R',
    active: true,
    tokenVersion: 0,
  };

  it('user', () => {
    const at = authCacheEpoch();
    forgetUser('race-user'); // e.g. a deactivation committed while the read was under way
    rememberUser(user, at);
    expect(cachedUser('race-user')).toBeUndefined();
    rememberUser(user, authCacheEpoch());
    expect(cachedUser('race-user')).toEqual(user);
    forgetUser('race-user');
    expect(cachedUser('race-user')).toBeUndefined();
  });

  it('revocation: "not revoked" read before a change is not stored; "revoked" always is', () => {
    const at = authCacheEpoch();
    forgetUser();
    rememberRevoked('race-jti', false, at);
    expect(cachedRevoked('race-jti')).toBeUndefined();
    rememberRevoked('race-jti', true, at);
    expect(cachedRevoked('race-jti')).toBe(true);
  });
});
