/**
 * The safety dashboard's lists with an injected clock: review due within 90 and 30 days and overdue (review interval
 * 60 months by default: NFPA 70E 2024, 130.5(G), review at least every 5 years), stale after a model change,
 * superseded labels still installed after a new revision, labels not installed after the set days, and field
 * reports by age with their triage. CSV exports must match the lists.
 */
import Papa from 'papaparse';
import request from 'supertest';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

let t: TestApp;
let siteId = '';
let emptySiteId = '';
const T0 = new Date('2026-01-15T10:00:00Z');
/** 60 months after T0, counted by calendar (independent of the code under test). */
const REVIEW_BY = new Date('2031-01-15T10:00:00Z');
const DAY = 86_400_000;
const png = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
  'base64',
);

const eng = () => bearer(t.orgA.users.engineer.token);
const safety = () => bearer(t.orgA.users.safety.token);
const elec = () => bearer(t.orgA.users.electrician.token);
const at = (ms: number) => t.setNow(new Date(ms));

async function summary(query = '') {
  const res = await request(t.app)
    .get(`/api/attention${query}`)
    .set(...safety());
  expect(res.status).toBe(200);
  return res.body as {
    counts: Record<string, number>;
    openReportAges: Record<string, number>;
    sites: { siteId: string; counts: Record<string, number> }[];
  };
}

async function list(name: string, query = '') {
  const res = await request(t.app)
    .get(`/api/attention/${name}${query}`)
    .set(...safety());
  expect(res.status).toBe(200);
  return res.body as {
    rows: {
      id: string;
      siteName: string;
      link: { kind: string; id: string };
      cells: Record<string, string | number | null>;
    }[];
    columns: { key: string; label: string }[];
  };
}

async function labelsOf(studyId: string) {
  const res = await request(t.app)
    .get(`/api/studies/${studyId}/labels`)
    .set(...eng());
  return res.body.labels as { id: string; code: string; equipmentTag: string }[];
}

beforeAll(async () => {
  t = await makeTestApp();
  at(T0.getTime());
  siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...eng())
      .send({ name: 'Clarifier building' })
  ).body.id;
  emptySiteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...eng())
      .send({ name: 'Empty yard' })
  ).body.id;
});
afterAll(async () => t.close());

