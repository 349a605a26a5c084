import request from 'supertest';
import { AuditEvent } from '../../server/db/models';
import { smallModel } from '../fixtures/smallModel';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let siteId = '';
beforeAll(async () => {
  t = await makeTestApp();
  const site = await request(t.app)
    .post('/api/sites')
    .set(...bearer(t.orgA.users.engineer.token))
    .send({ name: 'Study test site' });
  siteId = site.body.id;
});
afterAll(async () => t.close());

const eng = () => bearer(t.orgA.users.engineer.token);

async function runAndWait(studyId: string): Promise<void> {
  const res = await request(t.app)
    .post(`/api/studies/${studyId}/run`)
    .set(...eng());
  expect(res.status).toBe(202);
  await t.ctx.jobs.idle();
  const run = await request(t.app)
    .get(`/api/studies/${studyId}/run`)
    .set(...eng());
  expect(run.body.status).toBe('done');
}

describe('study flow: create → model → run → results → submit → approve → locked → new revision', () => {
  let studyId = '';
  let approvedId = '';

  it('creates a draft with an empty model', async () => {
    const res = await request(t.app)
      .post(`/api/sites/${siteId}/studies`)
      .set(...eng())
      .send({ title: 'Arc-flash study 2026' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ status: 'draft', revision: 1 });
    studyId = res.body.id;
    const model = await request(t.app)
      .get(`/api/studies/${studyId}/model`)
      .set(...eng());
    expect(model.body.version).toBe(1);
    // An empty draft is allowed (nothing lost while editing), with its problems listed.
    expect(model.body.issues.length).toBeGreaterThan(0);
  });

  it('saves the model with a version check: a stale version gets 409 and changes nothing', async () => {
    const ok = await request(t.app)
      .put(`/api/studies/${studyId}/model`)
      .set(...eng())
      .send({ model: smallModel(), version: 1 });
    expect(ok.status).toBe(200);
    expect(ok.body.version).toBe(2);
    expect(ok.body.issues).toEqual([]);
    const stale = await request(t.app)
      .put(`/api/studies/${studyId}/model`)
      .set(...eng())
      .send({ model: { ...smallModel(), name: 'lost?' }, version: 1 });
    expect(stale.status).toBe(409);
    const now = await request(t.app)
      .get(`/api/studies/${studyId}/model`)
      .set(...eng());
    expect(now.body.model.name).toBe('Test plant');
  });

  it('refuses to submit before a run on the current model', async () => {
    const res = await request(t.app)
      .post(`/api/studies/${studyId}/submit`)
      .set(...eng());
    expect(res.status).toBe(409);
  });

  it('runs as a background job and stores results with their trace', async () => {
    await runAndWait(studyId);
    const res = await request(t.app)
      .get(`/api/studies/${studyId}/results`)
      .set(...eng());
    expect(res.status).toBe(200);
    // Pages are sorted by bus id unless asked otherwise, and carry no trace.
    expect(res.body.rows.map((b: { busId: string }) => b.busId)).toEqual(['MCC', 'PNL', 'SWBD']);
    expect(res.body.rows[0].cases).toBeUndefined();
    const one = await request(t.app)
      .get(`/api/studies/${studyId}/results/buses/SWBD`)
      .set(...eng());
    expect(one.status).toBe(200);
    const swbd = one.body.bus;
    // Not isolated main: both sides evaluated, the worse labelled (docs/ARCHITECTURE.md, study run step 8).
    expect(swbd.cases.some((c: { location: string }) => c.location === 'line-side')).toBe(true);
    expect(swbd.labelValues.signalWord).toMatch(/DANGER|WARNING/);
    expect(res.body.study.method).toBeTruthy();
    const study = await request(t.app)
      .get(`/api/studies/${studyId}`)
      .set(...eng());
    expect(study.body.resultsCurrent).toBe(true);
  });

  it('an electrician does not see the draft', async () => {
    const res = await request(t.app)
      .get(`/api/studies/${studyId}`)
      .set(...bearer(t.orgA.users.electrician.token));
    expect(res.status).toBe(404);
    const list = await request(t.app)
      .get(`/api/sites/${siteId}/studies`)
      .set(...bearer(t.orgA.users.electrician.token));
    expect(list.body.studies).toEqual([]);
  });

  it('submits, refuses approval without the licence data, approves with it', async () => {
    expect(
      (
        await request(t.app)
          .post(`/api/studies/${studyId}/submit`)
          .set(...eng())
      ).body.status,
    ).toBe('in-review');
    const bad = await request(t.app)
      .post(`/api/studies/${studyId}/approve`)
      .set(...eng())
      .send({ approverName: 'A. Engineer', confirm: true });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(['licenceNumber', 'jurisdiction']));
    const ok = await request(t.app)
      .post(`/api/studies/${studyId}/approve`)
      .set(...eng())
      .send({ approverName: 'A. Engineer', licenceNumber: 'PE-000123', jurisdiction: 'Test State', confirm: true });
    expect(ok.status).toBe(200);
    expect(ok.body.status).toBe('approved');
    expect(ok.body.approval).toMatchObject({
      approverName: 'A. Engineer',
      licenceNumber: 'PE-000123',
      jurisdiction: 'Test State',
    });
    approvedId = studyId;
    const equipment = await request(t.app)
      .get(`/api/sites/${siteId}/equipment`)
      .set(...bearer(t.orgA.users.electrician.token));
    expect(equipment.body.equipment.map((e: { tag: string }) => e.tag)).toEqual(['MCC', 'PNL', 'SWBD']);
  });

  it('an approved study cannot change (409)', async () => {
    const put = await request(t.app)
      .put(`/api/studies/${approvedId}/model`)
      .set(...eng())
      .send({ model: smallModel(), version: 2 });
    expect(put.status).toBe(409);
    expect(
      (
        await request(t.app)
          .post(`/api/studies/${approvedId}/run`)
          .set(...eng())
      ).status,
    ).toBe(409);
    expect(
      (
        await request(t.app)
          .post(`/api/studies/${approvedId}/submit`)
          .set(...eng())
      ).status,
    ).toBe(409);
  });

  it('a new revision copies the model into a draft; its approval supersedes the old one; the old one went stale', async () => {
    const rev = await request(t.app)
      .post(`/api/studies/${approvedId}/revise`)
      .set(...eng());
    expect(rev.status).toBe(201);
    expect(rev.body).toMatchObject({ status: 'draft', revision: 2, parentStudyId: approvedId });
    const second = await request(t.app)
      .post(`/api/studies/${approvedId}/revise`)
      .set(...eng());
    expect(second.status).toBe(409);
    const m = await request(t.app)
      .get(`/api/studies/${rev.body.id}/model`)
      .set(...eng());
    const changed = { ...m.body.model, name: 'Test plant, feeder replaced' };
    expect(
      (
        await request(t.app)
          .put(`/api/studies/${rev.body.id}/model`)
          .set(...eng())
          .send({ model: changed, version: m.body.version })
      ).status,
    ).toBe(200);
    const old = await request(t.app)
      .get(`/api/studies/${approvedId}`)
      .set(...eng());
    expect(old.body.stale).toBe(true);
    await runAndWait(rev.body.id);
    await request(t.app)
      .post(`/api/studies/${rev.body.id}/submit`)
      .set(...eng());
    const ok = await request(t.app)
      .post(`/api/studies/${rev.body.id}/approve`)
      .set(...eng())
      .send({ approverName: 'A. Engineer', licenceNumber: 'PE-000123', jurisdiction: 'Test State', confirm: true });
    expect(ok.body.status).toBe('approved');
    const superseded = await request(t.app)
      .get(`/api/studies/${approvedId}`)
      .set(...eng());
    expect(superseded.body.status).toBe('superseded');
  });

  it('computes past review from the approval date and the organization interval', async () => {
    const list = await request(t.app)
      .get(`/api/sites/${siteId}/studies`)
      .set(...bearer(t.orgA.users.safety.token));
    const approved = list.body.studies.find((s: { status: string }) => s.status === 'approved');
    expect(approved.pastReview).toBe(false);
    // NFPA 70E 130.5: review at least every 5 years — the default interval is 60 months.
    const due = new Date(approved.approval.reviewDueAt).getTime() - new Date(approved.approval.approvedAt).getTime();
    expect(Math.round(due / (365.25 * 24 * 3600 * 1000))).toBe(5);
    t.setNow(new Date(Date.now() + 6 * 365 * 24 * 3600 * 1000));
    const later = await request(t.app)
      .get(`/api/sites/${siteId}/studies`)
      .set(...bearer(t.orgA.users.safety.token));
    expect(later.body.studies.find((s: { status: string }) => s.status === 'approved').pastReview).toBe(true);
    t.setNow(null);
  });

  it('records every state change as an audit event', async () => {
    const actions = (await AuditEvent.findAll({ where: { organizationId: t.orgA.id } })).map((e) => e.action);
    for (const a of [
      'study.created',
      'study.model-updated',
      'study.run-started',
      'study.submitted',
      'study.approved',
      'study.superseded',
      'study.revision-started',
    ]) {
      expect(actions).toContain(a);
    }
  });
});

