/**
 * Invitations, password reset and password change: one-time links read from the mail the local SMTP sink received,
 * single use, expiry with an injected clock, replacement and revocation, and the end of old sessions.
 */
import { createHash, randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Express } from 'express';
import request from 'supertest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { migrate, openDb } from '../../server/db';
import { AuditEvent, CapturedMail, initModels, LinkToken, Organization, User } from '../../server/db/models';
import { hashLinkToken, newLinkToken } from '../../server/services/invitations';
import { bearer, makeTestApp, TEST_PASSWORD, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => t.close());

const adminA = () => bearer(t.orgA.users.admin.token);
const adminB = () => bearer(t.orgB.users.admin.token);
const NEW_PASSWORD = 'a-brand-new-passphrase';
const DAY_MS = 86_400_000;

/** The newest captured message to an address, and the one-time token in its link. */
async function lastMailTo(
  address: string,
  kind: string,
): Promise<{ subject: string; text: string; token: string; count: number }> {
  const rows = (await CapturedMail.findAll({ where: { kind }, order: [['receivedAt', 'ASC']] })).filter((r) =>
    (JSON.parse(r.to) as string[]).includes(address),
  );
  if (!rows.length) throw new Error(`no ${kind} mail to ${address}`);
  const last = rows[rows.length - 1];
  const path = kind === 'invitation' ? 'welcome' : 'reset-password';
  const m = new RegExp(`${t.config.publicBaseUrl.replace(/[.:/]/g, '\\$&')}/${path}/([A-Za-z0-9_-]+)`).exec(last.text);
  if (!m) throw new Error(`no link in: ${last.text}`);
  return { subject: last.subject, text: last.text, token: m[1], count: rows.length };
}

async function mailCountTo(address: string): Promise<number> {
  return (await CapturedMail.findAll()).filter((r) => (JSON.parse(r.to) as string[]).includes(address)).length;
}

async function invite(email: string, name = 'Invited Person', role = 'electrician') {
  return request(t.app)
    .post('/api/invitations')
    .set(...adminA())
    .send({ email, name, role });
}

const accept = (token: string, password = NEW_PASSWORD) =>
  request(t.app).post('/api/auth/accept-invitation').send({ token, password });
const linkInfo = (token: string) => request(t.app).post('/api/auth/link-info').send({ token });
const me = (token: string) =>
  request(t.app)
    .get('/api/auth/me')
    .set(...bearer(token));
const signIn = (email: string, password: string) => request(t.app).post('/api/auth/sign-in').send({ email, password });

/**
 * Accepts one invitation link `n` times at once. In-memory SQLite shares one connection between all transactions
 * (Sequelize), so concurrent transactions cannot be tried there: the race runs on PostgreSQL when TEST_DATABASE_URL
 * is set, and otherwise on a SQLite file (its own connection per transaction, like the real server).
 */
