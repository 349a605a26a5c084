import request from 'supertest';
import { expectClose } from '../helpers/approx';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

const ie480 = (boltedFaultKa: number) => ({
  voltageV: 480,
  boltedFaultKa,
  electrodeConfig: 'VCB',
  gapMm: 25,
  workingDistanceMm: 457.2,
  enclosureMm: { height: 508, width: 508, depth: 508 },
  arcDurationMs: 50,
});

describe('POST /api/calc/incident-energy', () => {
  it('returns the contract shape and the published 480 V check values', async () => {
    const res = await request(t.app)
      .post('/api/calc/incident-energy')
      .set(...bearer(t.orgA.users.electrician.token))
      .send(ie480(20));
    expect(res.status).toBe(200);
    for (const key of [
      'arcingCurrentKa',
      'varCf',
      'enclosureCorrectionFactor',
      'cases',
      'governingCase',
      'incidentEnergyCalPerCm2',
      'incidentEnergyJPerCm2',
      'arcFlashBoundaryMm',
      'warnings',
    ]) {
      expect(res.body).toHaveProperty(key);
    }
    expect(res.body.cases.full).toEqual(
      expect.objectContaining({
        arcDurationMs: 50,
        incidentEnergyJPerCm2: expect.any(Number),
        incidentEnergyCalPerCm2: expect.any(Number),
        arcFlashBoundaryMm: expect.any(Number),
      }),
    );
    // Published 480 V trade-article check of IEEE 1584-2018: 20 kA, VCB, 25 mm, 18 in, 3 cycles → 1.81 cal/cm² (1 %).
    expectClose(res.body.incidentEnergyCalPerCm2, 1.81, 0.01);
    // 1 cal = 4.184 J (IEEE 1584-2018 units).
    expectClose(res.body.incidentEnergyJPerCm2, res.body.incidentEnergyCalPerCm2 * 4.184, 1e-9);
    // Label values under the default organization settings: 1.81 cal/cm² → rounds up to 2 (common practice, no source).
    expect(res.body.labelValues.minimumArcRatingCalPerCm2).toBe(2);
    expect(res.body.labelValues.signalWord).toBe('WARNING');
    expect(res.body.labelValues.ppeLevel.name).toBe('PPE level 1');
  });

  it('takes two clearing times and says which case governs', async () => {
    const body = { ...ie480(20), arcDurationMs: undefined, clearingMs: { full: 50, reduced: 500 } };
    const res = await request(t.app)
      .post('/api/calc/incident-energy')
      .set(...bearer(t.orgA.users.engineer.token))
      .send(body);
    expect(res.status).toBe(200);
    expect(res.body.cases.reduced.arcDurationMs).toBe(500);
    // Ten times the duration at a slightly lower current: the reduced case governs (energy ∝ T, IEEE 1584-2018 Eq. 6).
    expect(res.body.governingCase).toBe('reduced');
  });

  it('uses the organization PPE levels and signal-word rule, at once after they change', async () => {
    // Read (and kept in the settings cache) before the change: the change must drop it.
    const before = await request(t.app)
      .post('/api/calc/incident-energy')
      .set(...bearer(t.orgB.users.engineer.token))
      .send(ie480(20));
    expect(before.body.labelValues.ppeLevel.name).toBe('PPE level 1');
    const settings = {
      reviewIntervalMonths: 36,
      signalWord: { dangerAboveCalPerCm2: 1.5 },
      ppeLevels: [
        { name: 'Everyday', maxCalPerCm2: 1.2 },
        { name: 'Switching suit', maxCalPerCm2: 12 },
      ],
    };
    const put = await request(t.app)
      .put('/api/organization/settings')
      .set(...bearer(t.orgB.users.admin.token))
      .send(settings);
    expect(put.status).toBe(200);
    const res = await request(t.app)
      .post('/api/calc/incident-energy')
      .set(...bearer(t.orgB.users.engineer.token))
      .send(ie480(20));
    expect(res.body.labelValues.ppeLevel.name).toBe('Switching suit');
    expect(res.body.labelValues.signalWord).toBe('DANGER');
    // The other organization still has the defaults.
    const a = await request(t.app)
      .post('/api/calc/incident-energy')
      .set(...bearer(t.orgA.users.engineer.token))
      .send(ie480(20));
    expect(a.body.labelValues.ppeLevel.name).toBe('PPE level 1');
  });

  it('refuses a voltage outside 208 V–15 kV with 422 (IEEE 1584-2018 range of the model)', async () => {
    const res = await request(t.app)
      .post('/api/calc/incident-energy')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ ...ie480(20), voltageV: 16_000 });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('unprocessable');
    expect(res.body.error.fields).toHaveProperty('voltageV');
  });

  it('warns when the working distance is below the model range and when the arc is capped', async () => {
    const res = await request(t.app)
      .post('/api/calc/incident-energy')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ ...ie480(20), workingDistanceMm: 250, arcDurationMs: 3000 });
    expect(res.status).toBe(200);
    const codes = (res.body.warnings as { code: string }[]).map((w) => w.code);
    expect(codes).toEqual(expect.arrayContaining(['WORKING_DISTANCE_BELOW_MODEL', 'ARC_DURATION_CAPPED']));
    // IEEE 1584-2018 2 s guidance: the default cap is 2000 ms.
    expect(res.body.cases.full.arcDurationMs).toBe(2000);
  });

  it.each([
    [{}, 'voltageV'],
    [{ voltageV: 'high' }, 'voltageV'],
    [{ boltedFaultKa: -3 }, 'boltedFaultKa'],
    [{ gapMm: null }, 'gapMm'],
    [{ electrodeConfig: 'XYZ' }, 'electrodeConfig'],
    [{ arcDurationMs: undefined }, 'arcDurationMs'],
  ])('a bad body %j → 400 naming %s', async (patch, field) => {
    const body = Object.keys(patch).length ? { ...ie480(20), ...patch } : {};
    const res = await request(t.app)
      .post('/api/calc/incident-energy')
      .set(...bearer(t.orgA.users.engineer.token))
      .send(body);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty(field);
  });

  it('needs a signed-in user', async () => {
    const res = await request(t.app).post('/api/calc/incident-energy').send(ie480(20));
    expect(res.status).toBe(401);
  });
});

