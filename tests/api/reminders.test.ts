/**
 * Reminder rules, the reminder content as the real local SMTP sink received it, "send now", and the daily job with an
 * injected clock (once per rule per day, not before the organization's hour, skipped when there is nothing).
 */
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { hashPassword } from '../../server/auth/passwords';
import { AuditEvent, CapturedMail, ReminderDeliveryRow, User } from '../../server/db/models';
import { createMailer } from '../../server/mail';
import { runDueReminders, seedDefaultReminderRules } from '../../server/services/reminders';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';
import { freePort } from '../helpers/ports';

let t: TestApp;
let studyId = '';
let labelCodes: string[] = [];
const SITE_NAME = 'Reminder test site';
/** Six years after the approval: past the default review interval (60 months, the organization default). */
let later: Date;

const safetyA = () => bearer(t.orgA.users.safety.token);
const adminA = () => bearer(t.orgA.users.admin.token);
const safetyB = () => bearer(t.orgB.users.safety.token);

/** A UTC moment on `later`'s calendar day plus `days`, at hh:mm. */
function at(days: number, hh: number, mm = 0): Date {
  return new Date(Date.UTC(later.getUTCFullYear(), later.getUTCMonth(), later.getUTCDate() + days, hh, mm));
}

async function reminderMail(organizationId: string) {
  const rows = await CapturedMail.findAll({
    where: { organizationId, kind: 'reminder' },
    order: [['receivedAt', 'ASC']],
  });
  return rows.map((r) => ({ to: JSON.parse(r.to) as string[], subject: r.subject, text: r.text }));
}

beforeAll(async () => {
  t = await makeTestApp();
  const eng = bearer(t.orgA.users.engineer.token);
  const siteId = (
    await request(t.app)
      .post('/api/sites')
      .set(...eng)
      .send({ name: SITE_NAME })
  ).body.id as string;
  studyId = await approveStudy(t, siteId, smallModel());
  labelCodes = (
    await request(t.app)
      .get(`/api/studies/${studyId}/labels`)
      .set(...eng)
  ).body.labels.map((l: { code: string }) => l.code);
  const report = await request(t.app)
    .post(`/api/labels/${labelCodes[0]}/reports`)
    .set(...bearer(t.orgA.users.electrician.token))
    .field('kind', 'other')
    .field('text', 'Label faded, hard to read');
  expect(report.status).toBe(201);
  const now = new Date();
  later = new Date(Date.UTC(now.getUTCFullYear() + 6, now.getUTCMonth(), 15, 12));
  // An inactive safety officer: never a recipient.
  await User.create({
    id: randomUUID(),
    organizationId: t.orgA.id,
    email: 'former-safety@org-a.example',
    name: 'Former safety officer',
    role: 'safety',
    passwordHash: await hashPassword('not-used-anywhere-1'),
    active: false,
  });
});
afterAll(async () => t.close());