describe('study access', () => {
  it('another organization gets 404 on every study route', async () => {
    const s = await request(t.app)
      .post(`/api/sites/${siteId}/studies`)
      .set(...eng())
      .send({ title: 'Private' });
    const other = bearer(t.orgB.users.engineer.token);
    expect(
      (
        await request(t.app)
          .get(`/api/studies/${s.body.id}`)
          .set(...other)
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .get(`/api/studies/${s.body.id}/model`)
          .set(...other)
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .put(`/api/studies/${s.body.id}/model`)
          .set(...other)
          .send({ model: smallModel(), version: 1 })
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .post(`/api/studies/${s.body.id}/run`)
          .set(...other)
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .get(`/api/sites/${siteId}/studies`)
          .set(...other)
      ).status,
    ).toBe(404);
  });

  it('a run of a bad model is refused naming the element and field', async () => {
    const s = await request(t.app)
      .post(`/api/sites/${siteId}/studies`)
      .set(...eng())
      .send({ title: 'Broken' });
    const m = smallModel();
    (m.cables as { toBus: string }[])[0].toBus = 'NOWHERE';
    await request(t.app)
      .put(`/api/studies/${s.body.id}/model`)
      .set(...eng())
      .send({ model: m, version: 1 });
    const run = await request(t.app)
      .post(`/api/studies/${s.body.id}/run`)
      .set(...eng());
    expect(run.status).toBe(400);
    expect(run.body.error.fields).toHaveProperty(['model.cables[0].toBus']);
  });

  it('only engineers change studies', async () => {
    for (const role of ['electrician', 'safety', 'admin'] as const) {
      const res = await request(t.app)
        .post(`/api/sites/${siteId}/studies`)
        .set(...bearer(t.orgA.users[role].token))
        .send({ title: 'x' });
      expect(res.status).toBe(403);
    }
  });
});
