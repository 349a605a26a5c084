/**
 * Issue 16 (high): a burst of concurrent writes of different kinds must all succeed, in order, without stalling
 * reads and without losing the mails they cause. SQLite runs on a file here (WAL, one connection per transaction:
 * the production set-up), unless TEST_DATABASE_URL points elsewhere (PostgreSQL).
 * No timed assertions (project rule): health probe latencies are printed only; the test asserts that every write
 * succeeded, every mail was captured and every probe answered 200 while the burst ran.
 */
import { randomUUID } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { AuditEvent, CapturedMail } from '../../server/db/models';
import { isTransientError, withRetry } from '../../server/db/retry';
import { WriteQueue } from '../../server/db/writeQueue';
import { smallModel } from '../fixtures/smallModel';
import { bearer, makeTestApp, TEST_PASSWORD, type TestApp } from '../helpers/testApp';

jest.setTimeout(90_000);

let t: TestApp;
beforeAll(async () => {
  if (!process.env.TEST_DATABASE_URL) {
    process.env.TEST_DATABASE_URL = `sqlite:${path.join(os.tmpdir(), `emberline-burst-${randomUUID()}`, 'db.sqlite')}`;
  }
  t = await makeTestApp();
});
afterAll(async () => t.close());

const eng = () => bearer(t.orgA.users.engineer.token);

describe('a burst of 32 concurrent writes', () => {
  it('all succeed, every reset mail is captured, and health answers 200 throughout', async () => {
    // Set-up, one at a time: a site for the new studies, 8 studies whose models are saved in the burst, 8 users
    // who ask for a password reset in the burst (each address may ask 3 times an hour, so one each).
    const site = await request(t.app)
      .post('/api/sites')
      .set(...eng())
      .send({ name: 'Burst site' });
    expect(site.status).toBe(201);
    const studyIds: string[] = [];
    for (let i = 0; i < 8; i += 1) {
      const s = await request(t.app)
        .post(`/api/sites/${site.body.id}/studies`)
        .set(...eng())
        .send({ title: `Model target ${i}` });
      expect(s.status).toBe(201);
      studyIds.push(s.body.id);
    }
    const resetEmails: string[] = [];
    for (let i = 0; i < 8; i += 1) {
      const email = `burst${i}@org-a.example`;
      const u = await request(t.app)
        .post('/api/users')
        .set(...bearer(t.orgA.users.admin.token))
        .send({ email, name: `Burst ${i}`, role: 'electrician', password: TEST_PASSWORD });
      expect(u.status).toBe(201);
      resetEmails.push(email);
    }

    const writes: Promise<request.Response>[] = [];
    for (let i = 0; i < 8; i += 1) {
      writes.push(
        request(t.app)
          .post('/api/sites')
          .set(...eng())
          .send({ name: `Burst site ${i}` }),
      );
      writes.push(
        request(t.app)
          .post(`/api/sites/${site.body.id}/studies`)
          .set(...eng())
          .send({ title: `Burst study ${i}` }),
      );
      writes.push(
        request(t.app)
          .put(`/api/studies/${studyIds[i]}/model`)
          .set(...eng())
          .send({ model: smallModel(), version: 1 }),
      );
      writes.push(request(t.app).post('/api/auth/password-reset').send({ email: resetEmails[i] }));
    }
    expect(writes).toHaveLength(32);

    // Health probes, one after another, for as long as the burst runs.
    let burstDone = false;
    const probes: { status: number; ms: number }[] = [];
    const probing = (async () => {
      while (!burstDone) {
        const started = Date.now();
        const res = await request(t.app).get('/api/health');
        probes.push({ status: res.status, ms: Date.now() - started });
      }
    })();
    const started = Date.now();
    const results = await Promise.all(writes);
    await t.ctx.jobs.idle();
    const burstMs = Date.now() - started;
    burstDone = true;
    await probing;

    const latencies = probes.map((p) => p.ms).sort((a, b) => a - b);
    console.log(
      `burst of 32 writes + reset jobs: ${burstMs} ms; ${probes.length} health probes, ` +
        `median ${latencies[Math.floor(latencies.length / 2)]} ms, max ${latencies[latencies.length - 1]} ms`,
    );

    const statuses = results.map((r) => r.status);
    expect(statuses.filter((_, i) => i % 4 === 0)).toEqual(Array(8).fill(201)); // sites
    expect(statuses.filter((_, i) => i % 4 === 1)).toEqual(Array(8).fill(201)); // studies
    expect(statuses.filter((_, i) => i % 4 === 2)).toEqual(Array(8).fill(200)); // model saves
    expect(statuses.filter((_, i) => i % 4 === 3)).toEqual(Array(8).fill(200)); // reset requests
    expect(results.filter((_, i) => i % 4 === 2).map((r) => r.body.version)).toEqual(Array(8).fill(2));

    expect(probes.length).toBeGreaterThan(0);
    expect(probes.filter((p) => p.status !== 200)).toEqual([]);

    // Every reset mail reached the sink, and the audit log says so; nothing failed.
    const mails = await CapturedMail.findAll({ where: { kind: 'password-reset' } });
    const to = mails.map((m) => m.to).join(' ');
    for (const email of resetEmails) expect(to).toContain(email);
    expect(await AuditEvent.count({ where: { action: 'mail.failed' } })).toBe(0);
    expect(await AuditEvent.count({ where: { action: 'password.reset-requested' } })).toBe(8);
  });
});

