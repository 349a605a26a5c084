/**
 * Issue 16 (critical): no band or plot range, however absurd, may make the server loop without end. Each request
 * runs beside a health probe and under a short timeout; a hang would fail the test by timeout (or freeze the
 * worker, which the runner reports) instead of passing.
 * The limits (currents 1e-3…1e7 A or …1e5 × rating, times 1e-3…1e5 s, 500 points, 10 decades per plot) are
 * common practice, no source: published curves span roughly 0.01–1000 s.
 */
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { DeviceType } from '../../server/db/models';
import { bandCurves } from '../../server/engine/trip';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

jest.setTimeout(15_000);

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

const band = (min: [number, number][], max: [number, number][], currentUnit = 'ampere') => ({
  kind: 'band',
  ratingA: 100,
  currentUnit,
  min,
  max,
});

/** Runs a request beside a health probe; both must answer (the probe with 200). Latency is logged only. */
async function withHealthProbe<T>(work: () => Promise<T>): Promise<T> {
  const started = Date.now();
  const [result, health] = await Promise.all([work(), request(t.app).get('/api/health')]);
  expect(health.status).toBe(200);
  console.log(`request + health probe answered in ${Date.now() - started} ms`);
  return result;
}

describe('plot ranges are bounded', () => {
  it('refuses fromA 1e-200 … toA 1e200 with a 400 naming both fields', async () => {
    const res = await withHealthProbe(() =>
      request(t.app)
        .post('/api/calc/band-curves')
        .set(...bearer(t.orgA.users.electrician.token))
        .send({ device: band([[100, 10]], [[100, 20]]), fromA: 1e-200, toA: 1e200 }),
    );
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['fromA', 'toA']));
  });

  it('refuses a range of more than 10 decades, naming toA', async () => {
    const res = await request(t.app)
      .post('/api/calc/band-curves')
      .set(...bearer(t.orgA.users.safety.token))
      .send({ device: band([[100, 10]], [[100, 20]]), fromA: 1e-3, toA: 1e9 });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toContain('toA');
  });

  it('refuses toA not above fromA, naming toA', async () => {
    const res = await request(t.app)
      .post('/api/calc/band-curves')
      .set(...bearer(t.orgA.users.safety.token))
      .send({ device: band([[100, 10]], [[100, 20]]), fromA: 1000, toA: 10 });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toContain('toA');
  });

  it('still plots an ordinary band over a sensible range', async () => {
    const res = await request(t.app)
      .post('/api/calc/band-curves')
      .set(...bearer(t.orgA.users.electrician.token))
      .send({
        device: band(
          [
            [200, 50],
            [1000, 1],
          ],
          [
            [200, 100],
            [1000, 2],
          ],
        ),
        fromA: 100,
        toA: 10_000,
      });
    expect(res.status).toBe(200);
    expect(res.body.max.length).toBeGreaterThan(10);
  });

  it('the engine bounds its own work for input that never went through the schemas', () => {
    // A multiple-of-rating band on an absurd rating: its corners lie far outside any plot.
    const device = {
      kind: 'band' as const,
      ratingA: 1e300,
      currentUnit: 'multiple' as const,
      min: [
        [1e-300, 300],
        [2, 1],
      ] as [number, number][],
      max: [
        [1e-300, 300],
        [3, 1],
      ] as [number, number][],
    };
    const r = bandCurves(device);
    expect(Number.isFinite(r.fromA) && Number.isFinite(r.toA)).toBe(true);
    expect(r.min.length + r.max.length).toBeLessThan(5000);
    expect(() => bandCurves(device, { fromA: 1e-200, toA: 1e200 })).toThrow(/decades|fromA|toA/);
  });
});