async function raceAcceptances(n: number): Promise<{ statuses: number[]; users: number }> {
  const send = async (app: Express, token: string) =>
    Promise.all(
      Array.from({ length: n }, (_, i) =>
        request(app)
          .post('/api/auth/accept-invitation')
          .send({ token, password: `racer-password-${i}` }),
      ),
    );
  if (t.db.dialect === 'postgres') {
    await invite('racer@org-a.example');
    const { token } = await lastMailTo('racer@org-a.example', 'invitation');
    const statuses = (await send(t.app, token)).map((r) => r.status);
    return {
      statuses,
      users: (
        await request(t.app)
          .get('/api/users')
          .set(...adminA())
      ).body.users.filter((u: { email: string }) => u.email === 'racer@org-a.example').length,
    };
  }
  // openDb binds the (global) models to the new database; the finally block binds them back to this file's.
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'emberline-race-'));
  const url = `sqlite:${path.join(dir, 'race.sqlite')}`;
  const db = await openDb(url);
  try {
    await migrate(db);
    const config = loadConfig({ NODE_ENV: 'test' }, { databaseUrl: url, jwtSecret: t.config.jwtSecret, dataDir: dir });
    const { app, ctx } = createApp({ config, db });
    const org = await Organization.create({ id: randomUUID(), name: 'Race organization' });
    const token = newLinkToken();
    await LinkToken.create({
      id: randomUUID(),
      organizationId: org.id,
      purpose: 'invitation',
      tokenHash: hashLinkToken(token),
      email: 'racer@race.example',
      name: 'Racer',
      role: 'engineer',
      userId: null,
      createdById: null,
      expiresAt: new Date(Date.now() + DAY_MS),
    });
    const statuses = (await send(app, token)).map((r) => r.status);
    const users = await User.count({ where: { email: 'racer@race.example' } });
    await ctx.mail.close();
    return { statuses, users };
  } finally {
    await db.close();
    initModels(t.db.sequelize);
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

async function actions(entityId: string): Promise<string[]> {
  return (await AuditEvent.findAll({ where: { entityId }, order: [['createdAt', 'ASC']] })).map((e) => e.action);
}

describe('invitations', () => {
  afterEach(() => t.setNow(null));

  it('e-mails a one-time link that creates the account once, in the inviting organization, with the role', async () => {
    const res = await invite('New.Electrician@Org-A.example', 'Nia Newcomer');
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      email: 'new.electrician@org-a.example',
      name: 'Nia Newcomer',
      role: 'electrician',
      status: 'pending',
      invitedBy: 'admin of org-a',
    });
    // 7 days (contract).
    expect(Date.parse(res.body.expiresAt) - Date.now()).toBeGreaterThan(7 * DAY_MS - 60_000);
    expect(Date.parse(res.body.expiresAt) - Date.now()).toBeLessThanOrEqual(7 * DAY_MS);

    const mail = await lastMailTo('new.electrician@org-a.example', 'invitation');
    expect(mail.subject).toBe('You are invited to Test Organization A on Emberline');
    expect(mail.text).toContain('as Electrician');
    expect(mail.token).toMatch(/^[A-Za-z0-9_-]{43}$/); // 32 bytes, base64url
    // Only the SHA-256 of the token is stored.
    const row = await LinkToken.findByPk(res.body.id);
    expect(row!.tokenHash).toBe(createHash('sha256').update(mail.token).digest('hex'));
    expect(JSON.stringify(row!.toJSON())).not.toContain(mail.token);

    const info = await linkInfo(mail.token);
    expect(info.status).toBe(200);
    expect(info.body).toMatchObject({
      purpose: 'invitation',
      email: 'new.electrician@org-a.example',
      name: 'Nia Newcomer',
      organizationName: 'Test Organization A',
      role: 'electrician',
    });

    const ok = await accept(mail.token);
    expect(ok.status).toBe(200);
    expect(ok.body.user).toMatchObject({
      email: 'new.electrician@org-a.example',
      name: 'Nia Newcomer',
      role: 'electrician',
    });
    const who = await me(ok.body.token);
    expect(who.status).toBe(200);
    expect(who.body.organization.id).toBe(t.orgA.id);
    expect((await signIn('new.electrician@org-a.example', NEW_PASSWORD)).status).toBe(200);

    const again = await accept(mail.token, 'another-password-123');
    expect(again.status).toBe(404);
    expect(again.body.error.message).toMatch(/already been accepted/);
    expect((await linkInfo(mail.token)).status).toBe(404);

    const list = await request(t.app)
      .get('/api/invitations')
      .set(...adminA());
    expect(list.body.invitations.find((i: { id: string }) => i.id === res.body.id).status).toBe('accepted');
    expect(await actions(res.body.id)).toEqual(['invitation.created', 'invitation.accepted']);
  });

  it('lets only one of several simultaneous uses of a link through', async () => {
    const outcome = await raceAcceptances(5);
    expect(outcome.statuses.filter((s) => s === 200)).toHaveLength(1);
    expect(outcome.statuses.filter((s) => s !== 200)).toEqual([404, 404, 404, 404]);
    expect(outcome.users).toBe(1);
  });

  it('refuses an address that already has an account here, or a pending invitation, naming the field', async () => {
    // Another organization's address is answered like a new one (tests/api/hardening.test.ts).
    const taken = await invite(t.orgA.users.engineer.email);
    expect(taken.status).toBe(409);
    expect(taken.body.error.fields).toHaveProperty('email');
    await invite('twice@org-a.example');
    const twice = await invite('twice@org-a.example');
    expect(twice.status).toBe(409);
    expect(twice.body.error.fields).toHaveProperty('email');
  });

  it('names the fields of a bad invitation', async () => {
    const res = await request(t.app)
      .post('/api/invitations')
      .set(...adminA())
      .send({ email: 'not-an-address', name: '', role: 'boss' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['email', 'name', 'role']));
  });

  it('refuses the link once it has expired (7 days + 1 minute later)', async () => {
    const res = await invite('late@org-a.example');
    const { token } = await lastMailTo('late@org-a.example', 'invitation');
    t.setNow(new Date(Date.now() + 7 * DAY_MS - 60_000));
    expect((await linkInfo(token)).status).toBe(200);
    t.setNow(new Date(Date.now() + 7 * DAY_MS + 60_000));
    const info = await linkInfo(token);
    expect(info.status).toBe(404);
    expect(info.body.error.message).toMatch(/expired/);
    expect((await accept(token)).status).toBe(404);
    const list = await request(t.app)
      .get('/api/invitations')
      .set(...adminA());
    expect(list.body.invitations.find((i: { id: string }) => i.id === res.body.id).status).toBe('expired');

    // Resending an expired invitation gives a new link for 7 more days; the old one stays dead.
    const resent = await request(t.app)
      .post(`/api/invitations/${res.body.id}/resend`)
      .set(...adminA());
    expect(resent.status).toBe(200);
    expect(resent.body.status).toBe('pending');
    const fresh = await lastMailTo('late@org-a.example', 'invitation');
    expect(fresh.token).not.toBe(token);
    expect((await accept(token)).status).toBe(404);
    expect((await accept(fresh.token)).status).toBe(200);
  });

  it('resending invalidates the old link', async () => {
    const res = await invite('resend@org-a.example', 'Rae Resend', 'safety');
    const first = await lastMailTo('resend@org-a.example', 'invitation');
    const resent = await request(t.app)
      .post(`/api/invitations/${res.body.id}/resend`)
      .set(...adminA());
    expect(resent.status).toBe(200);
    expect(resent.body).toMatchObject({ id: res.body.id, status: 'pending', role: 'safety' });
    const second = await lastMailTo('resend@org-a.example', 'invitation');
    expect(second.count).toBe(2);
    expect(second.token).not.toBe(first.token);
    const old = await linkInfo(first.token);
    expect(old.status).toBe(404);
    const ok = await accept(second.token);
    expect(ok.status).toBe(200);
    expect(ok.body.user.role).toBe('safety');
    expect(await actions(res.body.id)).toEqual(['invitation.created', 'invitation.resent', 'invitation.accepted']);
    // Accepted: nothing left to resend or revoke.
    expect(
      (
        await request(t.app)
          .post(`/api/invitations/${res.body.id}/resend`)
          .set(...adminA())
      ).status,
    ).toBe(409);
    expect(
      (
        await request(t.app)
          .delete(`/api/invitations/${res.body.id}`)
          .set(...adminA())
      ).status,
    ).toBe(409);
  });

  it('refuses a revoked invitation', async () => {
    const res = await invite('revoked@org-a.example');
    const { token } = await lastMailTo('revoked@org-a.example', 'invitation');
    const del = await request(t.app)
      .delete(`/api/invitations/${res.body.id}`)
      .set(...adminA());
    expect(del.status).toBe(200);
    expect(del.body.status).toBe('revoked');
    const info = await linkInfo(token);
    expect(info.status).toBe(404);
    expect(info.body.error.message).toMatch(/withdrawn/);
    expect((await accept(token)).status).toBe(404);
    expect(
      (
        await request(t.app)
          .post(`/api/invitations/${res.body.id}/resend`)
          .set(...adminA())
      ).status,
    ).toBe(409);
    expect(await actions(res.body.id)).toEqual(['invitation.created', 'invitation.revoked']);
  });

  it('answers 409 when the address got an account after the invitation was sent', async () => {
    await invite('meanwhile@org-a.example');
    const { token } = await lastMailTo('meanwhile@org-a.example', 'invitation');
    const created = await request(t.app)
      .post('/api/users')
      .set(...adminA())
      .send({
        email: 'meanwhile@org-a.example',
        name: 'Made directly',
        role: 'engineer',
        password: 'direct-password-1',
      });
    expect(created.status).toBe(201);
    const res = await accept(token);
    expect(res.status).toBe(409);
    expect(res.body.error.fields).toHaveProperty('email');
    // The link was not used up by the refused attempt.
    expect((await linkInfo(token)).status).toBe(200);
  });

  it('keeps invitations inside their organization', async () => {
    const res = await invite('private@org-a.example');
    expect(
      (
        await request(t.app)
          .post(`/api/invitations/${res.body.id}/resend`)
          .set(...adminB())
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .delete(`/api/invitations/${res.body.id}`)
          .set(...adminB())
      ).status,
    ).toBe(404);
    const listB = await request(t.app)
      .get('/api/invitations')
      .set(...adminB());
    expect(listB.body.invitations).toEqual([]);
  });

  it('refuses an unknown or malformed link with a message and field', async () => {
    const unknown = await linkInfo('A'.repeat(43));
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.message).toMatch(/not valid/);
    const short = await accept('short', 'x');
    expect(short.status).toBe(400);
    expect(Object.keys(short.body.error.fields)).toEqual(expect.arrayContaining(['token', 'password']));
  });
});

