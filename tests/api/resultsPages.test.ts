/**
 * Results in pages (GET /studies/:id/results) and one bus at a time (GET /studies/:id/results/buses/:busId) say
 * exactly what the whole stored results say — every number of every row, every trace — on the demo and on a generated
 * plant; paging edges; bad parameters are 400 naming the field. The whole results are read server-side through the
 * service (`getResults`), as the label PDFs and the report do.
 */
import request from 'supertest';
import type { BusResult, StudyResults } from '../../shared/schemas/studyResults';
import { generatedPlant } from '../../server/bench/study';
import { User } from '../../server/db/models';
import type { AuthUser } from '../../server/services/context';
import { seedDemo } from '../../server/seed/demo';
import { clearResultsCache } from '../../server/services/results';
import { getResults } from '../../server/services/runs';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

type Row = Omit<BusResult, 'cases'> & { governingArcingCurrentKa: number | null; ppeName: string };

async function modelVersion(token: string, studyId: string): Promise<number> {
  const env = await request(t.app)
    .get(`/api/studies/${studyId}/model`)
    .set(...bearer(token));
  expect(env.status).toBe(200);
  return env.body.version as number;
}

async function actorOf(userId: string): Promise<AuthUser> {
  const u = (await User.findByPk(userId))!;
  return {
    id: u.id,
    organizationId: u.organizationId,
    role: u.role,
    email: u.email,
    name: u.name,
    jti: 'test',
    tokenExpiresAt: new Date(Date.now() + 3600_000),
  };
}

/** Every row of the study, page by page, in the order asked. */
async function allPages(token: string, studyId: string, query: string, pageSize: number) {
  const rows: Row[] = [];
  let total = -1;
  let pages = 0;
  for (let page = 1; ; page++) {
    const res = await request(t.app)
      .get(`/api/studies/${studyId}/results?${query}${query ? '&' : ''}page=${page}&pageSize=${pageSize}`)
      .set(...bearer(token));
    expect(res.status).toBe(200);
    if (total < 0) ({ total, pages } = res.body);
    expect(res.body.total).toBe(total);
    expect(res.body.page).toBe(page);
    expect(res.body.pageSize).toBe(pageSize);
    expect(res.body.rows.length).toBe(Math.max(0, Math.min(pageSize, total - (page - 1) * pageSize)));
    rows.push(...res.body.rows);
    if (page >= pages) break;
  }
  expect(pages).toBe(Math.max(1, Math.ceil(total / pageSize)));
  expect(rows).toHaveLength(total);
  return { rows, total };
}

/** The row the page should show for a whole bus: the bus without its trace, plus the governing arcing current. */
function expectedRow(b: BusResult): Row {
  const { cases, ...rest } = b;
  const g = cases.find((c) => c.arcCase === b.governing?.arcCase && c.location === b.governing?.location);
  return {
    ...rest,
    governingArcingCurrentKa: g ? g.arcingCurrentKa : null,
    ppeName: b.labelValues ? (b.labelValues.ppeLevel?.name ?? 'Above every level') : 'Error',
  };
}

