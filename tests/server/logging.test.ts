/**
 * Request ids and server errors: every response carries X-Request-Id (the caller's when it is plain, else a new
 * UUID); a 5xx is logged with its request id and the error's stack, and the client sees neither stack nor internals.
 */
import { randomUUID } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import { Writable } from 'node:stream';
import request from 'supertest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { migrate, openDb, type Db } from '../../server/db';
import { createLogger, requestIdOf } from '../../server/log';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;
let db: Db;
const lines: Record<string, unknown>[] = [];
let app: ReturnType<typeof createApp>['app'];

beforeAll(async () => {
  db = await openDb('sqlite::memory:');
  await migrate(db);
  const config = loadConfig(
    { NODE_ENV: 'test' },
    {
      databaseUrl: 'sqlite::memory:',
      jwtSecret: 'logging-test-secret-logging-test-secret-0123',
      dataDir: path.join(os.tmpdir(), `emberline-log-${randomUUID()}`),
    },
  );
  const sink = new Writable({
    write(chunk: Buffer, _enc, done) {
      for (const l of chunk.toString().split('\n')) if (l.trim()) lines.push(JSON.parse(l) as Record<string, unknown>);
      done();
    },
  });
  const logger = createLogger({ NODE_ENV: 'test', LOG_LEVEL: 'info' }, sink);
  app = createApp({ config, db, logger }).app;
});

afterAll(async () => {
  await db.close();
});

describe('request ids', () => {
  it('gives every response a new UUID when the caller sends none', async () => {
    const a = await request(app).get('/api/health');
    const b = await request(app).get('/api/no-such-route');
    expect(a.headers['x-request-id']).toMatch(UUID);
    expect(b.headers['x-request-id']).toMatch(UUID);
    expect(a.headers['x-request-id']).not.toBe(b.headers['x-request-id']);
  });

  it("echoes the caller's X-Request-Id when plain, and replaces one that is too long or has odd characters", async () => {
    const kept = await request(app).get('/api/health').set('X-Request-Id', 'lb-7f3a.19:edge_2');
    expect(kept.headers['x-request-id']).toBe('lb-7f3a.19:edge_2');
    const tooLong = await request(app).get('/api/health').set('X-Request-Id', 'a'.repeat(129));
    expect(tooLong.headers['x-request-id']).toMatch(UUID);
    const odd = await request(app).get('/api/health').set('X-Request-Id', '<script>alert(1)</script>');
    expect(odd.headers['x-request-id']).toMatch(UUID);
    expect(requestIdOf(['first-id', 'second'])).toBe('first-id');
    expect(requestIdOf('has space')).toMatch(UUID);
  });
});

describe('a server error', () => {
  it('answers 500 with the request id and no stack, and logs the error under that id', async () => {
    // A broken database: the users table is gone, so signing in fails inside the server.
    await db.sequelize.query('DROP TABLE users');
    const res = await request(app)
      .post('/api/auth/sign-in')
      .set('X-Request-Id', 'trace-500-check')
      .send({ email: 'someone@example.net', password: 'whatever-password' });
    expect(res.status).toBe(500);
    expect(res.headers['x-request-id']).toBe('trace-500-check');
    expect(res.body.error.code).toBe('internal');
    expect(res.body.error.requestId).toBe('trace-500-check');
    const text = JSON.stringify(res.body);
    expect(text).not.toMatch(/SQLITE|users|\bat \S+ \(|\.ts:\d+/);
    expect(Object.keys(res.body.error).sort()).toEqual(['code', 'message', 'requestId']);

    const logged = lines.find((l) => l.reqId === 'trace-500-check' && l.level === 50);
    expect(logged).toBeDefined();
    const err = logged!.err as { message: string; stack: string };
    expect(err.message).toMatch(/users/);
    expect(err.stack).toMatch(/\n\s+at /);
  });
});

describe('request lines (LOG_REQUESTS=1)', () => {
  it('writes one line per request with its id, and the same X-Request-Id rules apply', async () => {
    const written: Record<string, unknown>[] = [];
    const sink = new Writable({
      write(chunk: Buffer, _enc, done) {
        for (const l of chunk.toString().split('\n'))
          if (l.trim()) written.push(JSON.parse(l) as Record<string, unknown>);
        done();
      },
    });
    const config = loadConfig(
      { NODE_ENV: 'test', LOG_REQUESTS: '1' },
      {
        databaseUrl: 'sqlite::memory:',
        jwtSecret: 'logging-test-secret-logging-test-secret-0123',
        dataDir: path.join(os.tmpdir(), `emberline-log-${randomUUID()}`),
      },
    );
    const logger = createLogger({ NODE_ENV: 'test', LOG_LEVEL: 'info' }, sink);
    const lineApp = createApp({ config, db, logger }).app;
    const kept = await request(lineApp).get('/api/health').set('X-Request-Id', 'line-check-1');
    expect(kept.headers['x-request-id']).toBe('line-check-1');
    const fresh = await request(lineApp).get('/api/health');
    expect(fresh.headers['x-request-id']).toMatch(UUID);
    const line = written.find((l) => (l.req as { id?: string } | undefined)?.id === 'line-check-1');
    expect(line).toBeDefined();
    expect((line!.res as { statusCode: number }).statusCode).toBe(200);
    expect(written.some((l) => (l.req as { id?: string } | undefined)?.id === fresh.headers['x-request-id'])).toBe(
      true,
    );
  });
});