describe('password reset', () => {
  afterEach(() => t.setNow(null));

  /** A user of organization B made for one test (so other tests keep their sessions). */
  async function freshUser(email: string): Promise<{ email: string; token: string }> {
    const created = await request(t.app)
      .post('/api/users')
      .set(...adminB())
      .send({ email, name: 'Reset Subject', role: 'engineer', password: TEST_PASSWORD });
    expect(created.status).toBe(201);
    const s = await signIn(email, TEST_PASSWORD);
    return { email, token: s.body.token };
  }

  async function askReset(email: string) {
    const res = await request(t.app).post('/api/auth/password-reset').send({ email });
    await t.ctx.jobs.idle();
    return res;
  }

  it('answers ok for an unknown address, sends nothing and records nothing', async () => {
    const mailBefore = await CapturedMail.count();
    const res = await askReset('nobody-here@nowhere.example');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ ok: true });
    expect(await CapturedMail.count()).toBe(mailBefore);
    const audit = (await AuditEvent.findAll({ where: { action: 'password.reset-requested' } })).map((e) => e.summary);
    expect(audit.join()).not.toContain('nobody-here@nowhere.example');
  });

  it('mails a known address a link that works once; the new password ends every older session', async () => {
    const u = await freshUser('reset.me@org-b.example');
    const res = await askReset('Reset.Me@Org-B.example');
    expect(res.body).toEqual({ ok: true });
    const mail = await lastMailTo('reset.me@org-b.example', 'password-reset');
    expect(mail.subject).toBe('Reset your Emberline password');
    const info = await linkInfo(mail.token);
    expect(info.body).toMatchObject({ purpose: 'password-reset', email: 'reset.me@org-b.example' });
    // 1 hour (contract).
    expect(Date.parse(info.body.expiresAt) - Date.now()).toBeLessThanOrEqual(3600_000);
    expect(Date.parse(info.body.expiresAt) - Date.now()).toBeGreaterThan(3600_000 - 60_000);

    expect((await me(u.token)).status).toBe(200);
    const ok = await request(t.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token: mail.token, password: NEW_PASSWORD });
    expect(ok.status).toBe(200);
    expect(ok.body.user.email).toBe('reset.me@org-b.example');
    expect((await me(ok.body.token)).status).toBe(200);
    expect((await me(u.token)).status).toBe(401);
    expect((await signIn(u.email, TEST_PASSWORD)).status).toBe(401);
    expect((await signIn(u.email, NEW_PASSWORD)).status).toBe(200);

    const again = await request(t.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token: mail.token, password: 'yet-another-password' });
    expect(again.status).toBe(404);
    expect(again.body.error.message).toMatch(/already been used/);

    const userId = ok.body.user.id as string;
    expect(await actions(userId)).toEqual(expect.arrayContaining(['password.reset-requested', 'password.reset']));
  });

  it('replaces an older link by a newer one', async () => {
    await freshUser('twice.reset@org-b.example');
    await askReset('twice.reset@org-b.example');
    const first = await lastMailTo('twice.reset@org-b.example', 'password-reset');
    await askReset('twice.reset@org-b.example');
    const second = await lastMailTo('twice.reset@org-b.example', 'password-reset');
    expect(second.token).not.toBe(first.token);
    expect((await linkInfo(first.token)).status).toBe(404);
    expect(
      (
        await request(t.app)
          .post('/api/auth/password-reset/confirm')
          .send({ token: second.token, password: NEW_PASSWORD })
      ).status,
    ).toBe(200);
  });

  it('refuses the link after 1 hour', async () => {
    await freshUser('slow.reset@org-b.example');
    await askReset('slow.reset@org-b.example');
    const { token } = await lastMailTo('slow.reset@org-b.example', 'password-reset');
    t.setNow(new Date(Date.now() + 3600_000 + 60_000));
    const res = await request(t.app).post('/api/auth/password-reset/confirm').send({ token, password: NEW_PASSWORD });
    expect(res.status).toBe(404);
    expect(res.body.error.message).toMatch(/expired/);
  });

  it('sends nothing to a deactivated account', async () => {
    await freshUser('gone@org-b.example');
    const users = await request(t.app)
      .get('/api/users')
      .set(...adminB());
    const id = users.body.users.find((x: { email: string }) => x.email === 'gone@org-b.example').id;
    expect(
      (
        await request(t.app)
          .patch(`/api/users/${id}`)
          .set(...adminB())
          .send({ active: false })
      ).status,
    ).toBe(200);
    expect((await askReset('gone@org-b.example')).body).toEqual({ ok: true });
    expect(await mailCountTo('gone@org-b.example')).toBe(0);
  });

  it('names the fields of a bad request', async () => {
    const bad = await request(t.app).post('/api/auth/password-reset').send({ email: 'nope' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('email');
    const weak = await request(t.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token: 'A'.repeat(43), password: 'short' });
    expect(weak.status).toBe(400);
    expect(weak.body.error.fields).toHaveProperty('password');
  });
});

