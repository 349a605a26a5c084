import request from 'supertest';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

const tripType = {
  name: 'Test LSI unit',
  sensorA: 800,
  settings: {
    longTimePickup: { positions: { '0.5': 0.5, '1.0': 1.0 } },
    longTimeDelay: { positions: { '4': 4, '10': 10 } },
    instantaneousPickup: { positions: { OFF: 0, '6': 6, '12': 12 } },
  },
  pickupTolerancePct: 10,
  clearingS: 0.05,
};

describe('device library', () => {
  let id = '';
  it('an engineer adds an electronic trip unit by switch positions, and it resolves to numbers', async () => {
    const res = await request(t.app)
      .post('/api/device-types')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({
        name: 'Main breaker trip unit',
        definition: {
          kind: 'electronic',
          tripType,
          positions: { longTimePickup: '0.5', longTimeDelay: '4', instantaneousPickup: '6' },
        },
      });
    expect(res.status).toBe(201);
    id = res.body.id;
    expect(res.body.device).toMatchObject({
      kind: 'electronic',
      sensorA: 800,
      longTime: { pickup: 0.5, delayS: 4 },
      instantaneous: { pickup: 6 },
    });
  });

  it('refuses an unknown switch position, naming it', async () => {
    const res = await request(t.app)
      .post('/api/device-types')
      .set(...bearer(t.orgA.users.engineer.token))
      .send({
        name: 'Bad',
        definition: {
          kind: 'electronic',
          tripType,
          positions: { longTimePickup: '0.7', longTimeDelay: '4', instantaneousPickup: '6' },
        },
      });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty(['definition.positions.longTimePickup']);
  });

  it('everyone reads, only engineers write', async () => {
    for (const role of ['electrician', 'safety', 'admin'] as const) {
      expect(
        (
          await request(t.app)
            .get(`/api/device-types/${id}`)
            .set(...bearer(t.orgA.users[role].token))
        ).status,
      ).toBe(200);
      const put = await request(t.app)
        .put(`/api/device-types/${id}`)
        .set(...bearer(t.orgA.users[role].token))
        .send({ name: 'x', definition: { kind: 'fuse', ratingA: 10, totalClearing: [[20, 1]] } });
      expect(put.status).toBe(403);
    }
  });

  it('edits and deletes; another organization gets 404', async () => {
    const other = await request(t.app)
      .get(`/api/device-types/${id}`)
      .set(...bearer(t.orgB.users.engineer.token));
    expect(other.status).toBe(404);
    const otherDelete = await request(t.app)
      .delete(`/api/device-types/${id}`)
      .set(...bearer(t.orgB.users.engineer.token));
    expect(otherDelete.status).toBe(404);
    const put = await request(t.app)
      .put(`/api/device-types/${id}`)
      .set(...bearer(t.orgA.users.engineer.token))
      .send({
        name: 'Main breaker trip unit',
        definition: {
          kind: 'electronic',
          tripType,
          positions: { longTimePickup: '1.0', longTimeDelay: '10', instantaneousPickup: 'OFF' },
        },
      });
    expect(put.status).toBe(200);
    expect(put.body.device.instantaneous).toBeUndefined();
    expect(
      (
        await request(t.app)
          .delete(`/api/device-types/${id}`)
          .set(...bearer(t.orgA.users.engineer.token))
      ).status,
    ).toBe(204);
    expect(
      (
        await request(t.app)
          .get(`/api/device-types/${id}`)
          .set(...bearer(t.orgA.users.engineer.token))
      ).status,
    ).toBe(404);
  });
});

describe('digitized band CSV upload', () => {
  it('reads a good file', async () => {
    const csv = 'multiple,min_s,max_s\n2,50,100\n5,5,12\n10,1,2.5\n';
    const res = await request(t.app)
      .post('/api/device-types/parse-band-csv')
      .set(...bearer(t.orgA.users.engineer.token))
      .attach('file', Buffer.from(csv), { filename: 'band.csv', contentType: 'text/csv' });
    expect(res.status).toBe(200);
    expect(res.body.currentUnit).toBe('multiple');
    expect(res.body.max).toEqual([
      [2, 100],
      [5, 12],
      [10, 2.5],
    ]);
  });

  it('reports bad rows by line', async () => {
    const csv = 'current,min_s,max_s\n100,50,100\n200,abc,12\n150,1,2\n';
    const res = await request(t.app)
      .post('/api/device-types/parse-band-csv')
      .set(...bearer(t.orgA.users.engineer.token))
      .attach('file', Buffer.from(csv), { filename: 'band.csv', contentType: 'text/csv' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['line 3', 'line 4']));
  });

  it('refuses a missing file, a wrong type and an oversize file', async () => {
    const none = await request(t.app)
      .post('/api/device-types/parse-band-csv')
      .set(...bearer(t.orgA.users.engineer.token));
    expect(none.status).toBe(400);
    const png = await request(t.app)
      .post('/api/device-types/parse-band-csv')
      .set(...bearer(t.orgA.users.engineer.token))
      .attach('file', Buffer.from([0x89, 0x50, 0x4e, 0x47]), { filename: 'band.png', contentType: 'image/png' });
    expect(png.status).toBe(415);
    const big = await request(t.app)
      .post('/api/device-types/parse-band-csv')
      .set(...bearer(t.orgA.users.engineer.token))
      .attach('file', Buffer.alloc(600 * 1024, 'a'), { filename: 'band.csv', contentType: 'text/csv' });
    expect(big.status).toBe(413);
  });
});