describe('safety dashboard', () => {
  let studyId = '';
  let firstLabels: { id: string; code: string; equipmentTag: string }[] = [];

  it('is quiet right after approval', async () => {
    studyId = await approveStudy(t, siteId, smallModel());
    firstLabels = await labelsOf(studyId);
    expect(firstLabels).toHaveLength(3);
    const s = await summary();
    expect(Object.values(s.counts).every((n) => n === 0)).toBe(true);
  });

  it('lists labels not installed once the set number of days has passed (default 30)', async () => {
    at(T0.getTime() + 29 * DAY);
    expect((await summary()).counts['not-installed']).toBe(0);
    at(T0.getTime() + 31 * DAY);
    expect((await summary()).counts['not-installed']).toBe(3);
    const mcc = firstLabels.find((l) => l.equipmentTag === 'MCC')!;
    const inst = await request(t.app)
      .post(`/api/labels/${mcc.code}/installed`)
      .set(...elec())
      .attach('photo', png, { filename: 'l.png', contentType: 'image/png' });
    expect(inst.status).toBe(200);
    const l = await list('not-installed');
    expect(l.rows.map((r) => r.cells.equipment).sort()).toEqual(['PNL', 'SWBD']);
    expect(l.rows[0].cells.daysSinceIssue).toBe(31);
    expect(l.rows[0].link.kind).toBe('label');
    // The organization's own number of days governs.
    const admin = bearer(t.orgA.users.admin.token);
    const org = (
      await request(t.app)
        .get('/api/organization')
        .set(...admin)
    ).body;
    const put = await request(t.app)
      .put('/api/organization/settings')
      .set(...admin)
      .send({ ...org.settings, notInstalledAfterDays: 45 });
    expect(put.status).toBe(200);
    expect((await summary()).counts['not-installed']).toBe(0);
    await request(t.app)
      .put('/api/organization/settings')
      .set(...admin)
      .send({ ...org.settings, notInstalledAfterDays: 30 });
  });

  it('shows a study due within 90, then within 30 days, then overdue', async () => {
    at(REVIEW_BY.getTime() - 91 * DAY);
    let s = await summary();
    expect([s.counts['review-due-90'], s.counts['review-due-30'], s.counts['review-overdue']]).toEqual([0, 0, 0]);
    at(REVIEW_BY.getTime() - 60 * DAY);
    s = await summary();
    expect([s.counts['review-due-90'], s.counts['review-due-30'], s.counts['review-overdue']]).toEqual([1, 0, 0]);
    const due = await list('review-due-90');
    expect(due.rows[0].cells.reviewBy).toBe('2031-01-15');
    expect(due.rows[0].cells.daysLeft).toBe(60);
    expect(due.rows[0].link).toEqual({ kind: 'study', id: studyId });
    at(REVIEW_BY.getTime() - 10 * DAY);
    s = await summary();
    expect([s.counts['review-due-90'], s.counts['review-due-30'], s.counts['review-overdue']]).toEqual([1, 1, 0]);
    at(REVIEW_BY.getTime() + DAY);
    s = await summary();
    expect([s.counts['review-due-90'], s.counts['review-due-30'], s.counts['review-overdue']]).toEqual([0, 0, 1]);
    expect((await list('review-overdue')).rows[0].cells.daysOverdue).toBe(1);
    // The study itself says the same.
    expect(
      (
        await request(t.app)
          .get(`/api/studies/${studyId}`)
          .set(...eng())
      ).body.pastReview,
    ).toBe(true);
    at(T0.getTime() + 40 * DAY);
  });

  it('a study becomes stale when a later revision changes the model, not before', async () => {
    const rev = await request(t.app)
      .post(`/api/studies/${studyId}/revise`)
      .set(...eng());
    expect(rev.status).toBe(201);
    expect((await summary()).counts['stale-studies']).toBe(0);
    at(T0.getTime() + 41 * DAY);
    const env = await request(t.app)
      .get(`/api/studies/${rev.body.id}/model`)
      .set(...eng());
    const model = smallModel();
    model.cables![0].lengthM = 45;
    const put = await request(t.app)
      .put(`/api/studies/${rev.body.id}/model`)
      .set(...eng())
      .send({ model, version: env.body.version });
    expect(put.status).toBe(200);
    const stale = await list('stale-studies');
    expect(stale.rows).toHaveLength(1);
    expect(stale.rows[0].cells).toMatchObject({ revision: 1, changedInRevision: 2, changedStatus: 'draft' });
    // Finish that revision so the next test starts clean.
    await request(t.app)
      .post(`/api/studies/${rev.body.id}/run`)
      .set(...eng());
    await t.ctx.jobs.idle();
    await request(t.app)
      .post(`/api/studies/${rev.body.id}/submit`)
      .set(...eng());
    const ok = await request(t.app)
      .post(`/api/studies/${rev.body.id}/approve`)
      .set(...eng())
      .send({ approverName: 'A. Engineer', licenceNumber: 'PE-000123', jurisdiction: 'Test State', confirm: true });
    expect(ok.status).toBe(200);
    // Approved: revision 1 is superseded, not stale, and revision 2 is current.
    expect((await summary()).counts['stale-studies']).toBe(0);
    studyId = rev.body.id as string;
  });

  it('lists a superseded label still installed until the current label of that equipment is installed', async () => {
    const l = await list('superseded-installed');
    expect(l.rows).toHaveLength(1);
    const oldMcc = firstLabels.find((x) => x.equipmentTag === 'MCC')!;
    const newMcc = (await labelsOf(studyId)).find((x) => x.equipmentTag === 'MCC')!;
    expect(l.rows[0].cells).toMatchObject({
      equipment: 'MCC',
      code: oldMcc.code,
      revision: 1,
      currentCode: newMcc.code,
    });
    at(T0.getTime() + 42 * DAY);
    const inst = await request(t.app)
      .post(`/api/labels/${newMcc.code}/installed`)
      .set(...elec())
      .attach('photo', png, { filename: 'l.png', contentType: 'image/png' });
    expect(inst.status).toBe(200);
    expect((await summary()).counts['superseded-installed']).toBe(0);
  });

  it('filters by site; an unknown site or another organization’s site is not found', async () => {
    const s = await summary(`?siteId=${emptySiteId}`);
    expect(Object.values(s.counts).every((n) => n === 0)).toBe(true);
    const all = await summary();
    expect(all.sites.map((x) => x.siteId).sort()).toEqual([siteId, emptySiteId].sort());
    expect(
      (
        await request(t.app)
          .get('/api/attention?siteId=nope')
          .set(...safety())
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .get(`/api/attention?siteId=${siteId}`)
          .set(...bearer(t.orgB.users.safety.token))
      ).status,
    ).toBe(404);
    const other = await request(t.app)
      .get('/api/attention')
      .set(...bearer(t.orgB.users.safety.token));
    expect(Object.values(other.body.counts as Record<string, number>).every((n) => n === 0)).toBe(true);
    expect(
      (
        await request(t.app)
          .get('/api/attention/not-a-list')
          .set(...safety())
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .get('/api/attention')
          .set(...elec())
      ).status,
    ).toBe(403);
  });
});