describe('the write queue and the retry helper', () => {
  it('runs turns one at a time in arrival order; a nested turn does not wait for itself', async () => {
    const q = new WriteQueue();
    const log: string[] = [];
    const turn = (name: string) =>
      q.run(async () => {
        log.push(`${name} start`);
        await new Promise((r) => setTimeout(r, 5));
        // Nested: runs inside the held turn at once (waiting would deadlock).
        await q.run(async () => log.push(`${name} nested`));
        log.push(`${name} end`);
      });
    await Promise.all([turn('a'), turn('b'), turn('c')]);
    expect(log).toEqual([
      'a start',
      'a nested',
      'a end',
      'b start',
      'b nested',
      'b end',
      'c start',
      'c nested',
      'c end',
    ]);
  });

  it('a turn that fails releases the queue for the next', async () => {
    const q = new WriteQueue();
    await expect(q.run(async () => Promise.reject(new Error('boom')))).rejects.toThrow('boom');
    await expect(q.run(async () => 'next')).resolves.toBe('next');
  });

  it('retries SQLITE_BUSY, connection errors and SMTP 4xx, but not a bad request', async () => {
    expect(isTransientError(Object.assign(new Error('SQLITE_BUSY: database is locked'), { code: 'SQLITE_BUSY' }))).toBe(
      true,
    );
    expect(isTransientError({ name: 'SequelizeTimeoutError', parent: { code: 'SQLITE_BUSY' } })).toBe(true);
    expect(isTransientError(Object.assign(new Error('Connection closed'), { code: 'ECONNECTION' }))).toBe(true);
    expect(isTransientError(Object.assign(new Error('try later'), { responseCode: 451 }))).toBe(true);
    expect(isTransientError(Object.assign(new Error('no such user'), { responseCode: 550 }))).toBe(false);
    expect(isTransientError(new Error('validation failed'))).toBe(false);

    let calls = 0;
    const value = await withRetry(
      async () => {
        calls += 1;
        if (calls < 3) throw Object.assign(new Error('busy'), { code: 'SQLITE_BUSY' });
        return 'done';
      },
      { baseDelayMs: 1 },
    );
    expect([value, calls]).toEqual(['done', 3]);

    calls = 0;
    await expect(
      withRetry(
        async () => {
          calls += 1;
          throw new Error('bad input');
        },
        { baseDelayMs: 1 },
      ),
    ).rejects.toThrow('bad input');
    expect(calls).toBe(1);
  });
});

describe('mail that cannot be delivered', () => {
  it('is tried again, then recorded as mail.failed where an admin sees it', async () => {
    const before = await AuditEvent.count({ where: { action: 'mail.failed' } });
    // The sink's store fails transiently twice (as a busy database would), then works: the message arrives once.
    const original = CapturedMail.create.bind(CapturedMail);
    let failures = 0;
    const spy = jest.spyOn(CapturedMail, 'create').mockImplementation(((...args: Parameters<typeof original>) => {
      if (failures < 2) {
        failures += 1;
        return Promise.reject(Object.assign(new Error('SQLITE_BUSY: database is locked'), { code: 'SQLITE_BUSY' }));
      }
      return original(...args);
    }) as typeof CapturedMail.create);
    try {
      const r = await t.ctx.mail.send({
        organizationId: t.orgA.id,
        kind: 'reminder',
        to: 'retry@org-a.example',
        subject: 'Retry me',
        text: 'Hello',
      });
      expect(r.ok).toBe(true);
      expect(failures).toBe(2);
      expect(await CapturedMail.count({ where: { subject: 'Retry me' } })).toBe(1);

      // Always failing: after the retries the send fails and mail.failed is recorded.
      failures = -1e9;
      const lost = await t.ctx.mail.send({
        organizationId: t.orgA.id,
        kind: 'reminder',
        to: 'lost@org-a.example',
        subject: 'Lost',
        text: 'Hello',
      });
      expect(lost.ok).toBe(false);
      expect(await AuditEvent.count({ where: { action: 'mail.failed' } })).toBe(before + 1);
    } finally {
      spy.mockRestore();
    }
  });
});
