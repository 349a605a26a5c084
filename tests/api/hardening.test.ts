/**
 * Hold under abuse (medium and low): headers that depend on how the app is reached, bodies the parser cannot read,
 * tokens without an expiry, cross-organization e-mail addresses, per-account sign-in backoff, photo re-encoding,
 * the audit log's database triggers, external reminder addresses, and form-encoded field reports.
 */
import request from 'supertest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { makeTestApp, type TestApp } from '../helpers/testApp';

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