describe('field reports', () => {
  let reportId = '';
  let code = '';

  it('appear as open reports with their age', async () => {
    at(T0.getTime() + 50 * DAY);
    const labels = (
      await request(t.app)
        .get(`/api/sites/${siteId}/labels?current=1`)
        .set(...eng())
    ).body.labels as { code: string; equipmentTag: string }[];
    code = labels.find((l) => l.equipmentTag === 'PNL')!.code;
    const r = await request(t.app)
      .post(`/api/labels/${code}/reports`)
      .set(...elec())
      .field('kind', 'setting')
      .field('text', '=Main breaker instantaneous set to 10x, label assumes 6x')
      .attach('photo', png, { filename: 'p.png', contentType: 'image/png' });
    expect(r.status).toBe(201);
    reportId = r.body.id as string;
    let s = await summary();
    expect(s.counts['open-reports']).toBe(1);
    expect(s.openReportAges).toEqual({ under7Days: 1, from7To30Days: 0, over30Days: 0 });
    at(T0.getTime() + 60 * DAY);
    s = await summary();
    expect(s.openReportAges).toEqual({ under7Days: 0, from7To30Days: 1, over30Days: 0 });
    const l = await list('open-reports');
    expect(l.rows[0].cells).toMatchObject({ equipment: 'PNL', kind: 'Device setting', status: 'Open', ageDays: 10 });
  });

  it('go open → acknowledged → resolved with a note; the reporter sees the status', async () => {
    expect(
      (
        await request(t.app)
          .post(`/api/field-reports/${reportId}/triage`)
          .set(...elec())
          .send({ status: 'acknowledged' })
      ).status,
    ).toBe(403);
    const ack = await request(t.app)
      .post(`/api/field-reports/${reportId}/triage`)
      .set(...eng())
      .send({ status: 'acknowledged' });
    expect(ack.status).toBe(200);
    expect(ack.body.status).toBe('acknowledged');
    expect(ack.body.acknowledgedBy).toBe('engineer of org-a');
    expect((await list('open-reports')).rows[0].cells.status).toBe('Acknowledged');
    expect(
      (
        await request(t.app)
          .post(`/api/field-reports/${reportId}/triage`)
          .set(...eng())
          .send({ status: 'acknowledged' })
      ).status,
    ).toBe(409);
    const noNote = await request(t.app)
      .post(`/api/field-reports/${reportId}/triage`)
      .set(...safety())
      .send({ status: 'resolved' });
    expect(noNote.status).toBe(400);
    expect(Object.keys(noNote.body.error.fields)).toContain('note');
    const res = await request(t.app)
      .post(`/api/field-reports/${reportId}/triage`)
      .set(...safety())
      .send({ status: 'resolved', note: 'Setting restored to 6x; checked on site.' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      status: 'resolved',
      resolvedBy: 'safety of org-a',
      resolutionNote: 'Setting restored to 6x; checked on site.',
    });
    expect((await summary()).counts['open-reports']).toBe(0);
    expect(
      (
        await request(t.app)
          .post(`/api/field-reports/${reportId}/triage`)
          .set(...safety())
          .send({ status: 'resolved', note: 'again' })
      ).status,
    ).toBe(409);
    // The electrician who reported it sees the outcome.
    const mine = await request(t.app)
      .get('/api/field-reports')
      .set(...elec());
    expect(mine.status).toBe(200);
    expect(mine.body.reports).toHaveLength(1);
    expect(mine.body.reports[0]).toMatchObject({
      id: reportId,
      status: 'resolved',
      resolutionNote: 'Setting restored to 6x; checked on site.',
      hasPhoto: true,
    });
    const photo = await request(t.app)
      .get(`/api/field-reports/${reportId}/photo`)
      .set(...elec());
    expect(photo.status).toBe(200);
    expect(photo.headers['content-type']).toMatch(/^image\/png/);
    // Another organization does not find it.
    expect(
      (
        await request(t.app)
          .get(`/api/field-reports/${reportId}`)
          .set(...bearer(t.orgB.users.safety.token))
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .post(`/api/field-reports/${reportId}/triage`)
          .set(...bearer(t.orgB.users.engineer.token))
          .send({ status: 'acknowledged' })
      ).status,
    ).toBe(404);
  });

  it('electricians see only their own reports', async () => {
    const r = await request(t.app)
      .post(`/api/labels/${code}/reports`)
      .set(...eng())
      .field('kind', 'other')
      .field('text', 'Cover screws missing on the panel');
    expect(r.status).toBe(201);
    expect(
      (
        await request(t.app)
          .get('/api/field-reports')
          .set(...elec())
      ).body.reports,
    ).toHaveLength(1);
    expect(
      (
        await request(t.app)
          .get(`/api/field-reports/${r.body.id}`)
          .set(...elec())
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .get('/api/field-reports?status=open')
          .set(...safety())
      ).body.reports,
    ).toHaveLength(1);
  });
});