describe('reminder rules', () => {
  it('start empty, with the default reminder hour 6 UTC (organization settings default)', async () => {
    const res = await request(t.app)
      .get('/api/reminder-rules')
      .set(...safetyA());
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ rules: [], reminderHourUtc: 6 });
  });

  it('name the fields of a bad rule', async () => {
    const bad = await request(t.app)
      .post('/api/reminder-rules')
      .set(...safetyA())
      .send({ name: ' ', lists: ['no-such-list'], emails: ['not-an-address'] });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(expect.arrayContaining(['name', 'lists[0]', 'emails[0]']));
    const nobody = await request(t.app)
      .post('/api/reminder-rules')
      .set(...safetyA())
      .send({ name: 'Nobody', lists: ['open-reports'] });
    expect(nobody.status).toBe(400);
    expect(nobody.body.error.fields).toHaveProperty('roles');
    const noList = await request(t.app)
      .post('/api/reminder-rules')
      .set(...safetyA())
      .send({ name: 'No list', lists: [], roles: ['safety'] });
    expect(noList.status).toBe(400);
    expect(noList.body.error.fields).toHaveProperty('lists');
  });

  it('are created, changed and deleted, each with an audit event, and stay in their organization', async () => {
    const created = await request(t.app)
      .post('/api/reminder-rules')
      .set(...adminA())
      .send({
        name: 'Temporary rule',
        lists: ['open-reports'],
        roles: ['engineer'],
        emails: ['Outside@Contractor.example'],
      });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({
      name: 'Temporary rule',
      enabled: true,
      onlyWhenSomething: true,
      lists: ['open-reports'],
      roles: ['engineer'],
      emails: ['outside@contractor.example'],
      lastSentAt: null,
    });
    const id = created.body.id as string;

    const put = await request(t.app)
      .put(`/api/reminder-rules/${id}`)
      .set(...safetyA())
      .send({
        name: 'Temporary rule, renamed',
        lists: ['open-reports', 'stale-studies'],
        roles: ['engineer'],
        enabled: false,
      });
    expect(put.status).toBe(200);
    expect(put.body).toMatchObject({
      name: 'Temporary rule, renamed',
      enabled: false,
      lists: ['open-reports', 'stale-studies'],
      emails: [],
    });

    expect(
      (
        await request(t.app)
          .put(`/api/reminder-rules/${id}`)
          .set(...safetyB())
          .send({ name: 'x', lists: ['open-reports'], roles: ['safety'] })
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .delete(`/api/reminder-rules/${id}`)
          .set(...safetyB())
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .get('/api/reminder-rules')
          .set(...safetyB())
      ).body.rules,
    ).toEqual([]);

    const del = await request(t.app)
      .delete(`/api/reminder-rules/${id}`)
      .set(...safetyA());
    expect(del.status).toBe(200);
    expect(del.body).toEqual({ ok: true });
    expect(
      (
        await request(t.app)
          .delete(`/api/reminder-rules/${id}`)
          .set(...safetyA())
      ).status,
    ).toBe(404);

    const actions = (await AuditEvent.findAll({ where: { entityId: id }, order: [['createdAt', 'ASC']] })).map(
      (e) => e.action,
    );
    expect(actions).toEqual(['reminder-rule.created', 'reminder-rule.updated', 'reminder-rule.deleted']);
  });
});