describe('POST /api/calc/clearing-time', () => {
  it('reads an IEEE very inverse relay plus its breaker', async () => {
    // IEEE C37.112-2018 very inverse: t = TD·(19.61/(M²−1) + 0.491); M = 5, TD = 1 → 1.30808 s; plus 5 cycles at 60 Hz.
    const res = await request(t.app)
      .post('/api/calc/clearing-time')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({
        device: { kind: 'relay', curve: 'IEEE-VI', pickupA: 400, timeDial: 1, breakerCycles: 5 },
        currentA: 2000,
      });
    expect(res.status).toBe(200);
    expect(res.body.region).toBe('inverse-time');
    expectClose(res.body.minimumTimeS, 19.61 / 24 + 0.491, 1e-6);
    expectClose(res.body.clearingTimeS, 19.61 / 24 + 0.491 + 5 / 60, 1e-6);
  });

  it('reads a digitized band given in multiples of rating', async () => {
    const device = {
      kind: 'band',
      ratingA: 100,
      currentUnit: 'multiple',
      min: [
        [2, 50],
        [10, 2],
      ],
      max: [
        [2, 100],
        [10, 4],
      ],
    };
    const res = await request(t.app)
      .post('/api/calc/clearing-time')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ device, currentA: 1000 });
    expect(res.status).toBe(200);
    // At a published point the log-log interpolation is exact (10 × 100 A → 4 s max, 2 s min).
    expectClose(res.body.clearingTimeS, 4, 1e-9);
    expectClose(res.body.minimumTimeS, 2, 1e-9);
  });

  it('says when the current is below pickup', async () => {
    const res = await request(t.app)
      .post('/api/calc/clearing-time')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({
        device: { kind: 'relay', curve: 'IEC-SI', pickupA: 400, timeDial: 0.1, breakerCycles: 3 },
        currentA: 300,
      });
    expect(res.status).toBe(200);
    expect(res.body.region).toBe('no-trip');
    expect(res.body.clearingTimeS).toBeNull();
  });

  it('refuses unsorted points, naming the field', async () => {
    const device = {
      kind: 'fuse',
      ratingA: 100,
      totalClearing: [
        [1000, 1],
        [500, 10],
      ],
    };
    const res = await request(t.app)
      .post('/api/calc/clearing-time')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ device, currentA: 800 });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).join(' ')).toContain('device.totalClearing');
  });

  it('refuses an unknown kind', async () => {
    const res = await request(t.app)
      .post('/api/calc/clearing-time')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ device: { kind: 'crystal-ball' }, currentA: 800 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty(['device.kind']);
  });
});