describe('CSV exports', () => {
  it('match the lists, row for row, with the site first and formulas neutralised', async () => {
    at(T0.getTime() + 120 * DAY);
    const labels = (
      await request(t.app)
        .get(`/api/sites/${siteId}/labels?current=1`)
        .set(...eng())
    ).body.labels as { code: string }[];
    const inj = await request(t.app)
      .post(`/api/labels/${labels[0].code}/reports`)
      .set(...elec())
      .field('kind', 'other')
      .field('text', '=HYPERLINK("http://example.invalid")');
    expect(inj.status).toBe(201);
    for (const name of ['not-installed', 'open-reports', 'review-due-90']) {
      const l = await list(name);
      const res = await request(t.app)
        .get(`/api/attention/${name}/export.csv`)
        .set(...safety());
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toMatch(/^text\/csv/);
      expect(res.headers['content-disposition']).toMatch(
        new RegExp(`attachment; filename="${name}-\\d{4}-\\d{2}-\\d{2}\\.csv"`),
      );
      const parsed = Papa.parse<string[]>(res.text.replace(/^\uFEFF/, ''), { skipEmptyLines: true });
      expect(parsed.data[0]).toEqual(['Site', ...l.columns.map((c) => c.label)]);
      expect(parsed.data.slice(1)).toEqual(
        l.rows.map((r) => [
          r.siteName,
          ...l.columns.map((c) => {
            const v = r.cells[c.key];
            if (v === null || v === undefined) return '';
            // OWASP "CSV injection": a text cell starting with = + - @ is prefixed with an apostrophe.
            return typeof v === 'string' && /^[=+\-@\t\r]/.test(v) ? `'${v}` : String(v);
          }),
        ]),
      );
    }
    const reports = await request(t.app)
      .get('/api/attention/open-reports/export.csv')
      .set(...safety());
    expect(reports.text).toContain(`"'=HYPERLINK(""http://example.invalid"")"`);
  });
});
