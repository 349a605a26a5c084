/**
 * Mail: the local SMTP sink over a real socket, the mailer's audit events, the outbox scoped to the organization, and
 * the SMTP configuration.
 */
import os from 'node:os';
import path from 'node:path';
import nodemailer from 'nodemailer';
import request from 'supertest';
import { ConfigError, loadConfig } from '../../server/config';
import { AuditEvent, CapturedMail } from '../../server/db/models';
import { createMailer, startMailSink, type CapturedMessage } from '../../server/mail';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';
import { freePort } from '../helpers/ports';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

async function auditOf(organizationId: string, action: string) {
  const rows = await AuditEvent.findAll({ where: { organizationId, action }, order: [['createdAt', 'ASC']] });
  return rows.map((r) => JSON.parse(r.summary) as Record<string, unknown>);
}

describe('the local sink', () => {
  it('is what the test app sends through (no SMTP_URL outside production)', async () => {
    expect(t.config.smtpUrl).toBeNull();
    expect(t.ctx.mail.transport).toBe('local-sink');
    expect(await t.ctx.mail.start()).toMatch(/local sink on 127\.0\.0\.1:\d+/);
  });

  it('captures a message sent over SMTP with its organization, kind, sender, recipients and text, and audits it', async () => {
    const r = await t.ctx.mail.send({
      organizationId: t.orgA.id,
      kind: 'reminder',
      to: ['First.Person@org-a.example', 'second@elsewhere.example'],
      subject: 'Sink check — ünïcode subject',
      text: 'Line one\nLine two',
      html: '<p>Line one</p>',
      actorId: t.orgA.users.admin.id,
    });
    expect(r).toMatchObject({ ok: true, error: null, rejected: [] });
    const row = await CapturedMail.findOne({ where: { subject: 'Sink check — ünïcode subject' } });
    expect(row).not.toBeNull();
    expect(row!.organizationId).toBe(t.orgA.id);
    expect(row!.kind).toBe('reminder');
    expect(row!.from).toBe(t.config.mailFrom);
    expect(JSON.parse(row!.to)).toEqual(['first.person@org-a.example', 'second@elsewhere.example']);
    expect(row!.text.trim()).toBe('Line one\nLine two');
    expect(row!.messageId).toBe(r.messageId);

    const audit = await auditOf(t.orgA.id, 'mail.sent');
    expect(audit).toContainEqual(
      expect.objectContaining({
        to: ['First.Person@org-a.example', 'second@elsewhere.example'],
        subject: 'Sink check — ünïcode subject',
        kind: 'reminder',
      }),
    );
  });

  it('refuses a client without the sink credentials, so no other local process can file mail', async () => {
    const got: CapturedMessage[] = [];
    const sink = await startMailSink({ store: async (m) => void got.push(m) });
    try {
      const base = { host: sink.host, port: sink.port, secure: false, ignoreTLS: true } as const;
      const message = { from: 'a@b.example', to: 'c@d.example', subject: 'x', text: 'y' };
      await expect(nodemailer.createTransport(base).sendMail(message)).rejects.toThrow();
      await expect(
        nodemailer
          .createTransport({ ...base, auth: { user: sink.auth.user, pass: 'wrong-password' } })
          .sendMail(message),
      ).rejects.toThrow();
      expect(got).toHaveLength(0);
      await nodemailer
        .createTransport({ ...base, auth: sink.auth })
        .sendMail({ ...message, headers: { 'X-Emberline-Organization': 'org-1', 'X-Emberline-Kind': 'invitation' } });
      expect(got).toEqual([
        expect.objectContaining({
          organizationId: 'org-1',
          kind: 'invitation',
          to: ['c@d.example'],
          subject: 'x',
          from: 'a@b.example',
        }),
      ]);
    } finally {
      await sink.close();
    }
  });

  it('records mail.failed, and does not throw, when the SMTP server cannot be reached', async () => {
    const port = await freePort();
    const failing = createMailer({
      env: 'test',
      smtpUrl: `smtp://127.0.0.1:${port}`,
      mailFrom: 'Emberline <no-reply@test.example>',
      mailSinkPort: 0,
    });
    expect(failing.transport).toBe('smtp');
    try {
      const r = await failing.send({
        organizationId: t.orgB.id,
        kind: 'invitation',
        to: 'someone@org-b.example',
        subject: 'Unreachable',
        text: 'x',
      });
      expect(r.ok).toBe(false);
      expect(r.error).toMatch(/ECONNREFUSED|connect/i);
    } finally {
      await failing.close();
    }
    expect(await auditOf(t.orgB.id, 'mail.failed')).toContainEqual(
      expect.objectContaining({
        to: ['someone@org-b.example'],
        subject: 'Unreachable',
        kind: 'invitation',
        error: expect.any(String),
      }),
    );
    expect(await CapturedMail.count({ where: { subject: 'Unreachable' } })).toBe(0);
  });
});