describe('band data has realistic limits', () => {
  const post = (definition: unknown) =>
    request(t.app)
      .post('/api/device-types')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ name: 'Abuse', definition });

  it('refuses a point at [1e-300, 300], naming the point', async () => {
    const res = await withHealthProbe(() =>
      post(
        band(
          [
            [1e-300, 300],
            [10, 1],
          ],
          [
            [1e-300, 300],
            [20, 1],
          ],
        ),
      ),
    );
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(
      expect.arrayContaining(['definition.min[0][0]', 'definition.max[0][0]']),
    );
  });

  it('refuses times outside 1e-3 … 1e5 s and more than 500 points', async () => {
    const slow = await post(band([[10, 1e6]], [[10, 2e6]]));
    expect(slow.status).toBe(400);
    expect(Object.keys(slow.body.error.fields)).toContain('definition.min[0][1]');
    const many: [number, number][] = Array.from({ length: 501 }, (_, i) => [100 + i, 10]);
    const long = await post(band(many, many));
    expect(long.status).toBe(400);
    expect(Object.keys(long.body.error.fields)).toContain('definition.min');
  });

  it('refuses a multiple of rating above 1e5 but takes the same number in amperes', async () => {
    const multiple = await post(band([[2e5, 1]], [[2e5, 2]], 'multiple'));
    expect(multiple.status).toBe(400);
    expect(Object.keys(multiple.body.error.fields)).toContain('definition.min[0][0]');
    const ampere = await post(band([[2e5, 1]], [[2e5, 2]], 'ampere'));
    expect(ampere.status).toBe(201);
  });

  it('the CSV upload refuses values outside the limits, naming the line', async () => {
    const csv = 'current,min_s,max_s\n1e-300,300,300\n10,1,2\n20,0.5,1e9\n';
    const res = await withHealthProbe(() =>
      request(t.app)
        .post('/api/device-types/parse-band-csv')
        .set(...bearer(t.orgA.users.engineer.token))
        .attach('file', Buffer.from(csv), { filename: 'band.csv', contentType: 'text/csv' }),
    );
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['line 2', 'line 4']));
  });

  it('the CSV upload refuses more than 500 points', async () => {
    const rows = Array.from({ length: 501 }, (_, i) => `${100 + i},1,2`);
    const res = await request(t.app)
      .post('/api/device-types/parse-band-csv')
      .set(...bearer(t.orgA.users.engineer.token))
      .attach('file', Buffer.from(`current,min_s,max_s\n${rows.join('\n')}\n`), {
        filename: 'band.csv',
        contentType: 'text/csv',
      });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/at most 500/);
  });

  it('a stored row from before the limits reads clamped and plots without hanging', async () => {
    const id = randomUUID();
    await DeviceType.create({
      id,
      organizationId: t.orgA.id,
      name: 'Old row',
      kind: 'band',
      definition: JSON.stringify(
        band(
          [
            [1e-300, 300],
            [1e-200, 250],
            [10, 1],
          ],
          [
            [1e-300, 300],
            [20, 1],
          ],
        ),
      ),
    });
    const got = await withHealthProbe(() =>
      request(t.app)
        .get(`/api/device-types/${id}`)
        .set(...bearer(t.orgA.users.electrician.token)),
    );
    expect(got.status).toBe(200);
    // Clamped to the lowest current 1e-3 A; the second point collapses onto it and is dropped.
    expect(got.body.definition.min).toEqual([
      [1e-3, 300],
      [10, 1],
    ]);
    const list = await request(t.app)
      .get('/api/device-types')
      .set(...bearer(t.orgA.users.electrician.token));
    expect(list.status).toBe(200);
    const plot = await withHealthProbe(() =>
      request(t.app)
        .post('/api/calc/band-curves')
        .set(...bearer(t.orgA.users.electrician.token))
        .send({ device: got.body.device }),
    );
    expect(plot.status).toBe(200);
    expect(plot.body.fromA).toBeGreaterThanOrEqual(1e-3);
    expect(plot.body.max.length).toBeLessThan(1000);
  });
});
