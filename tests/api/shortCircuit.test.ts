import request from 'supertest';
import { expectClose } from '../helpers/approx';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

const model = () => ({
  format: 'emberline-model',
  version: 1,
  frequencyHz: 60,
  buses: [
    { id: 'PRI', name: 'Primary', nominalKv: 12.47 },
    { id: 'SEC', name: 'Secondary', nominalKv: 0.48 },
  ],
  sources: [{ id: 'UTIL', kind: 'utility', bus: 'PRI', shortCircuitMva: 1e6, xr: 10 }],
  transformers: [
    {
      id: 'TX',
      fromBus: 'PRI',
      toBus: 'SEC',
      kva: 1500,
      primaryKv: 12.47,
      secondaryKv: 0.48,
      impedancePct: 5.75,
      xr: 6,
    },
  ],
  cables: [],
  motors: [],
  devices: [],
});

describe('POST /api/calc/short-circuit', () => {
  it('gives the bolted fault current at every bus', async () => {
    const res = await request(t.app)
      .post('/api/calc/short-circuit')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ model: model() });
    expect(res.status).toBe(200);
    const sec = (res.body.buses as { id: string; boltedFaultKa: number }[]).find((b) => b.id === 'SEC');
    // Transformer on an (almost) infinite bus: I = I_FLA × 100/%Z (point-to-point method, transformer multiplier);
    // 1500 kVA at 480 V: I_FLA = 1804.2 A, × 100/5.75 = 31 378 A. The 10⁶ MVA source adds ~0.01 %.
    expectClose((sec?.boltedFaultKa ?? 0) * 1000, (1500e3 / (Math.sqrt(3) * 480)) * (100 / 5.75), 1e-3);
  });

  it('refuses a model with an unknown bus, naming the element and field', async () => {
    const m = model();
    m.transformers[0].toBus = 'NOPE';
    const res = await request(t.app)
      .post('/api/calc/short-circuit')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ model: m });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty(['model.transformers[0].toBus']);
    expect(res.body.error.message).toContain('NOPE');
    expect(res.body.error.message).toContain('TX');
  });

  it('names the buses of an island', async () => {
    const m = model() as ReturnType<typeof model> & { buses: { id: string; name: string; nominalKv: number }[] };
    m.buses.push({ id: 'LONELY', name: 'Nowhere', nominalKv: 0.48 });
    const res = await request(t.app)
      .post('/api/calc/short-circuit')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ model: m });
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body.error)).toContain('LONELY');
  });

  it('refuses non-physical values with the field named', async () => {
    const m = model();
    m.transformers[0].impedancePct = -2;
    const res = await request(t.app)
      .post('/api/calc/short-circuit')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ model: m });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty(['model.transformers[0].impedancePct']);
  });
});
