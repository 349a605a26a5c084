/**
 * The app's permission map (shared/permissions.ts) agrees with the API's route access lists, which stay the authority:
 * every capability that stands for routes holds exactly the roles of each route's access list, and every route open
 * to a list of roles belongs to one capability. A change to either side alone fails here.
 */
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