/** Pages and bus routes against the whole results, for one study. */
async function checkAgainstWhole(token: string, actor: AuthUser, studyId: string, pageSize: number) {
  clearResultsCache();
  const whole = (await getResults(actor, studyId)).results as StudyResults;
  expect(whole.buses.length).toBeGreaterThan(0);

  // Default order: bus id; every number the same as the whole results.
  const { rows, total } = await allPages(token, studyId, '', pageSize);
  expect(total).toBe(whole.buses.length);
  const byId = [...whole.buses].sort((a, b) => (a.busId < b.busId ? -1 : 1));
  expect(rows.map((r) => r.busId)).toEqual(byId.map((b) => b.busId));
  rows.forEach((r, i) => {
    expect(r).toMatchObject(expectedRow(byId[i]));
    expect((r as { cases?: unknown }).cases).toBeUndefined();
  });

  // Energy, highest first (ties by bus id); buses without energy first.
  const energy = (await allPages(token, studyId, 'sort=energy', pageSize)).rows;
  const e = (b: { incidentEnergyCalPerCm2?: number }) => b.incidentEnergyCalPerCm2 ?? Infinity;
  const expectedEnergy = [...whole.buses].sort((a, b) => e(b) - e(a) || (a.busId < b.busId ? -1 : 1));
  expect(energy.map((r) => r.busId)).toEqual(expectedEnergy.map((b) => b.busId));
  const energyAsc = (await allPages(token, studyId, 'sort=energy&order=asc', pageSize)).rows;
  for (let i = 1; i < energyAsc.length; i++) expect(e(energyAsc[i])).toBeGreaterThanOrEqual(e(energyAsc[i - 1]));

  // Filters: an energy band (more than min, at most max), PPE level, warnings, errors.
  const band = (await allPages(token, studyId, 'minCal=1.2&maxCal=8', pageSize)).rows;
  expect(band.map((r) => r.busId).sort()).toEqual(
    whole.buses
      .filter(
        (b) =>
          b.incidentEnergyCalPerCm2 !== undefined && b.incidentEnergyCalPerCm2 > 1.2 && b.incidentEnergyCalPerCm2 <= 8,
      )
      .map((b) => b.busId)
      .sort(),
  );
  const withWarnings = (await allPages(token, studyId, 'warnings=true', pageSize)).rows;
  expect(withWarnings.map((r) => r.busId).sort()).toEqual(
    whole.buses
      .filter((b) => b.warnings.length > 0)
      .map((b) => b.busId)
      .sort(),
  );
  const withErrors = (await allPages(token, studyId, 'errors=true', pageSize)).rows;
  expect(withErrors.map((r) => r.busId).sort()).toEqual(
    whole.buses
      .filter((b) => b.status === 'error')
      .map((b) => b.busId)
      .sort(),
  );

  // The summary counts the whole study, whatever the filter or page.
  const first = await request(t.app)
    .get(`/api/studies/${studyId}/results?warnings=true&pageSize=1`)
    .set(...bearer(token));
  const s = first.body.summary;
  expect(s.buses).toBe(whole.buses.length);
  expect(s.errors).toBe(whole.buses.filter((b) => b.status === 'error').length);
  expect(s.ok + s.errors).toBe(whole.buses.length);
  expect(s.withWarnings).toBe(whole.buses.filter((b) => b.warnings.length > 0).length);
  expect(s.maxIncidentEnergyCalPerCm2).toBe(Math.max(...whole.buses.map((b) => b.incidentEnergyCalPerCm2 ?? -1)));
  expect(s.bySignalWord.DANGER).toBe(whole.buses.filter((b) => b.labelValues?.signalWord === 'DANGER').length);
  expect(s.bySignalWord.WARNING).toBe(whole.buses.filter((b) => b.labelValues?.signalWord === 'WARNING').length);
  for (const { name, count } of s.byPpeLevel as { name: string; count: number }[]) {
    expect(count).toBe(whole.buses.filter((b) => expectedRow(b).ppeName === name).length);
    const ppe = (await allPages(token, studyId, `ppe=${encodeURIComponent(name)}`, pageSize)).rows;
    expect(ppe).toHaveLength(count);
  }
  expect((s.byPpeLevel as { count: number }[]).reduce((a, p) => a + p.count, 0)).toBe(whole.buses.length);
  expect(first.body.study.maxArcDurationMs).toBe(whole.maxArcDurationMs);
  expect(first.body.study.warnings).toEqual(whole.warnings);

  // Every bus alone: the whole trace, exactly.
  for (const b of whole.buses) {
    const res = await request(t.app)
      .get(`/api/studies/${studyId}/results/buses/${encodeURIComponent(b.busId)}`)
      .set(...bearer(token));
    expect(res.status).toBe(200);
    expect(res.body.bus).toEqual(b);
    const named = new Set(b.cases.flatMap((c) => c.devices.map((d) => d.deviceId)));
    expect(new Set((res.body.devices as { id: string }[]).map((d) => d.id))).toEqual(named);
  }
  return whole;
}

