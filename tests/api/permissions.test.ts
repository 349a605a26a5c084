/**
 * The app's permission map (shared/permissions.ts) agrees with the API's route access lists, which stay the authority:
 * every capability that stands for routes holds exactly the roles of each route's access list, and every route open
 * to a list of roles belongs to one capability. A change to either side alone fails here. The app's own capabilities
 * that stand for what the server shows a role (every field report, unapproved revisions) are checked against what the
 * API answers each role.
 */
import request from 'supertest';
import { allRoutes } from '../../server/routes';
import {
  CAPABILITIES,
  CAPABILITY_ROUTES,
  PERMISSIONS,
  can,
  rolesThatCan,
  type Capability,
} from '../../shared/permissions';
import { ROLES, type Role } from '../../shared/schemas/common';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

const routes = allRoutes({ signInLimitPerMinute: 1000, publicCheckPerMinute: 1000 });
const key = (r: { method: string; path: string }) => `${r.method.toUpperCase()} ${r.path}`;
const byKey = new Map(routes.map((r) => [key(r), r]));
const sorted = (roles: readonly Role[]) => [...roles].sort();

describe('permission map and route access lists', () => {
  const bound = Object.entries(CAPABILITY_ROUTES) as [Capability, readonly string[]][];

  it('names only routes that exist', () => {
    const missing = bound.flatMap(([cap, keys]) => keys.filter((k) => !byKey.has(k)).map((k) => `${cap}: ${k}`));
    expect(missing).toEqual([]);
  });

  it.each(bound)('%s holds exactly the roles of each of its routes', (cap, keys) => {
    for (const k of keys) {
      const access = byKey.get(k)?.access;
      expect({ route: k, roles: Array.isArray(access) ? sorted(access) : access }).toEqual({
        route: k,
        roles: sorted(PERMISSIONS[cap]),
      });
    }
  });

  it('every route open to a list of roles belongs to exactly one capability', () => {
    const owners = new Map<string, Capability[]>();
    for (const [cap, keys] of bound) for (const k of keys) owners.set(k, [...(owners.get(k) ?? []), cap]);
    const problems = routes
      .filter((r) => Array.isArray(r.access))
      .map(key)
      .filter((k) => owners.get(k)?.length !== 1)
      .map((k) => `${k}: ${owners.get(k)?.join(', ') ?? 'no capability'}`);
    expect(problems).toEqual([]);
  });

  it('a public or signed-in route is never claimed by a capability (the map would narrow it)', () => {
    const open = bound.flatMap(([cap, keys]) =>
      keys.filter((k) => byKey.has(k) && !Array.isArray(byKey.get(k)?.access)).map((k) => `${cap}: ${k}`),
    );
    expect(open).toEqual([]);
  });
});

describe('can()', () => {
  it('answers from the map for every role and capability', () => {
    for (const cap of CAPABILITIES)
      for (const role of ROLES)
        expect([cap, role, can(role, cap)]).toEqual([cap, role, PERMISSIONS[cap].includes(role as never)]);
  });

  it('rolesThatCan lists the roles in the order of ROLES', () => {
    expect(rolesThatCan('viewAudit')).toEqual(['admin', 'engineer', 'safety']);
    expect(rolesThatCan('manageUsers')).toEqual(['admin']);
  });

  it('every capability is held by at least one role and names only known roles', () => {
    for (const cap of CAPABILITIES) {
      expect(PERMISSIONS[cap].length).toBeGreaterThan(0);
      for (const r of PERMISSIONS[cap]) expect(ROLES).toContain(r);
    }
  });
});

describe("the app's capabilities that mirror what the API shows each role", () => {
  let t: TestApp;
  let siteId: string;
  let draftId: string;
  const reportIds: Partial<Record<Role, string>> = {};

  beforeAll(async () => {
    t = await makeTestApp();
    const eng = bearer(t.orgA.users.engineer.token);
    siteId = (
      await request(t.app)
        .post('/api/sites')
        .set(...eng)
        .send({ name: 'Permission site' })
    ).body.id;
    const approvedId = await approveStudy(t, siteId, smallModel());
    draftId = (
      await request(t.app)
        .post(`/api/studies/${approvedId}/revise`)
        .set(...eng)
    ).body.id;
    const code = (
      await request(t.app)
        .get(`/api/studies/${approvedId}/labels`)
        .set(...eng)
    ).body.labels[0].code;
    for (const role of ['electrician', 'engineer'] as const) {
      const res = await request(t.app)
        .post(`/api/labels/${code}/reports`)
        .set(...bearer(t.orgA.users[role].token))
        .field('kind', 'other')
        .field('text', `Report by the ${role}`);
      reportIds[role] = res.body.id;
    }
    // Every id must be real, or the checks below would compare nothing.
    for (const id of [siteId, approvedId, draftId, reportIds.electrician, reportIds.engineer])
      if (typeof id !== 'string' || !id) throw new Error('permission setup failed');
  });
  afterAll(async () => t.close());

  it.each(ROLES)('as %s: a draft revision is listed exactly when the role can seeUnapprovedStudies', async (role) => {
    const res = await request(t.app)
      .get(`/api/sites/${siteId}/studies`)
      .set(...bearer(t.orgA.users[role].token));
    expect(res.status).toBe(200);
    const ids = (res.body.studies as { id: string }[]).map((s) => s.id);
    expect(ids.includes(draftId)).toBe(can(role, 'seeUnapprovedStudies'));
  });

  it.each(ROLES)(
    "as %s: another person's field report is listed exactly when the role can seeAllFieldReports",
    async (role) => {
      const res = await request(t.app)
        .get('/api/field-reports')
        .set(...bearer(t.orgA.users[role].token));
      expect(res.status).toBe(200);
      const ids = (res.body.reports as { id: string }[]).map((r) => r.id);
      const others = Object.entries(reportIds)
        .filter(([by]) => by !== role)
        .map(([, id]) => id);
      expect(others.every((id) => ids.includes(id!))).toBe(can(role, 'seeAllFieldReports'));
      expect(others.some((id) => ids.includes(id!))).toBe(can(role, 'seeAllFieldReports'));
    },
  );
});
