/**
 * POST /studies/:id/mitigate and /mitigate/apply (docs/ARCHITECTURE.md, Mitigation).
 */
import request from 'supertest';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let siteId: string;
let approvedId: string;

beforeAll(async () => {
  t = await makeTestApp();
  const eng = bearer(t.orgA.users.engineer.token);
  siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...eng)
      .send({ name: 'Mitigation site' })
  ).body.id;
  approvedId = await approveStudy(t, siteId, smallModel());
});
afterAll(async () => t.close());

describe('POST /studies/:id/mitigate', () => {
  it('answers the bus with its present hazard', async () => {
    const res = await request(t.app)
      .post(`/api/studies/${approvedId}/mitigate`)
      .set(...bearer(t.orgA.users.engineer.token))
      .send({ busId: 'SWBD', targetCalPerCm2: 8 });
    expect(res.status).toBe(200);
    expect(res.body.busId).toBe('SWBD');
    expect(res.body.before.incidentEnergyCalPerCm2).toBeGreaterThan(0);
  });
});
