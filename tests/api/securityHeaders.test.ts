/**
 * The security headers are helmet's, read once at start and set as a fixed list (server/http/securityHeaders.ts):
 * every response carries exactly what helmet itself sets with the same options, over plain HTTP and over TLS.
 */
import express from 'express';
import request from 'supertest';
import { helmetFor, securityHeaders } from '../../server/http/securityHeaders';

/** The response headers of an app that uses `middleware` and answers 204, without the ones every response has. */
async function headersOf(middleware: express.RequestHandler, https: boolean): Promise<Record<string, string>> {
  const app = express();
  app.set('trust proxy', 'loopback');
  app.use(middleware);
  app.get('/', (_req, res) => res.status(204).end());
  const res = await request(app)
    .get('/')
    .set('X-Forwarded-Proto', https ? 'https' : 'http');
  const { date: _date, connection: _connection, 'keep-alive': _keepAlive, ...rest } = res.headers;
  return rest as Record<string, string>;
}

describe('security headers', () => {
  it.each([
    ['plain HTTP', false],
    ['TLS', true],
  ])('over %s: the same headers as helmet sets', async (_name, https) => {
    const ours = await headersOf(securityHeaders('http://localhost:8080'), https);
    const helmets = await headersOf(helmetFor(https), https);
    expect(ours).toEqual(helmets);
    expect(ours['content-security-policy']).toBeTruthy();
    expect(ours['content-security-policy'].includes('upgrade-insecure-requests')).toBe(https);
    expect(ours['strict-transport-security']).toBeTruthy();
    expect(ours['x-powered-by']).toBeUndefined();
  });

  it('an https public origin asks for upgrades on plain requests too', async () => {
    const ours = await headersOf(securityHeaders('https://labels.example.net'), false);
    expect(ours).toEqual(await headersOf(helmetFor(true), true));
  });
});