describe('reminder content, received by the local SMTP sink', () => {
  let ruleId = '';

  beforeAll(async () => {
    const res = await request(t.app)
      .post('/api/reminder-rules')
      .set(...safetyA())
      .send({
        name: 'Morning digest',
        lists: ['review-overdue', 'not-installed', 'open-reports', 'stale-studies'],
        roles: ['safety', 'engineer'],
        emails: ['contractor@outside.example'],
      });
    expect(res.status).toBe(201);
    ruleId = res.body.id;
    // An address outside the organization, added by the safety officer, is mailed once an admin approves it.
    const approved = await request(t.app)
      .post(`/api/reminder-rules/${ruleId}/approve-emails`)
      .set(...adminA())
      .send({ emails: ['contractor@outside.example'] });
    expect(approved.status).toBe(200);
  });

  it('goes to every active user of the roles plus the further addresses, one message each, with counts, rows and links', async () => {
    t.setNow(later);
    const before = (await reminderMail(t.orgA.id)).length;
    const res = await request(t.app)
      .post('/api/reminders/send-now')
      .set(...safetyA())
      .send({ ruleId });
    t.setNow(null);
    expect(res.status).toBe(200);
    // Expected items: 1 study past review (approved 6 years ago; interval 60 months), every label not installed
    // (issued more than 30 days ago, none installed), 1 open field report, no stale study (no later revision).
    const expectedItems = 1 + labelCodes.length + 1 + 0;
    const recipients = ['contractor@outside.example', 'engineer@org-a.example', 'safety@org-a.example'];
    expect(res.body.deliveries).toEqual([
      expect.objectContaining({
        ruleId,
        ruleName: 'Morning digest',
        trigger: 'manual',
        status: 'sent',
        recipients,
        itemCount: expectedItems,
      }),
    ]);

    const mails = (await reminderMail(t.orgA.id)).slice(before);
    expect(mails.map((m) => m.to).sort()).toEqual(recipients.map((r) => [r]));
    const text = mails[0].text;
    expect(mails[0].subject).toBe(`Emberline reminder: ${expectedItems} items need attention (Morning digest)`);
    expect(text).toContain('Test Organization A');
    expect(text).toContain('Studies past review: 1');
    expect(text).toContain(`Labels not installed: ${labelCodes.length}`);
    expect(text).toContain('Open field reports: 1');
    expect(text).toContain('Stale studies: 0');
    expect(text).toContain(`${SITE_NAME} · Study: Label test study · Rev: 1`);
    for (const code of labelCodes.slice(0, 10)) expect(text).toContain(code);
    if (labelCodes.length > 10) expect(text).toContain(`and ${labelCodes.length - 10} more`);
    for (const list of ['review-overdue', 'not-installed', 'open-reports', 'stale-studies']) {
      expect(text).toContain(`${t.config.publicBaseUrl}/attention/${list}`);
    }
    expect(text).not.toContain('/attention/review-due-30');
    expect(text).toMatch(/reviewed and approved the study/);
    expect(text).toMatch(/qualified, licensed engineer/);
    // Every message is the same digest.
    expect(new Set(mails.map((m) => m.text)).size).toBe(1);
  });

  it('records the delivery and the audit events (reminders.sent, mail.sent per recipient)', async () => {
    const list = await request(t.app)
      .get('/api/reminders/deliveries')
      .set(...adminA());
    expect(list.status).toBe(200);
    expect(list.body.deliveries[0]).toMatchObject({
      ruleId,
      status: 'sent',
      trigger: 'manual',
      message: 'Sent to 3 recipients',
    });
    const rules = await request(t.app)
      .get('/api/reminder-rules')
      .set(...safetyA());
    expect(rules.body.rules.find((r: { id: string }) => r.id === ruleId).lastSentAt).toEqual(expect.any(String));
    const sent = await AuditEvent.findAll({
      where: { organizationId: t.orgA.id, action: 'reminders.sent', entityId: ruleId },
    });
    expect(sent).toHaveLength(1);
    expect(JSON.parse(sent[0].summary)).toMatchObject({ status: 'sent', trigger: 'manual', recipients: 3 });
    const mailAudit = (await AuditEvent.findAll({ where: { organizationId: t.orgA.id, action: 'mail.sent' } }))
      .map((e) => JSON.parse(e.summary))
      .filter((s) => s.kind === 'reminder');
    expect(mailAudit.map((s) => s.to[0]).sort()).toEqual([
      'contractor@outside.example',
      'engineer@org-a.example',
      'safety@org-a.example',
    ]);
  });

  it('is skipped when every chosen list is empty and the rule says so; sent anyway when it does not', async () => {
    // Today (real clock): the study is fresh and the labels were issued minutes ago; only the stale list is chosen.
    const quiet = await request(t.app)
      .post('/api/reminder-rules')
      .set(...safetyA())
      .send({ name: 'Quiet', lists: ['stale-studies'], roles: ['safety'] });
    const loud = await request(t.app)
      .post('/api/reminder-rules')
      .set(...safetyA())
      .send({ name: 'Always', lists: ['stale-studies'], roles: ['safety'], onlyWhenSomething: false });
    const before = (await reminderMail(t.orgA.id)).length;
    const q = await request(t.app)
      .post('/api/reminders/send-now')
      .set(...safetyA())
      .send({ ruleId: quiet.body.id });
    expect(q.body.deliveries[0]).toMatchObject({
      status: 'skipped',
      itemCount: 0,
      recipients: [],
      message: 'Nothing to report: every chosen list is empty',
    });
    expect((await reminderMail(t.orgA.id)).length).toBe(before);
    const l = await request(t.app)
      .post('/api/reminders/send-now')
      .set(...safetyA())
      .send({ ruleId: loud.body.id });
    expect(l.body.deliveries[0]).toMatchObject({ status: 'sent', itemCount: 0, recipients: ['safety@org-a.example'] });
    const mails = (await reminderMail(t.orgA.id)).slice(before);
    expect(mails).toHaveLength(1);
    expect(mails[0].subject).toBe('Emberline reminder: nothing needs attention (Always)');
    expect(mails[0].text).toContain('Stale studies: 0');
    for (const id of [quiet.body.id, loud.body.id])
      expect(
        (
          await request(t.app)
            .delete(`/api/reminder-rules/${id}`)
            .set(...safetyA())
        ).status,
      ).toBe(200);
  });

  it('send-now without a rule sends every enabled rule, each time it is asked', async () => {
    const off = await request(t.app)
      .post('/api/reminder-rules')
      .set(...safetyA())
      .send({ name: 'Switched off', lists: ['open-reports'], roles: ['safety'], enabled: false });
    t.setNow(later);
    const first = await request(t.app)
      .post('/api/reminders/send-now')
      .set(...adminA())
      .send({});
    const second = await request(t.app)
      .post('/api/reminders/send-now')
      .set(...adminA())
      .send({});
    t.setNow(null);
    for (const res of [first, second]) {
      expect(res.status).toBe(200);
      expect(res.body.deliveries.map((d: { ruleName: string; status: string }) => [d.ruleName, d.status])).toEqual([
        ['Morning digest', 'sent'],
      ]);
    }
    expect(
      (
        await request(t.app)
          .delete(`/api/reminder-rules/${off.body.id}`)
          .set(...safetyA())
      ).status,
    ).toBe(200);
  });

  it('send-now refuses a rule of another organization', async () => {
    const res = await request(t.app)
      .post('/api/reminders/send-now')
      .set(...safetyB())
      .send({ ruleId });
    expect(res.status).toBe(404);
  });
});

