/**
 * The access-control matrix, generated from the route table: every route is called as every role and signed out,
 * and a user of another organization never reaches an id-addressed resource.
 */
import request from 'supertest';
import { ROLES, type Role } from '../../shared/schemas/common';
import { allRoutes } from '../../server/routes';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { bearer, makeTestApp, TEST_PASSWORD, type TestApp } from '../helpers/testApp';

let t: TestApp;
const routes = allRoutes({ signInLimitPerMinute: 1000, publicCheckPerMinute: 1000 });
const ids: Record<string, string> = {};

beforeAll(async () => {
  t = await makeTestApp();
  const eng = bearer(t.orgA.users.engineer.token);
  ids.siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...eng)
      .send({ name: 'Matrix site' })
  ).body.id;
  ids.studyId = await approveStudy(t, ids.siteId, smallModel());
  ids.deviceTypeId = (
    await request(t.app)
      .post('/api/device-types')
      .set(...eng)
      .send({
        name: 'Matrix fuse',
        definition: {
          kind: 'fuse',
          ratingA: 100,
          totalClearing: [
            [200, 10],
            [400, 1],
            [1000, 0.05],
          ],
        },
      })
  ).body.id;
  ids.userId = t.orgA.users.electrician.id;
  ids.code = (
    await request(t.app)
      .get(`/api/studies/${ids.studyId}/labels`)
      .set(...eng)
  ).body.labels[0].code;
  ids.reportId = (
    await request(t.app)
      .post(`/api/labels/${ids.code}/reports`)
      .set(...bearer(t.orgA.users.electrician.token))
      .field('kind', 'other')
      .field('text', 'Matrix report')
  ).body.id;
  const admin = bearer(t.orgA.users.admin.token);
  ids.ruleId = (
    await request(t.app)
      .post('/api/reminder-rules')
      .set(...admin)
      .send({ name: 'Matrix rule', lists: ['open-reports'], roles: ['safety'] })
  ).body.id;
  ids.invitationId = (
    await request(t.app)
      .post('/api/invitations')
      .set(...admin)
      .send({ email: 'matrix-invitee@org-a.example', name: 'Matrix invitee', role: 'engineer' })
  ).body.id;
  // Every id must be real, or the cross-organization checks below would pass on a 404 for nothing.
  for (const [name, value] of Object.entries(ids))
    if (!value || value === 'none') throw new Error(`matrix setup: no ${name}`);
});
afterAll(async () => t.close());

async function freshToken(role: Role): Promise<string> {
  const res = await request(t.app)
    .post('/api/auth/sign-in')
    .send({ email: t.orgA.users[role].email, password: TEST_PASSWORD });
  return res.body.token as string;
}

function pathWith(path: string, values: (name: string) => string): string {
  return '/api' + path.replace(/:([A-Za-z0-9_]+)/g, (_m, name: string) => encodeURIComponent(values(name)));
}

function call(method: string, path: string) {
  const r = request(t.app);
  switch (method) {
    case 'get':
      return r.get(path);
    case 'post':
      return r.post(path);
    case 'put':
      return r.put(path);
    case 'patch':
      return r.patch(path);
    default:
      return r.delete(path);
  }
}

const allowed = (access: (typeof routes)[number]['access'], role: Role) =>
  access === 'public' || access === 'signed-in' || access.includes(role);

describe.each(routes.map((r) => [`${r.method.toUpperCase()} ${r.path}`, r] as const))('%s', (_name, route) => {
  const path = pathWith(route.path, (n) => (n === 'code' ? '0000000000000000' : `no-such-${n}`));

  if (route.access !== 'public') {
    it('refuses a signed-out caller with 401', async () => {
      const res = await call(route.method, path);
      expect(res.status).toBe(401);
      expect(res.body.error.code).toBe('unauthorized');
    });
  }

  it.each(ROLES.map((r) => [r]))('as %s: allowed or 403 as the table says', async (role) => {
    // Signing out revokes the token it is called with: that route gets a token of its own.
    const token = route.path === '/auth/sign-out' ? await freshToken(role) : t.orgA.users[role].token;
    const res = await call(route.method, path)
      .set(...bearer(token))
      .send({});
    if (allowed(route.access, role)) {
      expect([401, 403]).not.toContain(res.status);
      expect(res.status).toBeLessThan(500);
    } else {
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('forbidden');
    }
  });

  if (
    /:(siteId|studyId|deviceTypeId|userId|code|ruleId|invitationId|reportId)\b/.test(route.path) &&
    route.access !== 'public'
  ) {
    it('another organization never reaches an id of this one', async () => {
      const roles = ROLES.filter((r) => allowed(route.access, r));
      for (const role of roles) {
        const res = await call(
          route.method,
          pathWith(route.path, (n) => ids[n] ?? 'x'),
        )
          .set(...bearer(t.orgB.users[role].token))
          .send({});
        // Without a valid body the request may stop at validation (400); it never succeeds and never leaks.
        expect(route.body || route.middleware ? [400, 404, 415] : [404]).toContain(res.status);
      }
    });
  }
});