describe('password change', () => {
  it('needs the current password, ends every other session and returns a new one; open reset links die too', async () => {
    const email = 'changer@org-b.example';
    await request(t.app)
      .post('/api/users')
      .set(...adminB())
      .send({ email, name: 'Pat Changer', role: 'safety', password: TEST_PASSWORD });
    const one = (await signIn(email, TEST_PASSWORD)).body.token as string;
    const two = (await signIn(email, TEST_PASSWORD)).body.token as string;
    await request(t.app).post('/api/auth/password-reset').send({ email });
    await t.ctx.jobs.idle();
    const reset = await lastMailTo(email, 'password-reset');

    const wrong = await request(t.app)
      .post('/api/auth/password')
      .set(...bearer(one))
      .send({ currentPassword: 'not-the-password', newPassword: NEW_PASSWORD });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields).toHaveProperty('currentPassword');
    const weak = await request(t.app)
      .post('/api/auth/password')
      .set(...bearer(one))
      .send({ currentPassword: TEST_PASSWORD, newPassword: 'short' });
    expect(weak.status).toBe(400);
    expect(weak.body.error.fields).toHaveProperty('newPassword');

    const ok = await request(t.app)
      .post('/api/auth/password')
      .set(...bearer(one))
      .send({ currentPassword: TEST_PASSWORD, newPassword: NEW_PASSWORD });
    expect(ok.status).toBe(200);
    expect((await me(ok.body.token)).status).toBe(200);
    expect((await me(one)).status).toBe(401);
    expect((await me(two)).status).toBe(401);
    expect((await signIn(email, NEW_PASSWORD)).status).toBe(200);
    expect((await signIn(email, TEST_PASSWORD)).status).toBe(401);
    expect((await linkInfo(reset.token)).status).toBe(404);
    expect(await actions(ok.body.user.id)).toContain('password.changed');
  });

  it('is refused signed out', async () => {
    const res = await request(t.app)
      .post('/api/auth/password')
      .send({ currentPassword: TEST_PASSWORD, newPassword: NEW_PASSWORD });
    expect(res.status).toBe(401);
  });
});

describe('rate limits', () => {
  it('limit password-reset requests and link checks per address, like sign-in', async () => {
    const { app, ctx } = createApp({ config: t.config, db: t.db, signInLimitPerMinute: 2 });
    try {
      const codes: number[] = [];
      for (let i = 0; i < 3; i++)
        codes.push(
          (await request(app).post('/api/auth/password-reset').send({ email: 'nobody@nowhere.example' })).status,
        );
      expect(codes).toEqual([200, 200, 429]);
      const info: number[] = [];
      for (let i = 0; i < 3; i++)
        info.push(
          (
            await request(app)
              .post('/api/auth/link-info')
              .send({ token: 'B'.repeat(43) })
          ).status,
        );
      expect(info).toEqual([404, 404, 429]);
    } finally {
      await ctx.jobs.idle();
      await ctx.mail.close();
    }
  });
});
