/**
 * Hold under abuse (medium and low): headers that depend on how the app is reached, bodies the parser cannot read,
 * tokens without an expiry, cross-organization e-mail addresses, per-account sign-in backoff, photo re-encoding,
 * the audit log's database triggers, external reminder addresses, and form-encoded field reports.
 */
import { randomUUID } from 'node:crypto';
import jwt from 'jsonwebtoken';
import request from 'supertest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { CapturedMail, User } from '../../server/db/models';
import { makeTestApp, TEST_PASSWORD, TEST_SECRET, type TestApp } from '../helpers/testApp';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
}, 60_000);
afterAll(async () => {
  await t.close();
});

describe('content security policy over plain HTTP and over TLS', () => {
  const csp = (res: request.Response) => String(res.headers['content-security-policy'] ?? '');

  it('plain HTTP (a LAN install reached by its IP address): no upgrade-insecure-requests', async () => {
    const res = await request(t.app).get('/api/health');
    expect(csp(res)).toContain("default-src 'self'");
    expect(csp(res)).not.toContain('upgrade-insecure-requests');
    const page = await request(t.app).get('/l/ABC123');
    expect(csp(page)).not.toContain('upgrade-insecure-requests');
  });

  it('behind a trusted proxy that terminated TLS (X-Forwarded-Proto: https): upgrade-insecure-requests', async () => {
    const res = await request(t.app).get('/api/health').set('X-Forwarded-Proto', 'https');
    expect(csp(res)).toContain('upgrade-insecure-requests');
  });

  it('PUBLIC_BASE_URL is https: upgrade-insecure-requests on every response', async () => {
    const config = loadConfig({ NODE_ENV: 'test' }, { ...t.config, publicBaseUrl: 'https://labels.example.net' });
    const { app } = createApp({ config, db: t.db, mail: t.ctx.mail });
    const res = await request(app).get('/api/health');
    expect(csp(res)).toContain('upgrade-insecure-requests');
  });
});

describe('bodies the parser cannot read answer 4xx naming the body', () => {
  const post = () =>
    request(t.app).post('/api/calc/incident-energy').set('Authorization', `Bearer ${t.orgA.users.engineer.token}`);
  const valid = JSON.stringify({ voltageV: 480 });

  it.each(['gzip', 'br', 'deflate'])('Content-Encoding: %s on a body that is not compressed → 400', async (enc) => {
    const res = await post().set('Content-Type', 'application/json').set('Content-Encoding', enc).send(valid);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_request');
    expect(typeof res.body.error.fields.body).toBe('string');
  });

  it('an unknown Content-Encoding → 415 naming the body', async () => {
    const res = await post().set('Content-Type', 'application/json').set('Content-Encoding', 'x-squeeze').send(valid);
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported_media_type');
    expect(res.body.error.message).toMatch(/Content-Encoding/);
    expect(typeof res.body.error.fields.body).toBe('string');
  });

  it.each(['klingon-8', 'utf-99', 'latin1'])('charset=%s → 415 naming the body', async (charset) => {
    const res = await post().set('Content-Type', `application/json; charset=${charset}`).send(valid);
    expect(res.status).toBe(415);
    expect(res.body.error.message).toMatch(/charset/);
    expect(typeof res.body.error.fields.body).toBe('string');
  });

  it('JSON nested 5 000 objects deep → 400 naming the body, on every kind of route', async () => {
    const deep = '{"a":'.repeat(5000) + '1' + '}'.repeat(5000);
    const deepArrays = '['.repeat(5000) + ']'.repeat(5000);
    for (const url of ['/api/calc/incident-energy', '/api/sites', '/api/auth/sign-in']) {
      for (const text of [deep, deepArrays]) {
        const res = await request(t.app)
          .post(url)
          .set('Authorization', `Bearer ${t.orgA.users.engineer.token}`)
          .set('Content-Type', 'application/json')
          .send(text);
        expect(res.status).toBe(400);
        expect(res.body.error.fields.body).toMatch(/deeper than 64/);
      }
    }
  });

  it('64 levels are accepted by the parser; brackets inside strings do not count', async () => {
    const at64 = '{"a":'.repeat(64) + '1' + '}'.repeat(64);
    const res = await post().set('Content-Type', 'application/json').send(at64);
    expect(res.status).toBe(400);
    expect(res.body.error.fields.body).toBeUndefined(); // refused by the schema (a field), not by the depth cap
    const inString = JSON.stringify({ voltageV: 480, note: '['.repeat(500) + '\\"{'.repeat(100) });
    const res2 = await post().set('Content-Type', 'application/json').send(inString);
    expect(res2.body.error?.fields?.body).toBeUndefined();
  });
});

