/**
 * A bus's own arc-duration cap is a safety decision: a model save that sets, changes or removes one records the
 * before and after (with the reason) in the audit event of the model change; a bus cap without its reason is
 * refused by the model checks naming the field. The run carries the cap and its reason on the bus result.
 */
import request from 'supertest';
import { AuditEvent, StudyRun } from '../../server/db/models';
import { smallModel } from '../fixtures/smallModel';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';
import { parseStoredResults } from '../../server/engine/study/storedResults';

let t: TestApp;
let studyId = '';
beforeAll(async () => {
  t = await makeTestApp();
  const site = await request(t.app)
    .post('/api/sites')
    .set(...bearer(t.orgA.users.engineer.token))
    .send({ name: 'Cap site' });
  const study = await request(t.app)
    .post(`/api/sites/${site.body.id}/studies`)
    .set(...bearer(t.orgA.users.engineer.token))
    .send({ title: 'Cap study' });
  studyId = study.body.id;
});
afterAll(async () => t.close());

const eng = () => bearer(t.orgA.users.engineer.token);

function withCap(cap: number | null | undefined, reason?: string) {
  const m = smallModel() as { buses: { id: string; equipment?: Record<string, unknown> }[] };
  const bus = m.buses.find((b) => b.id === 'SWBD')!;
  if (cap !== undefined) bus.equipment = { ...bus.equipment, arcDurationCapS: cap, arcDurationCapReason: reason };
  return m;
}

describe('arc-duration cap per bus through the API', () => {
  it('records the cap change before/after in the model-update audit event, and the run carries it', async () => {
    const first = await request(t.app)
      .put(`/api/studies/${studyId}/model`)
      .set(...eng())
      .send({ model: withCap(undefined), version: 1 });
    expect(first.status).toBe(200);
    const set = await request(t.app)
      .put(`/api/studies/${studyId}/model`)
      .set(...eng())
      .send({ model: withCap(5, 'Confined vault'), version: 2 });
    expect(set.status).toBe(200);
    expect(set.body.issues).toEqual([]);
    const events = await AuditEvent.findAll({ where: { organizationId: t.orgA.id, action: 'study.model-updated' } });
    const summaries = events.map((e) => JSON.parse(e.summary as unknown as string));
    const withCaps = summaries.find((s) => s.version === 3);
    expect(withCaps.arcDurationCaps).toEqual([
      { busId: 'SWBD', before: null, after: { capS: 5, reason: 'Confined vault' } },
    ]);
    expect(summaries.find((s) => s.version === 2).arcDurationCaps).toBeUndefined();

    const run = await request(t.app)
      .post(`/api/studies/${studyId}/run`)
      .set(...eng());
    expect(run.status).toBe(202);
    await t.ctx.jobs.idle();
    // The stored results of the run (the results routes page and shape them; the bus result is stored whole).
    const stored = await StudyRun.findOne({ where: { studyId }, order: [['startedAt', 'DESC']] });
    const body = parseStoredResults(stored!.results as string);
    const swbd = body.buses.find((b) => b.busId === 'SWBD');
    expect(swbd?.arcDurationCap).toEqual({ capS: 5, source: 'bus', reason: 'Confined vault' });
  });

  it('a bus cap without its reason is a model issue naming the field', async () => {
    const res = await request(t.app)
      .put(`/api/studies/${studyId}/model`)
      .set(...eng())
      .send({ model: withCap(null), version: 3 });
    expect(res.status).toBe(200);
    expect(res.body.issues).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ path: 'buses[1].equipment.arcDurationCapReason', elementId: 'SWBD' }),
      ]),
    );
  });
});
