/**
 * The audit log: an event for every state change (who, what, when, before/after), search and paging, CSV export
 * that matches the search, and no way to change or delete an event.
 */
import Papa from 'papaparse';
import request from 'supertest';
import { AuditEvent } from '../../server/db/models';
import { allRoutes } from '../../server/routes';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let siteId = '';
let studyId = '';
let reportId = '';
const png = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
  'base64',
);

const eng = () => bearer(t.orgA.users.engineer.token);
const safety = () => bearer(t.orgA.users.safety.token);
const admin = () => bearer(t.orgA.users.admin.token);
const elec = () => bearer(t.orgA.users.electrician.token);

interface Ev {
  id: string;
  at: string;
  action: string;
  entityId: string | null;
  actor: { name: string } | null;
  summary: Record<string, unknown>;
  description: string;
}

async function search(query: string, who = safety()) {
  const res = await request(t.app)
    .get(`/api/audit-events?${query}`)
    .set(...who);
  expect(res.status).toBe(200);
  return res.body as { events: Ev[]; nextBefore: string | null };
}

beforeAll(async () => {
  t = await makeTestApp();
  siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...eng())
      .send({ name: 'Headworks' })
  ).body.id;
  studyId = await approveStudy(t, siteId, smallModel());
  const labels = (
    await request(t.app)
      .get(`/api/studies/${studyId}/labels`)
      .set(...eng())
  ).body.labels as { code: string }[];
  await request(t.app)
    .post(`/api/labels/${labels[0].code}/installed`)
    .set(...elec())
    .attach('photo', png, { filename: 'l.png', contentType: 'image/png' });
  reportId = (
    await request(t.app)
      .post(`/api/labels/${labels[1].code}/reports`)
      .set(...elec())
      .field('kind', 'device')
      .field('text', 'Fuse is 200 A, label says 400 A')
  ).body.id;
  await request(t.app)
    .post(`/api/field-reports/${reportId}/triage`)
    .set(...eng())
    .send({ status: 'acknowledged' });
  await request(t.app)
    .post(`/api/field-reports/${reportId}/triage`)
    .set(...safety())
    .send({ status: 'resolved', note: 'Label replaced after re-study' });
  const org = (
    await request(t.app)
      .get('/api/organization')
      .set(...admin())
  ).body;
  await request(t.app)
    .put('/api/organization/settings')
    .set(...admin())
    .send({ ...org.settings, reviewIntervalMonths: 36 });
  await request(t.app)
    .patch(`/api/users/${t.orgA.users.electrician.id}`)
    .set(...admin())
    .send({ name: 'Field electrician' });
  await request(t.app)
    .post(`/api/studies/${studyId}/revise`)
    .set(...eng());
});
afterAll(async () => t.close());