describe('tokens must expire within the configured lifetime', () => {
  const claimsOf = (token: string) => {
    const d = jwt.decode(token) as Record<string, unknown>;
    return { org: d.org, role: d.role, ver: d.ver, sub: d.sub };
  };
  const me = (token: string) => request(t.app).get('/api/auth/me').set('Authorization', `Bearer ${token}`);

  it('a token signed with the secret but without exp is refused', async () => {
    const token = jwt.sign({ ...claimsOf(t.orgA.users.engineer.token), jti: randomUUID() }, TEST_SECRET);
    expect((jwt.decode(token) as Record<string, unknown>).exp).toBeUndefined();
    expect((await me(token)).status).toBe(401);
  });

  it('a token without iat is refused', async () => {
    const token = jwt.sign({ ...claimsOf(t.orgA.users.engineer.token), jti: randomUUID() }, TEST_SECRET, {
      expiresIn: 3600,
      noTimestamp: true,
    });
    expect((await me(token)).status).toBe(401);
  });

  it('a token living longer than JWT_TTL_HOURS is refused; one within it is accepted', async () => {
    const ttl = t.config.jwtTtlHours * 3600;
    const base = { ...claimsOf(t.orgA.users.engineer.token) };
    const long = jwt.sign({ ...base, jti: randomUUID() }, TEST_SECRET, { expiresIn: ttl + 3600 });
    expect((await me(long)).status).toBe(401);
    const year = jwt.sign({ ...base, jti: randomUUID() }, TEST_SECRET, { expiresIn: '365d' });
    expect((await me(year)).status).toBe(401);
    // Back-dated iat with a far exp: exp - iat within the limit but exp far beyond now + lifetime is refused too.
    const now = Math.floor(Date.now() / 1000);
    const future = jwt.sign(
      { ...base, jti: randomUUID(), iat: now + 30 * 86400, exp: now + 30 * 86400 + 60 },
      TEST_SECRET,
    );
    expect((await me(future)).status).toBe(401);
    const ok = jwt.sign({ ...base, jti: randomUUID() }, TEST_SECRET, { expiresIn: ttl });
    expect((await me(ok)).status).toBe(200);
  });
});