describe('GET /outbox', () => {
  beforeAll(async () => {
    await t.ctx.mail.send({
      organizationId: t.orgA.id,
      kind: 'reminder',
      to: 'a@org-a.example',
      subject: 'For A only',
      text: 'a',
    });
    await t.ctx.mail.send({
      organizationId: t.orgB.id,
      kind: 'reminder',
      to: 'b@org-b.example',
      subject: 'For B only',
      text: 'b',
    });
  });

  it("shows an admin only their organization's mail, newest first", async () => {
    const a = await request(t.app)
      .get('/api/outbox')
      .set(...bearer(t.orgA.users.admin.token));
    expect(a.status).toBe(200);
    expect(a.body.transport).toBe('local-sink');
    const subjectsA = a.body.messages.map((m: { subject: string }) => m.subject);
    expect(subjectsA).toContain('For A only');
    expect(subjectsA).not.toContain('For B only');
    expect(subjectsA.indexOf('For A only')).toBeLessThan(subjectsA.indexOf('Sink check — ünïcode subject'));
    const times = a.body.messages.map((m: { receivedAt: string }) => Date.parse(m.receivedAt));
    expect([...times].sort((x, y) => y - x)).toEqual(times);

    const b = await request(t.app)
      .get('/api/outbox')
      .set(...bearer(t.orgB.users.admin.token));
    const subjectsB = b.body.messages.map((m: { subject: string }) => m.subject);
    expect(subjectsB).toContain('For B only');
    expect(subjectsB).not.toContain('For A only');
  });

  it('is for admins only', async () => {
    for (const role of ['engineer', 'electrician', 'safety'] as const) {
      const res = await request(t.app)
        .get('/api/outbox')
        .set(...bearer(t.orgA.users[role].token));
      expect(res.status).toBe(403);
    }
  });
});

describe('mail configuration', () => {
  const dataDir = path.join(os.tmpdir(), 'emberline-mail-config');
  const secret = 'x'.repeat(40);

  it('refuses to start in production without SMTP_URL, naming the setting', () => {
    expect(() => loadConfig({ NODE_ENV: 'production', JWT_SECRET: secret, DATA_DIR: dataDir })).toThrow(ConfigError);
    expect(() => loadConfig({ NODE_ENV: 'production', JWT_SECRET: secret, DATA_DIR: dataDir })).toThrow(
      /SMTP_URL: required in production/,
    );
  });

  it('takes SMTP_URL and MAIL_FROM in production', () => {
    const c = loadConfig({
      NODE_ENV: 'production',
      JWT_SECRET: secret,
      DATA_DIR: dataDir,
      SMTP_URL: 'smtp://mailer:pw@smtp.example.net:587',
      MAIL_FROM: 'Plant Safety <safety@example.net>',
    });
    expect(c.smtpUrl).toBe('smtp://mailer:pw@smtp.example.net:587');
    expect(c.mailFrom).toBe('Plant Safety <safety@example.net>');
    expect(createMailer(c).transport).toBe('smtp');
  });

  it('defaults the sender to no-reply at the public host', () => {
    const c = loadConfig({
      NODE_ENV: 'development',
      JWT_SECRET: secret,
      DATA_DIR: dataDir,
      PUBLIC_BASE_URL: 'https://labels.example.net',
    });
    expect(c.mailFrom).toBe('Emberline <no-reply@labels.example.net>');
    expect(c.smtpUrl).toBeNull();
  });

  it('refuses an SMTP_URL that is not smtp:// or smtps://, and a bad MAIL_SINK_PORT', () => {
    expect(() =>
      loadConfig({
        NODE_ENV: 'development',
        JWT_SECRET: secret,
        DATA_DIR: dataDir,
        SMTP_URL: 'http://smtp.example.net',
      }),
    ).toThrow(/SMTP_URL/);
    expect(() =>
      loadConfig({ NODE_ENV: 'development', JWT_SECRET: secret, DATA_DIR: dataDir, MAIL_SINK_PORT: '70000' }),
    ).toThrow(/MAIL_SINK_PORT/);
  });
});