describe('results in pages and one bus at a time', () => {
  it('the demo: every page and every bus equal the whole results', async () => {
    const seeded = await seedDemo(t.ctx, 'demo-password-123');
    const signIn = await request(t.app)
      .post('/api/auth/sign-in')
      .send({ email: 'engineer@larkspur.example', password: 'demo-password-123' });
    const token = signIn.body.token as string;
    await checkAgainstWhole(token, await actorOf(signIn.body.user.id), seeded.studyId, 2);
  }, 120_000);

  let genStudy = '';
  it('a generated plant (3 substations and 120 MCC buses labelled): every page and every bus equal the whole results', async () => {
    const eng = t.orgA.users.engineer;
    const site = await request(t.app)
      .post('/api/sites')
      .set(...bearer(eng.token))
      .send({ name: 'Generated plant' });
    const study = await request(t.app)
      .post(`/api/sites/${site.body.id}/studies`)
      .set(...bearer(eng.token))
      .send({ title: 'Generated' });
    genStudy = study.body.id;
    const put = await request(t.app)
      .put(`/api/studies/${genStudy}/model`)
      .set(...bearer(eng.token))
      .send({ model: generatedPlant(3, 40), version: await modelVersion(eng.token, genStudy) });
    expect(put.status).toBe(200);
    expect(
      (
        await request(t.app)
          .post(`/api/studies/${genStudy}/run`)
          .set(...bearer(eng.token))
      ).status,
    ).toBe(202);
    await t.ctx.jobs.idle();
    const whole = await checkAgainstWhole(eng.token, await actorOf(eng.id), genStudy, 50);
    // The 12.47 kV service bus has no equipment and no label: 3 + 3 × 40 labelled buses.
    expect(whole.buses).toHaveLength(123);
  }, 180_000);

  it('paging edges: the last page, a page past the end, a filter that matches nothing', async () => {
    const token = t.orgA.users.engineer.token;
    const get = (q: string) =>
      request(t.app)
        .get(`/api/studies/${genStudy}/results?${q}`)
        .set(...bearer(token));
    const last = await get('page=3&pageSize=50');
    expect(last.status).toBe(200);
    expect(last.body.rows).toHaveLength(23);
    expect(last.body.pages).toBe(3);
    const past = await get('page=4&pageSize=50');
    expect(past.status).toBe(200);
    expect(past.body.rows).toEqual([]);
    expect(past.body.total).toBe(123);
    const exact = await get('page=1&pageSize=123');
    expect(exact.body.rows).toHaveLength(123);
    expect(exact.body.pages).toBe(1);
    const defaults = await get('');
    expect(defaults.body.pageSize).toBe(50);
    expect(defaults.body.rows).toHaveLength(50);
    for (const q of ['ppe=No%20such%20level', 'minCal=100000', 'scenarioId=not-yet', 'minCal=8&maxCal=1.2']) {
      const none = await get(q);
      expect(none.status).toBe(200);
      expect(none.body.rows).toEqual([]);
      expect(none.body.total).toBe(0);
      expect(none.body.pages).toBe(1);
      expect(none.body.summary.buses).toBe(123);
    }
  });

  it('bad parameters: 400 naming the field; an unknown bus: 404', async () => {
    const token = t.orgA.users.engineer.token;
    const get = (q: string) =>
      request(t.app)
        .get(`/api/studies/${genStudy}/results${q}`)
        .set(...bearer(token));
    const cases: [string, string][] = [
      ['?sort=voltage', 'sort'],
      ['?sort=energy&order=up', 'order'],
      ['?pageSize=501', 'pageSize'],
      ['?pageSize=0', 'pageSize'],
      ['?page=0', 'page'],
      ['?page=1.5', 'page'],
      ['?minCal=-1', 'minCal'],
      ['?maxCal=lots', 'maxCal'],
      ['?warnings=yes', 'warnings'],
      ['?errors=1', 'errors'],
    ];
    for (const [q, field] of cases) {
      const res = await get(q);
      expect([q, res.status]).toEqual([q, 400]);
      expect(Object.keys(res.body.error.fields ?? {})).toContain(field);
      expect(res.body.error.message).toContain(field);
    }
    const unknown = await get('/buses/NO-SUCH-BUS');
    expect(unknown.status).toBe(404);
    // Cold cache too: the run is read and the bus is still not there.
    clearResultsCache();
    expect((await get('/buses/NO-SUCH-BUS')).status).toBe(404);
    expect((await get('/buses/MCC-0-0')).status).toBe(200);
  });
});

describe('large models', () => {
  it('a 10 000-bus model (about 5.5 MB) is saved with PUT; other routes keep the small body limit', async () => {
    const eng = t.orgA.users.engineer;
    const site = await request(t.app)
      .post('/api/sites')
      .set(...bearer(eng.token))
      .send({ name: 'Large plant' });
    const study = await request(t.app)
      .post(`/api/sites/${site.body.id}/studies`)
      .set(...bearer(eng.token))
      .send({ title: 'Large' });
    const model = generatedPlant(101, 98);
    expect(model.buses!.length).toBeGreaterThanOrEqual(10_000);
    const version = await modelVersion(eng.token, study.body.id);
    const body = JSON.stringify({ model, version });
    expect(body.length).toBeGreaterThan(2 * 1024 * 1024);

    // Nobody signed in: refused before the body is read.
    const anonymous = await request(t.app)
      .put(`/api/studies/${study.body.id}/model`)
      .set('Content-Type', 'application/json')
      .send(body);
    expect(anonymous.status).toBe(401);

    const put = await request(t.app)
      .put(`/api/studies/${study.body.id}/model`)
      .set(...bearer(eng.token))
      .set('Content-Type', 'application/json')
      .send(body);
    expect(put.status).toBe(200);
    expect(put.body.version).toBe(version + 1);
    expect((put.body.model.buses as unknown[]).length).toBe(model.buses!.length);

    // The same bytes to a route without its own limit: 413.
    const other = await request(t.app)
      .post('/api/sites')
      .set(...bearer(eng.token))
      .set('Content-Type', 'application/json')
      .send(JSON.stringify({ name: 'x', description: 'y'.repeat(3 * 1024 * 1024) }));
    expect(other.status).toBe(413);

    // The depth guard still applies on the large-body route.
    const deep = await request(t.app)
      .put(`/api/studies/${study.body.id}/model`)
      .set(...bearer(eng.token))
      .set('Content-Type', 'application/json')
      .send(`{"model":${'['.repeat(100)}${']'.repeat(100)},"version":1}`);
    expect(deep.status).toBe(400);
    expect(deep.body.error.fields).toHaveProperty('body');
  }, 120_000);
});
