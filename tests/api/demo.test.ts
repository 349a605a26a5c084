import request from 'supertest';
import { seedDemo } from '../../server/seed/demo';
import { makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

describe('the invented demo', () => {
  it('seeds a site whose model runs, with one approved revision and plausible results', async () => {
    const seeded = await seedDemo(t.ctx, 'demo-password-123');
    const token = (
      await request(t.app)
        .post('/api/auth/sign-in')
        .send({ email: 'electrician@larkspur.example', password: 'demo-password-123' })
    ).body.token;
    const studies = await request(t.app)
      .get(`/api/sites/${seeded.siteId}/studies`)
      .set('Authorization', `Bearer ${token}`);
    expect(studies.body.studies.map((s: { status: string }) => s.status)).toEqual(['approved']);
    const results = await request(t.app)
      .get(`/api/studies/${seeded.studyId}/results?pageSize=500`)
      .set('Authorization', `Bearer ${token}`);
    expect(results.body.total).toBe(results.body.summary.buses);
    const buses = results.body.rows as {
      busId: string;
      status: string;
      incidentEnergyCalPerCm2: number;
      warnings: { code: string }[];
    }[];
    expect(buses.every((b) => b.status === 'ok')).toBe(true);
    // Plausible ranges for such a plant (common practice, no source): every labelled bus between 0.1 and 100 cal/cm².
    for (const b of buses) expect(b.incidentEnergyCalPerCm2).toBeGreaterThan(0.1);
    for (const b of buses) expect(b.incidentEnergyCalPerCm2).toBeLessThan(100);
    // A few warnings worth reading: the 208 V panel below 2 kA (IEEE 1584-2018 sustainable-arc note).
    expect(buses.find((b) => b.busId === 'LP-1')!.warnings.map((w) => w.code)).toContain('SUSTAINABLE_ARC_UNLIKELY');
    const equipment = await request(t.app)
      .get(`/api/sites/${seeded.siteId}/equipment`)
      .set('Authorization', `Bearer ${token}`);
    expect(equipment.body.equipment).toHaveLength(buses.length);
  });

  it('gives the safety officer something to look at: a review coming due, a label not installed, open reports', async () => {
    const token = (
      await request(t.app)
        .post('/api/auth/sign-in')
        .send({ email: 'safety@larkspur.example', password: 'demo-password-123' })
    ).body.token;
    const res = await request(t.app).get('/api/attention').set('Authorization', `Bearer ${token}`);
    expect(res.status).toBe(200);
    expect(res.body.counts).toMatchObject({
      'review-overdue': 0,
      'review-due-30': 0,
      'review-due-90': 1,
      'not-installed': 1,
      'open-reports': 2,
      'superseded-installed': 0,
      'stale-studies': 0,
    });
    // Every site is listed: the facility, the pump station and the solids handling building (draft study).
    expect(res.body.sites).toHaveLength(3);
    // Reminder rules are in place from the start, so nobody has to remember to send anything.
    const rules = await request(t.app).get('/api/reminder-rules').set('Authorization', `Bearer ${token}`);
    expect(rules.body.rules.length).toBeGreaterThan(0);
  });

  it('seeds a third site whose draft study is run in four operating scenarios, each label from the worst', async () => {
    const token = (
      await request(t.app)
        .post('/api/auth/sign-in')
        .send({ email: 'engineer@larkspur.example', password: 'demo-password-123' })
    ).body.token;
    const auth = { Authorization: `Bearer ${token}` };
    const sites = (await request(t.app).get('/api/sites').set(auth)).body.sites as { id: string; name: string }[];
    const solids = sites.find((s) => s.name === 'Larkspur Valley Solids Handling Building');
    expect(solids).toBeDefined();
    const studies = (await request(t.app).get(`/api/sites/${solids!.id}/studies`).set(auth)).body.studies as {
      id: string;
      status: string;
    }[];
    expect(studies.map((s) => s.status)).toEqual(['draft']);
    const results = await request(t.app).get(`/api/studies/${studies[0].id}/results?pageSize=500`).set(auth);
    expect(results.status).toBe(200);
    expect(results.body.run.message).toMatch(/4 operating scenarios/);
    const rows = results.body.rows as { busId: string; scenarioId: string | null }[];
    expect(rows.length).toBe(3);
    // Hand-worked in tests/engine/study-scenarios.test.ts: at 15 MVA the mains' short-time pickup is not reached.
    expect(rows.find((r) => r.busId === 'SH-A')!.scenarioId).toBe('util-min');
  });
});