describe('the daily job', () => {
  let quietB = '';

  beforeAll(async () => {
    // Organization B has no studies: every list is empty there.
    const res = await request(t.app)
      .post('/api/reminder-rules')
      .set(...safetyB())
      .send({ name: 'B digest', lists: ['open-reports'], roles: ['safety'] });
    quietB = res.body.id;
  });
  afterEach(() => t.setNow(null));

  const dailyOf = (deliveries: { ruleName: string; status: string; trigger: string }[]) =>
    deliveries.map((d) => [d.ruleName, d.status, d.trigger]).sort();

  it('sends nothing before the reminder hour (06:00 UTC)', async () => {
    t.setNow(at(0, 5, 59));
    expect(await runDueReminders(t.ctx)).toEqual([]);
  });

  it('sends each enabled rule once per day from the reminder hour, again the next day', async () => {
    const mailsBefore = (await reminderMail(t.orgA.id)).length;
    t.setNow(at(0, 6, 0));
    expect(dailyOf(await runDueReminders(t.ctx))).toEqual([
      ['B digest', 'skipped', 'daily'],
      ['Morning digest', 'sent', 'daily'],
    ]);
    expect((await reminderMail(t.orgA.id)).length).toBe(mailsBefore + 3);

    // Later the same day: nothing new.
    t.setNow(at(0, 6, 5));
    expect(await runDueReminders(t.ctx)).toEqual([]);
    t.setNow(at(0, 23, 59));
    expect(await runDueReminders(t.ctx)).toEqual([]);
    expect((await reminderMail(t.orgA.id)).length).toBe(mailsBefore + 3);

    // The next day: before the hour nothing, from the hour once more.
    t.setNow(at(1, 0, 30));
    expect(await runDueReminders(t.ctx)).toEqual([]);
    t.setNow(at(1, 9, 0));
    expect(dailyOf(await runDueReminders(t.ctx))).toEqual([
      ['B digest', 'skipped', 'daily'],
      ['Morning digest', 'sent', 'daily'],
    ]);
    expect((await reminderMail(t.orgA.id)).length).toBe(mailsBefore + 6);
    expect(await reminderMail(t.orgB.id)).toEqual([]);

    const dayKeys = (await ReminderDeliveryRow.findAll({ where: { trigger: 'daily' } })).map((d) => d.dayKey);
    expect(dayKeys.sort()).toEqual(
      [
        at(0, 6).toISOString().slice(0, 10),
        at(0, 6).toISOString().slice(0, 10),
        at(1, 6).toISOString().slice(0, 10),
        at(1, 6).toISOString().slice(0, 10),
      ].sort(),
    );
  });

  it('never sends a rule twice on one day when two runs race (as two server instances would)', async () => {
    const mailsBefore = (await reminderMail(t.orgA.id)).length;
    t.setNow(at(2, 7, 0));
    const [a, b] = await Promise.all([runDueReminders(t.ctx), runDueReminders(t.ctx)]);
    expect(dailyOf([...a, ...b])).toEqual([
      ['B digest', 'skipped', 'daily'],
      ['Morning digest', 'sent', 'daily'],
    ]);
    expect((await reminderMail(t.orgA.id)).length).toBe(mailsBefore + 3);
  });

  it("follows the organization's reminder hour and leaves disabled rules out", async () => {
    const settings = await request(t.app)
      .put('/api/organization/settings')
      .set(...bearer(t.orgB.users.admin.token))
      .send({ reminderHourUtc: 20 });
    expect(settings.status).toBe(200);
    await request(t.app)
      .put(`/api/reminder-rules/${quietB}`)
      .set(...safetyB())
      .send({ name: 'B digest', lists: ['open-reports'], roles: ['safety'], onlyWhenSomething: false });
    t.setNow(at(3, 19, 59));
    expect(dailyOf(await runDueReminders(t.ctx))).toEqual([['Morning digest', 'sent', 'daily']]);
    t.setNow(at(3, 20, 0));
    const b = await runDueReminders(t.ctx);
    expect(b).toEqual([
      expect.objectContaining({
        ruleName: 'B digest',
        status: 'sent',
        recipients: ['safety@org-b.example'],
        itemCount: 0,
      }),
    ]);
    const mailB = await reminderMail(t.orgB.id);
    expect(mailB).toHaveLength(1);
    expect(mailB[0].to).toEqual(['safety@org-b.example']);

    await request(t.app)
      .put(`/api/reminder-rules/${quietB}`)
      .set(...safetyB())
      .send({ name: 'B digest', lists: ['open-reports'], roles: ['safety'], enabled: false });
    t.setNow(at(4, 21, 0));
    expect(dailyOf(await runDueReminders(t.ctx))).toEqual([['Morning digest', 'sent', 'daily']]);
  });

  it('marks the delivery failed, with the reason, when the mail server refuses', async () => {
    const real = t.ctx.mail;
    // An SMTP server that is not there: nothing listens on this port.
    const port = await freePort();
    t.ctx.mail = createMailer({
      env: 'test',
      smtpUrl: `smtp://127.0.0.1:${port}`,
      mailFrom: t.config.mailFrom,
      mailSinkPort: 0,
    });
    try {
      t.setNow(at(5, 8, 0));
      const [d] = await runDueReminders(t.ctx);
      expect(d).toMatchObject({ ruleName: 'Morning digest', status: 'failed', trigger: 'daily' });
      expect(d.message).toMatch(/^Sent to 0 of 3; not sent to contractor@outside\.example: .*ECONNREFUSED/);
      const failed = await AuditEvent.count({ where: { organizationId: t.orgA.id, action: 'mail.failed' } });
      expect(failed).toBe(3);
    } finally {
      await t.ctx.mail.close();
      t.ctx.mail = real;
    }
  });
});

describe('seedDefaultReminderRules', () => {
  it('gives an organization two enabled rules: safety officers every list, engineers their own', async () => {
    await seedDefaultReminderRules(t.orgB.id);
    const res = await request(t.app)
      .get('/api/reminder-rules')
      .set(...safetyB());
    const seeded = res.body.rules.filter((r: { name: string }) => r.name !== 'B digest');
    expect(seeded).toHaveLength(2);
    const safety = seeded.find((r: { roles: string[] }) => r.roles.includes('safety'));
    const engineers = seeded.find((r: { roles: string[] }) => r.roles.includes('engineer'));
    expect(safety.lists).toHaveLength(7);
    expect(engineers.lists).toEqual(
      expect.arrayContaining(['review-overdue', 'review-due-30', 'stale-studies', 'open-reports']),
    );
    for (const r of seeded) expect(r).toMatchObject({ enabled: true, onlyWhenSomething: true });
  });
});