describe('audit events', () => {
  it('are written for each state change, with who and the before/after', async () => {
    const { events } = await search('limit=500');
    const actions = new Set(events.map((e) => e.action));
    for (const a of [
      'site.created',
      'study.created',
      'study.model-updated',
      'study.run-started',
      'study.run-finished',
      'study.submitted',
      'study.approved',
      'label.installed',
      'field-report.opened',
      'field-report.acknowledged',
      'field-report.resolved',
      'organization.settings-updated',
      'user.updated',
      'study.revision-started',
    ]) {
      expect(actions).toContain(a);
    }
    const resolved = events.find((e) => e.action === 'field-report.resolved')!;
    expect(resolved.entityId).toBe(reportId);
    expect(resolved.actor?.name).toBe('safety of org-a');
    expect(resolved.summary).toMatchObject({ before: { status: 'acknowledged' }, after: { status: 'resolved' } });
    expect(resolved.description).toContain('status: acknowledged → resolved');
    const settings = events.find((e) => e.action === 'organization.settings-updated')!;
    expect(settings.description).toContain('review interval (months): 60 → 36');
    // Internal ids stay in the summary, not in the words.
    const approved = events.find((e) => e.action === 'study.approved')!;
    expect(approved.summary).toHaveProperty('runId');
    expect(approved.description).not.toMatch(/[0-9a-f]{8}-[0-9a-f]{4}-/);
    expect(approved.description).toContain('approved by: A. Engineer');
    // Newest first.
    const times = events.map((e) => e.at);
    expect([...times].sort().reverse()).toEqual(times);
  });

  it('are searched by action prefix, text and actor, and paged without gaps or repeats', async () => {
    const fr = await search('action=field-report.');
    expect(fr.events.map((e) => e.action).sort()).toEqual([
      'field-report.acknowledged',
      'field-report.opened',
      'field-report.resolved',
    ]);
    const several = await search('action=field-report.opened,label.&limit=500');
    expect(new Set(several.events.map((e) => e.action))).toEqual(new Set(['field-report.opened', 'label.installed']));
    const byActor = await search(`q=${encodeURIComponent('safety of org-a')}`);
    expect(byActor.events.length).toBeGreaterThan(0);
    expect(byActor.events.every((e) => e.actor?.name === 'safety of org-a')).toBe(true);
    const text = await search(`q=${encodeURIComponent('HEADWORKS')}`);
    expect(text.events.map((e) => e.action)).toContain('site.created');
    // A literal % does not match everything.
    expect((await search('q=%25%25%25')).events).toHaveLength(0);

    const all = (await search('limit=500')).events.map((e) => e.id);
    const paged: string[] = [];
    let before: string | null = null;
    do {
      const page: { events: Ev[]; nextBefore: string | null } = await search(
        `limit=3${before ? `&before=${before}` : ''}`,
      );
      paged.push(...page.events.map((e) => e.id));
      before = page.nextBefore;
    } while (before);
    expect(paged).toEqual(all);
  });

  it('are filtered by dates; bad filters are refused naming the field', async () => {
    const today = new Date().toISOString().slice(0, 10);
    const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
    expect((await search(`to=${yesterday}`)).events).toHaveLength(0);
    expect((await search(`from=${today}&limit=500`)).events.length).toBe((await search('limit=500')).events.length);
    const bad = await request(t.app)
      .get('/api/audit-events?from=last-tuesday')
      .set(...safety());
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toContain('from');
    const cursor = await request(t.app)
      .get('/api/audit-events?before=bm9wZQ')
      .set(...safety());
    expect(cursor.status).toBe(400);
    expect(Object.keys(cursor.body.error.fields)).toContain('before');
  });

  it('export as CSV exactly what the search finds', async () => {
    const { events } = await search('action=study.&limit=500');
    const res = await request(t.app)
      .get('/api/audit-events/export.csv?action=study.')
      .set(...safety());
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    const rows = Papa.parse<string[]>(res.text.replace(/^\uFEFF/, ''), { skipEmptyLines: true }).data;
    expect(rows[0].slice(0, 4)).toEqual(['Time (UTC)', 'Actor', 'Actor e-mail', 'Action']);
    expect(rows.slice(1).map((r) => [r[0], r[3], r[5]])).toEqual(events.map((e) => [e.at, e.action, e.entityId ?? '']));
  });

  it('belong to their organization and are not for electricians', async () => {
    const other = await search(`q=${studyId}`, bearer(t.orgB.users.safety.token));
    expect(other.events).toHaveLength(0);
    expect(
      (
        await request(t.app)
          .get('/api/audit-events')
          .set(...elec())
      ).status,
    ).toBe(403);
  });

  it('cannot be changed or deleted: no route does it, and the model refuses', async () => {
    const writable = allRoutes({ signInLimitPerMinute: 1, publicCheckPerMinute: 1 }).filter(
      (r) => r.path.startsWith('/audit') && r.method !== 'get',
    );
    expect(writable).toEqual([]);
    const { events } = await search('limit=1');
    const id = events[0].id;
    for (const method of ['put', 'patch', 'delete'] as const) {
      const res = await request(t.app)
        [method](`/api/audit-events/${id}`)
        .set(...admin())
        .send({ action: 'nothing' });
      expect(res.status).toBe(404);
    }
    const before = await AuditEvent.count();
    const row = await AuditEvent.findByPk(id, { rejectOnEmpty: true });
    await expect(row.update({ action: 'tampered' })).rejects.toThrow(/append-only/);
    await expect(row.destroy()).rejects.toThrow(/append-only/);
    await expect(AuditEvent.destroy({ where: { id } })).rejects.toThrow(/append-only/);
    await expect(AuditEvent.update({ action: 'tampered' }, { where: { id } })).rejects.toThrow(/append-only/);
    expect(await AuditEvent.count()).toBe(before);
    expect((await AuditEvent.findByPk(id, { rejectOnEmpty: true })).action).toBe(events[0].action);
  });
});
