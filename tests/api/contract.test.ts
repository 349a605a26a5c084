/**
 * The shared API contract (shared/api) and the server's route table agree: every endpoint is bound exactly once, no
 * route exists outside the contract, and with response checking on (as in every API test) a handler whose body does
 * not match its response schema answers 500 naming the route and the field.
 */
import express from 'express';
import request from 'supertest';
import { z } from 'zod';
import { contract, contractEntries, endpoint, fillPath, pathParams } from '../../shared/api';
import { bind, mountRoutes } from '../../server/http/route';
import { errorMiddleware } from '../../server/http/errors';
import { buildOpenApi } from '../../server/http/openapi';
import { allRoutes } from '../../server/routes';
import type { AppContext } from '../../server/services/context';

const routes = allRoutes({ signInLimitPerMinute: 1, publicCheckPerMinute: 1 });
const key = (r: { method: string; path: string }) => `${r.method.toUpperCase()} ${r.path}`;

describe('contract and route table', () => {
  it('binds every endpoint of the contract exactly once, and nothing else', () => {
    const bound = routes.map(key).sort();
    const declared = contractEntries()
      .map(([, e]) => key(e))
      .sort();
    expect(bound).toEqual(declared);
    expect(new Set(bound).size).toBe(bound.length);
  });

  it('names each path parameter of an endpoint', () => {
    expect(contract.studies.busResult.params).toEqual(['studyId', 'busId']);
    expect(contract.labels.qr.params).toEqual(['code']);
    expect(contract.sites.list.params).toEqual([]);
    expect(pathParams('/a/:x/b/:y_2')).toEqual(['x', 'y_2']);
  });

  it('fills a path with encoded parameters and refuses a missing one', () => {
    expect(fillPath('/studies/:studyId/results/buses/:busId', { studyId: 's 1', busId: 'B/2' })).toBe(
      '/studies/s%201/results/buses/B%2F2',
    );
    expect(() => fillPath('/sites/:siteId', {})).toThrow(/siteId/);
  });

  it('keeps server-only things out of the contract', () => {
    for (const [name, e] of contractEntries()) {
      for (const k of ['handler', 'middleware', 'before', 'jsonLimit']) expect([name, k in e]).toEqual([name, false]);
    }
  });
});

describe('OpenAPI document from the bound table', () => {
  type Op = { parameters: { name: string; in: string }[]; 'x-access': unknown; requestBody?: unknown };
  const doc = buildOpenApi(routes, 'test') as { paths: Record<string, Record<string, Op>> };

  it.each(contractEntries())('%s: path and query parameters, body and access', (_name, e) => {
    const op = doc.paths['/api' + e.path.replace(/:([A-Za-z0-9_]+)/g, '{$1}')][e.method];
    expect(op.parameters.filter((p) => p.in === 'path').map((p) => p.name)).toEqual([...e.params]);
    const queryNames = e.query
      ? Object.keys(
          (z.toJSONSchema(e.query, { io: 'input', unrepresentable: 'any' }) as { properties?: object }).properties ??
            {},
        )
      : [];
    expect(op.parameters.filter((p) => p.in === 'query').map((p) => p.name)).toEqual(queryNames);
    expect(op.requestBody !== undefined).toBe(e.body !== undefined);
    expect(op['x-access']).toEqual(typeof e.access === 'string' ? e.access : [...e.access]);
  });

  it('documents the query of the routes that take one', () => {
    const results = doc.paths['/api/studies/{studyId}/results'].get.parameters.filter((p) => p.in === 'query');
    expect(results.map((p) => p.name)).toEqual(expect.arrayContaining(['sort', 'order', 'minCal', 'ppe']));
  });
});

describe('response check', () => {
  const probe = endpoint({
    method: 'get',
    path: '/probe/:mode',
    summary: 'Test probe.',
    tag: 'test',
    access: 'public',
    response: z.object({ count: z.number().int() }),
  });

  const sentProbe = endpoint({
    method: 'get',
    path: '/sent-probe',
    summary: 'Test probe that sends its own JSON.',
    tag: 'test',
    access: 'public',
    response: z.object({ count: z.number().int() }),
  });

  function appWith(checkResponses: boolean) {
    const app = express();
    const router = express.Router();
    // What a drifted handler would return: a field of the wrong type, or one the schema does not declare. Their
    // types are erased here on purpose, as a handler's result would be after a schema change it was not told of.
    const wrong: unknown = { count: 'three' };
    const extra: unknown = { count: 3, secret: 'not in the schema' };
    mountRoutes(
      router,
      {} as AppContext,
      [
        bind(probe, {
          handler: ({ params }) =>
            params.mode === 'good' ? { count: 3 } : ((params.mode === 'extra' ? extra : wrong) as { count: number }),
        }),
        bind(sentProbe, {
          respond: async ({ res }) => {
            res.setHeader('Content-Type', 'application/json; charset=utf-8');
            res.status(200).send('{"count":1.5}');
          },
        }),
      ],
      (_req, _res, next) => next(),
      { checkResponses },
    );
    router.use(errorMiddleware);
    app.use(router);
    return app;
  }

  it('answers 500 for a field the schema does not declare (a client would drop it)', async () => {
    const res = await request(appWith(true)).get('/probe/extra');
    expect(res.status).toBe(500);
    expect(res.body.error.message).toMatch(/secret/);
  });

  it('checks a body the handler sends itself (pre-serialized JSON)', async () => {
    const res = await request(appWith(true)).get('/sent-probe');
    expect(res.status).toBe(500);
    expect(res.body.error.message).toMatch(/GET \/sent-probe.*count/);
  });

  it('passes a body that matches', async () => {
    const res = await request(appWith(true)).get('/probe/good');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ count: 3 });
  });

  it('answers 500 naming the route and the field when the body does not match', async () => {
    const res = await request(appWith(true)).get('/probe/bad');
    expect(res.status).toBe(500);
    expect(res.body.error.code).toBe('internal');
    expect(res.body.error.message).toMatch(/GET \/probe\/:mode/);
    expect(res.body.error.message).toMatch(/count/);
  });

  it('sends the body unchecked when checking is off (production)', async () => {
    const res = await request(appWith(false)).get('/probe/bad');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ count: 'three' });
  });
});
