/**
 * Revision comparison (GET /studies/:id/compare/:otherId). The reference for the energy numbers is the engine run on
 * each model directly (runStudy: its parts are checked against IEEE 1584-2018 and IEEE C37.112 in tests/engine); the
 * direction of the change is physics: the IEEE C37.112 inverse-time operating time is proportional to the time dial,
 * and the IEEE 1584-2018 incident energy grows with the arc duration.
 */
import request from 'supertest';
import { parseModel, type ModelInput } from '../../shared/schemas/model';
import { runStudy } from '../../server/engine/study';
import { larkspurModel } from '../../server/seed/larkspurModel';
import { approveStudy, saveModel } from '../helpers/flows';
import { pdfText } from '../helpers/pdfText';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

const eng = () => bearer(t.orgA.users.engineer.token);

/** The demo with the 750 kVA transformer's primary relay slowed (time dial 2 → 6): it clears USS-2's arc. */
function slowed(): ModelInput {
  const m = larkspurModel();
  const relay = m.devices!.find((d) => d.id === 'R-TX2')!;
  (relay.device as { timeDial: number }).timeDial = 6;
  return m;
}

describe('comparing a revision with the approved one', () => {
  let approved = '';
  let revision = '';
  let siteId = '';

  beforeAll(async () => {
    siteId = (
      await request(t.app)
        .post('/api/sites')
        .set(...eng())
        .send({ name: 'Compare site' })
    ).body.id;
    approved = await approveStudy(t, siteId, larkspurModel());
    revision = (
      await request(t.app)
        .post(`/api/studies/${approved}/revise`)
        .set(...eng())
    ).body.id;
    await saveModel(t, revision, slowed());
    await request(t.app)
      .post(`/api/studies/${revision}/run`)
      .set(...eng());
    await t.ctx.jobs.idle();
  });

  it('lists the changed relay setting field by field, old and new', async () => {
    const res = await request(t.app)
      .get(`/api/studies/${revision}/compare/${approved}`)
      .set(...eng());
    expect(res.status).toBe(200);
    expect(res.body.model.counts).toEqual({ added: 0, removed: 0, changed: 1 });
    expect(res.body.model.elements).toEqual([
      {
        kind: 'devices',
        id: 'R-TX2',
        name: 'TX-2 primary relay',
        change: 'changed',
        fields: [{ field: 'device.timeDial', before: 2, after: 6 }],
      },
    ]);
    expect(res.body.notes).toEqual([]);
  });

  it('shows the bus the slower relay clears first, with the energy rise the engine gives', async () => {
    const res = await request(t.app)
      .get(`/api/studies/${revision}/compare/${approved}`)
      .set(...eng());
    const first = res.body.buses[0];
    expect(first.busId).toBe('USS-2');
    expect(first.change).toBe('changed');
    expect(first.before.clearingDeviceId).toBe('R-TX2');
    const parsed = (m: ModelInput) => {
      const p = parseModel(m);
      if (!p.success) throw new Error('demo model invalid');
      return p.model;
    };
    const e0 = runStudy(parsed(larkspurModel())).buses.find((b) => b.busId === 'USS-2')!.incidentEnergyCalPerCm2!;
    const e1 = runStudy(parsed(slowed())).buses.find((b) => b.busId === 'USS-2')!.incidentEnergyCalPerCm2!;
    expect(e1).toBeGreaterThan(e0);
    expect(first.energyRiseCalPerCm2).toBeCloseTo(e1 - e0, 9);
    expect(first.energyRisePct).toBeCloseTo((100 * (e1 - e0)) / e0, 6);
    expect(res.body.counts.higher).toBeGreaterThanOrEqual(1);
    // Buses the relay does not clear are unchanged (the arc there ends before it operates), listed after.
    const lp1 = res.body.buses.find((b: { busId: string }) => b.busId === 'LP-1');
    expect(lp1.change).toBe('unchanged');
    expect(lp1.energyRiseCalPerCm2).toBe(0);
  });

  it('the study report of the revision carries the same comparison', async () => {
    const res = await request(t.app)
      .get(`/api/studies/${revision}/report.pdf`)
      .set(...eng())
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => done(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    const text = pdfText(res.body as Buffer);
    expect(text).toContain('Changes from revision 1 (approved)');
    expect(text).toContain('1 model change');
    expect(text).toContain('Device R-TX2 (TX-2 primary relay) changed — device.timeDial: 2 → 6');
  });

  it('says when the newer revision has no results for its current model', async () => {
    const m = slowed();
    m.buses!.push({ id: 'NEW-PNL', nominalKv: 0.48 });
    m.cables!.push({
      id: 'F-NEW',
      fromBus: 'PP-1',
      toBus: 'NEW-PNL',
      lengthM: 10,
      size: '4',
      material: 'Cu',
      conduit: 'pvc',
    } as never);
    await saveModel(t, revision, m);
    const res = await request(t.app)
      .get(`/api/studies/${revision}/compare/${approved}`)
      .set(...eng());
    expect(res.status).toBe(200);
    expect(res.body.study.resultsCurrent).toBe(false);
    expect(res.body.notes.join(' ')).toMatch(/earlier version of its model/);
    expect(
      res.body.model.elements.filter((e: { change: string }) => e.change === 'added').map((e: { id: string }) => e.id),
    ).toEqual(['NEW-PNL', 'F-NEW']);
  });

  it('refuses revisions of two different sites, naming otherStudyId; electricians may not compare', async () => {
    const other = (
      await request(t.app)
        .post('/api/sites')
        .set(...eng())
        .send({ name: 'Another site' })
    ).body.id;
    const otherStudy = (
      await request(t.app)
        .post(`/api/sites/${other}/studies`)
        .set(...eng())
        .send({ title: 'Other' })
    ).body.id;
    const res = await request(t.app)
      .get(`/api/studies/${revision}/compare/${otherStudy}`)
      .set(...eng());
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(['otherStudyId']);
    const elec = await request(t.app)
      .get(`/api/studies/${approved}/compare/${approved}`)
      .set(...bearer(t.orgA.users.electrician.token));
    expect(elec.status).toBe(403);
  });
});