describe("another organization's people are not revealed by invitations or new users", () => {
  const adminA = () => ['Authorization', `Bearer ${t.orgA.users.admin.token}`] as [string, string];
  const invite = (email: string) =>
    request(t.app)
      .post('/api/invitations')
      .set(...adminA())
      .send({ email, name: 'Someone', role: 'electrician' });

  it('inviting an address of another organization answers like a new address; accepting tells the owner to sign in', async () => {
    const fresh = await invite('nobody.yet@org-a.example');
    const foreign = await invite(t.orgB.users.engineer.email);
    expect(foreign.status).toBe(fresh.status);
    expect(foreign.status).toBe(201);
    expect(Object.keys(foreign.body).sort()).toEqual(Object.keys(fresh.body).sort());
    expect(foreign.body.status).toBe(fresh.body.status);
    // The invitation mail goes to the address (its owner decides); the link then says to sign in, and changes nothing.
    const mails = (await CapturedMail.findAll({ where: { kind: 'invitation' } })).filter((r) =>
      (JSON.parse(r.to) as string[]).includes(t.orgB.users.engineer.email),
    );
    expect(mails).toHaveLength(1);
    const token = /\/welcome\/([A-Za-z0-9_-]+)/.exec(mails[0].text)![1];
    const accept = await request(t.app)
      .post('/api/auth/accept-invitation')
      .send({ token, password: 'a-brand-new-passphrase' });
    expect(accept.status).toBe(409);
    expect(accept.body.error.message).toMatch(/sign in/);
    const owner = await User.findOne({ where: { email: t.orgB.users.engineer.email } });
    expect(owner!.organizationId).toBe(t.orgB.id);
    expect(await User.count({ where: { email: t.orgB.users.engineer.email } })).toBe(1);
  });

  it('within the same organization a duplicate still says so', async () => {
    const dup = await invite(t.orgA.users.safety.email);
    expect(dup.status).toBe(409);
    expect(dup.body.error.message).toMatch(/already exists in your organization/);
    const user = await request(t.app)
      .post('/api/users')
      .set(...adminA())
      .send({ email: t.orgA.users.safety.email, name: 'Dup', role: 'engineer', password: 'a-long-password-1' });
    expect(user.status).toBe(409);
    expect(user.body.error.message).toMatch(/already exists in your organization/);
  });

  it("creating a user with another organization's address says neither that it exists nor where", async () => {
    const res = await request(t.app)
      .post('/api/users')
      .set(...adminA())
      .send({ email: t.orgB.users.admin.email, name: 'Probe', role: 'engineer', password: 'a-long-password-1' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).not.toMatch(/exist|organization B|another organization/i);
    expect(res.body.error.message).toMatch(/invite/i);
    expect(await User.count({ where: { email: t.orgB.users.admin.email } })).toBe(1);
  });
});

describe('per-account sign-in backoff and reset-mail limit', () => {
  // The limits are common practice, no source: 10 free failures, then 5 s doubling to at most 5 min; 3 reset mails/hour.
  const signIn = (email: string, password: string) =>
    request(t.app).post('/api/auth/sign-in').send({ email, password });
  let now = Date.now();
  const advance = (ms: number) => {
    now += ms;
    t.setNow(new Date(now));
  };
  afterEach(() => t.setNow(null));

  it('10 failures in 15 min delay the next attempt (even the right password), then the delay passes and a success resets', async () => {
    now = Date.now();
    t.setNow(new Date(now));
    const email = t.orgA.users.electrician.email;
    for (let i = 0; i < 10; i++) expect((await signIn(email, `wrong-${i}-password`)).status).toBe(401);
    const held = await signIn(email, TEST_PASSWORD);
    expect(held.status).toBe(429);
    expect(held.body.error.code).toBe('rate_limited');
    expect(Number(held.headers['retry-after'])).toBe(5);
    // Another account, from the same address, is not held.
    expect((await signIn(t.orgA.users.safety.email, TEST_PASSWORD)).status).toBe(200);
    advance(5_001);
    expect((await signIn(email, TEST_PASSWORD)).status).toBe(200);
    // Success forgot the failures: one wrong password is a plain 401 again, and the right one works at once.
    expect((await signIn(email, 'wrong-again-password')).status).toBe(401);
    expect((await signIn(email, TEST_PASSWORD)).status).toBe(200);
  });

  it('the delay grows with each failure but never exceeds 5 minutes; an unknown address is treated the same', async () => {
    now = Date.now();
    t.setNow(new Date(now));
    for (const email of [t.orgA.users.engineer.email, 'nobody-at-all@org-a.example']) {
      const waits: number[] = [];
      for (let i = 0; i < 20; i++) {
        let res = await signIn(email, `wrong-${i}-password`);
        if (res.status === 429) {
          waits.push(Number(res.headers['retry-after']));
          advance(Number(res.headers['retry-after']) * 1000 + 1);
          res = await signIn(email, `wrong-${i}-password`);
        }
        expect(res.status).toBe(401);
      }
      expect(waits.length).toBe(10);
      expect(waits.slice(0, 4)).toEqual([5, 10, 20, 40]);
      expect(Math.max(...waits)).toBe(300);
      for (let i = 1; i < waits.length; i++) expect(waits[i]).toBeGreaterThanOrEqual(waits[i - 1]);
      // 15 minutes of quiet forget the failures.
      advance(15 * 60_000 + 1);
      if (email === t.orgA.users.engineer.email) expect((await signIn(email, TEST_PASSWORD)).status).toBe(200);
      else expect((await signIn(email, 'still-wrong-password')).status).toBe(401);
    }
  });

  it('password-reset mails: 3 per account and hour, the answer always the same', async () => {
    const email = t.orgB.users.electrician.email;
    const countMails = async () =>
      (await CapturedMail.findAll({ where: { kind: 'password-reset' } })).filter((r) =>
        (JSON.parse(r.to) as string[]).includes(email),
      ).length;
    const before = await countMails();
    for (let i = 0; i < 6; i++) {
      const res = await request(t.app).post('/api/auth/password-reset').send({ email });
      expect(res.status).toBe(200);
      expect(res.body).toEqual({ ok: true });
      await t.ctx.jobs.idle();
    }
    await t.ctx.jobs.idle();
    expect((await countMails()) - before).toBe(3);
    t.setNow(new Date(Date.now() + 3600_000 + 1000));
    await request(t.app).post('/api/auth/password-reset').send({ email });
    await t.ctx.jobs.idle();
    expect((await countMails()) - before).toBe(4);
  });
});
