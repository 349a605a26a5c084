/**
 * Property-based robustness of the routes that take a body: at least 10 000 generated bad bodies (mutations of a valid
 * body, fully random JSON, and raw text that may not be JSON at all) never produce a 5xx, every 4xx carries the error
 * shape `{ error: { code, message, fields? } }`, and every 400 names at least one field or row in `fields` (`body`
 * when the text is not JSON).
 *
 * Generated values are kept small (arrays up to 1 500 items, nesting up to 300 levels, raw texts up to a few kB) so the
 * 10 000 requests stay cheap; the extreme sizes (20 000 items, 1 500 levels, 20 000 brackets) are sent once each by a
 * test of their own. A last group sends numbers of absurd magnitude (±1e300, ±1e-300, 1e308, 5e-324, ±1e400), nesting
 * up to 10 000 levels anywhere in a body, and bad encodings, charsets and content types: still no 5xx, and every
 * request must be answered within 30 s (a hang fails the property; no timing is asserted otherwise).
 */
import http from 'node:http';
import zlib from 'node:zlib';
import * as fc from 'fast-check';
import request from 'supertest';
import { modelSchema } from '../../shared/schemas/model';
import { exportModelCsv, exportModelWorkbook } from '../../server/io';
import { REPORT_KINDS } from '../../server/services/labels';
import { smallModel } from '../fixtures/smallModel';
import { approveStudy } from '../helpers/flows';
import { bearer, makeTestApp, type TestApp } from '../helpers/testApp';

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

let t: TestApp;
let server: http.Server;
/** Keep-alive connections: ten thousand requests do not each open and close a socket. */
const agent = new http.Agent({ keepAlive: true });
let draftId = '';
let modelVersion = 0;
let labelCode = '';
let workbook: Buffer = Buffer.alloc(0);
let csvTables: Record<string, string> = {};

beforeAll(async () => {
  t = await makeTestApp();
  // One listening server for the whole file: supertest then reuses it instead of opening one per request.
  server = http.createServer(t.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const eng = bearer(t.orgA.users.engineer.token);
  const siteId = (
    await request(server)
      .post('/api/sites')
      .set(...eng)
      .send({ name: 'Fuzz site' })
  ).body.id as string;
  await approveStudy(t, siteId, smallModel());
  const labels = await request(server)
    .get(`/api/sites/${siteId}/labels?current=1`)
    .set(...eng);
  labelCode = labels.body.labels[0].code as string;
  draftId = (
    await request(server)
      .post(`/api/sites/${siteId}/studies`)
      .set(...eng)
      .send({ title: 'Fuzz draft' })
  ).body.id as string;
  modelVersion = (
    await request(server)
      .get(`/api/studies/${draftId}/model`)
      .set(...eng)
  ).body.version as number;
  const parsed = modelSchema.parse(smallModel());
  workbook = await exportModelWorkbook(parsed);
  csvTables = exportModelCsv(parsed);
}, 60_000);

afterAll(async () => {
  agent.destroy();
  await new Promise<void>((resolve) => server.close(() => resolve()));
  await t.close();
});

const eng = () => bearer(t.orgA.users.engineer.token);
/** A request to the file's server over the keep-alive agent. */
const call = (method: 'get' | 'post' | 'put', url: string) => request(server)[method](url).agent(agent);

// ---------------------------------------------------------------- generators

/** `[[[…]]]` or `{"a":{"a":…}}` nested `depth` levels, built with a loop (no recursion). */
function nested(depth: number, kind: 'array' | 'object'): Json {
  let v: Json = 1;
  for (let i = 0; i < depth; i++) v = kind === 'array' ? [v] : { a: v };
  return v;
}

/** Values that are wrong in a typical field: wrong types, non-finite numbers as strings, negatives, long and deep values. */
const badValue: fc.Arbitrary<unknown> = fc.oneof(
  fc.anything({ maxDepth: 2, maxKeys: 5 }),
  fc.constantFrom<Json>(
    'NaN',
    'Infinity',
    '-Infinity',
    '1e309',
    '-1e309',
    '',
    ' ',
    '0x10',
    '1,5',
    '١٢',
    null,
    true,
    false,
    [],
    {},
    '__proto__',
    'constructor',
  ),
  fc.double(), // NaN and ±Infinity serialize as null
  fc.constantFrom(
    -0,
    -1,
    0,
    -1e-300,
    Number.MAX_VALUE,
    -Number.MAX_VALUE,
    Number.MIN_VALUE,
    Number.MAX_SAFE_INTEGER + 2,
    1e308,
    -1e308,
  ),
  fc.integer({ min: -1_000_000_000, max: 0 }),
  fc.string({ maxLength: 50 }),
  fc.integer({ min: 100, max: 1500 }).map((n) => new Array<Json>(n).fill(1)),
  fc
    .integer({ min: 20, max: 300 })
    .chain((d) => fc.constantFrom<'array' | 'object'>('array', 'object').map((k) => nested(d, k))),
);

/** Paths into a JSON value (objects and arrays, root excluded), at most 8 levels deep and 50 items per array. */
function pathsOf(v: unknown, prefix: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  if (prefix.length >= 8) return out;
  const children: [string | number, unknown][] = Array.isArray(v)
    ? v.slice(0, 50).map((x, i) => [i, x])
    : v && typeof v === 'object'
      ? Object.entries(v)
      : [];
  for (const [k, x] of children) {
    out.push([...prefix, k]);
    pathsOf(x, [...prefix, k], out);
  }
  return out;
}

/** JSON text for a report, cut short; a value too deep to stringify is described instead. */
function preview(v: unknown, max = 600): string {
  try {
    return String(JSON.stringify(v)).slice(0, max);
  } catch {
    return '(too deep to print)';
  }
}

type Mutation = { pick: number; op: 'drop' | 'replace' | 'add' | 'duplicate'; value: unknown; key: string };

function applyMutations(valid: unknown, muts: Mutation[]): unknown {
  const doc = structuredClone(valid) as Record<string, unknown>;
  for (const m of muts) {
    const paths = pathsOf(doc);
    if (paths.length === 0) break;
    const p = paths[m.pick % paths.length];
    type Node = Record<string | number, unknown>;
    let parent = doc as Node;
    for (const k of p.slice(0, -1)) parent = parent[k] as Node;
    const last = p[p.length - 1];
    if (m.op === 'drop') {
      if (Array.isArray(parent)) parent.splice(last as number, 1);
      else delete parent[last];
    } else if (m.op === 'replace') parent[last] = m.value;
    else if (m.op === 'add' && parent && typeof parent === 'object' && !Array.isArray(parent)) parent[m.key] = m.value;
    else if (Array.isArray(parent)) parent.push(parent[last as number]);
    else parent[last] = m.value;
  }
  return doc;
}

const mutation: fc.Arbitrary<Mutation> = fc.record({
  pick: fc.nat(),
  op: fc.constantFrom<Mutation['op']>('drop', 'replace', 'replace', 'add', 'duplicate'),
  value: badValue,
  key: fc.oneof(fc.string({ maxLength: 12 }), fc.constantFrom('__proto__', 'constructor', 'toString')),
});

/** A valid body with one to three mutations. */
const mutated = (valid: () => unknown) =>
  fc.array(mutation, { minLength: 1, maxLength: 3 }).map((muts) => applyMutations(valid(), muts));

/** Any JSON object (the body the route's schema sees), or the valid body with a whole top-level field wrong. */
const randomObject = fc.dictionary(fc.string({ maxLength: 15 }), fc.jsonValue({ maxDepth: 3 }), { maxKeys: 8 });

/** A body: mutated valid, random object, or a raw text that may not even be a JSON object. */
type Body = { kind: 'json'; value: unknown } | { kind: 'raw'; text: string };
const bodyOf = (valid: () => unknown): fc.Arbitrary<Body> =>
  fc.oneof(
    { weight: 6, arbitrary: mutated(valid).map((value): Body => ({ kind: 'json', value })) },
    { weight: 2, arbitrary: randomObject.map((value): Body => ({ kind: 'json', value })) },
    {
      weight: 1,
      arbitrary: fc
        .oneof(
          fc.json({ maxDepth: 3 }),
          fc.string({ maxLength: 200 }),
          fc.constantFrom(
            '{bad',
            '{"a":',
            '{"a":1,}',
            "{'a':1}",
            'null',
            'true',
            '12',
            '"text"',
            '  ',
            '{"a":NaN}',
            '\u0000',
          ),
          fc.integer({ min: 100, max: 2000 }).map((n) => '['.repeat(n) + ']'.repeat(n)),
        )
        .map((text): Body => ({ kind: 'raw', text })),
    },
  );

// ---------------------------------------------------------------- the property

/**
 * Throws (so fast-check shrinks and reports) when the response breaks the error contract: a 5xx, a 4xx without the
 * error shape, a 400 that names no field, or (`notJson`) a 400 for a body that is not a JSON object or array that does
 * not name `body`.
 */
function checkResponse(route: string, res: request.Response, sent: unknown, notJson = false): void {
  const show = () => `${route} → ${res.status} ${preview(res.body, 400)}\n  sent: ${preview(sent)}`;
  if (res.status >= 500) throw new Error(`5xx: ${show()}`);
  if (res.status < 400) return;
  const err = res.body?.error;
  if (!err || typeof err.code !== 'string' || typeof err.message !== 'string' || err.message.length === 0)
    throw new Error(`no error shape: ${show()}`);
  const extra = Object.keys(err).filter((k) => !['code', 'message', 'fields'].includes(k));
  if (extra.length) throw new Error(`unexpected error keys ${extra.join(',')}: ${show()}`);
  if (err.fields !== undefined) {
    if (!err.fields || typeof err.fields !== 'object' || Array.isArray(err.fields))
      throw new Error(`fields not an object: ${show()}`);
    for (const v of Object.values(err.fields))
      if (typeof v !== 'string') throw new Error(`fields value not a string: ${show()}`);
  }
  if (res.status === 400 && (!err.fields || Object.keys(err.fields).length === 0))
    throw new Error(`400 without fields: ${show()}`);
  if (res.status === 400 && notJson && typeof err.fields.body !== 'string')
    throw new Error(`400 for a body that is not JSON without fields.body: ${show()}`);
}

/** The JSON parser's verdict (strict, as the server's: only an object or an array at the top). */
function isJsonObjectOrArray(text: string): boolean {
  try {
    const v = JSON.parse(text) as unknown;
    return v !== null && typeof v === 'object';
  } catch {
    return false;
  }
}

/**
 * Sends a JSON or raw body. `notJson`: raw text the JSON parser refuses (an empty body excepted: it reads as `{}`), whose
 * 400 must name `body`.
 */
async function sendBody(
  method: 'post' | 'put',
  url: string,
  body: Body,
  generated = true,
): Promise<{ res: request.Response; notJson: boolean }> {
  if (generated) sent++;
  const req = call(method, url).set(...eng());
  // Serialized here: superagent's own serializer first walks the whole value looking for cycles.
  const text = body.kind === 'json' ? JSON.stringify(body.value) : body.text;
  const res = await req.set('Content-Type', 'application/json').send(text);
  if (body.kind === 'json') return { res, notJson: false };
  return { res, notJson: body.text.length > 0 && !isJsonObjectOrArray(body.text) };
}

const ie = () => ({
  voltageV: 480,
  boltedFaultKa: 20,
  electrodeConfig: 'VCB',
  gapMm: 25,
  workingDistanceMm: 457.2,
  enclosureMm: { height: 508, width: 508, depth: 508 },
  arcDurationMs: 50,
});
const ieClearing = () => ({
  ...ie(),
  arcDurationMs: undefined,
  clearingMs: { full: 50, reduced: 80 },
  maxArcDurationMs: 2000,
});
const devices = smallModel().devices!.map((d) => d.device);
const clearing = (i: number) => () => ({ device: devices[i % devices.length], currentA: 5000 });

/** Generated bodies sent (counted per request). */
let sent = 0;

/**
 * The calc routes keep no state, so their bodies go CALC_BATCH at a time, in flight together: one property run is a
 * batch, and a failure names the body that broke the contract.
 */
const CALC_BATCH = 4;
const batchOf = <T>(arb: fc.Arbitrary<T>) => fc.array(arb, { minLength: CALC_BATCH, maxLength: CALC_BATCH });
async function sendCalcBatch(route: string, url: string, bodies: Body[]): Promise<void> {
  const sentNow = await Promise.all(bodies.map((body) => sendBody('post', url, body)));
  sentNow.forEach(({ res, notJson }, i) => checkResponse(route, res, bodies[i], notJson));
}

describe('generated bad bodies never make the server fail', () => {
  it('POST /api/calc/incident-energy', async () => {
    await fc.assert(
      fc.asyncProperty(batchOf(fc.oneof(bodyOf(ie), bodyOf(ieClearing))), (bodies) =>
        sendCalcBatch('incident-energy', '/api/calc/incident-energy', bodies),
      ),
      { numRuns: Math.ceil(2500 / CALC_BATCH) },
    );
  }, 120_000);

  it('POST /api/calc/clearing-time', async () => {
    await fc.assert(
      fc.asyncProperty(batchOf(fc.nat(devices.length - 1).chain((i) => bodyOf(clearing(i)))), (bodies) =>
        sendCalcBatch('clearing-time', '/api/calc/clearing-time', bodies),
      ),
      { numRuns: Math.ceil(2000 / CALC_BATCH) },
    );
  }, 120_000);

  it('POST /api/calc/short-circuit', async () => {
    await fc.assert(
      fc.asyncProperty(batchOf(bodyOf(() => ({ model: smallModel() }))), (bodies) =>
        sendCalcBatch('short-circuit', '/api/calc/short-circuit', bodies),
      ),
      { numRuns: Math.ceil(1500 / CALC_BATCH) },
    );
  }, 120_000);

  it('PUT /api/studies/:id/model (and the model reads back after any accepted save)', async () => {
    const withVersion = fc
      .tuple(
        bodyOf(() => ({ model: smallModel(), version: 0 })),
        fc.boolean(),
      )
      .map(([b, keepVersion]): Body => {
        // Mostly the current version, so the body reaches the save instead of stopping at the version check.
        if (
          b.kind === 'json' &&
          keepVersion &&
          b.value &&
          typeof b.value === 'object' &&
          !Array.isArray(b.value) &&
          'version' in b.value
        ) {
          return { kind: 'json', value: { ...(b.value as object), version: modelVersion } };
        }
        return b;
      });
    await fc.assert(
      fc.asyncProperty(withVersion, async (body) => {
        const { res, notJson } = await sendBody('put', `/api/studies/${draftId}/model`, body);
        checkResponse('put-model', res, body, notJson);
        if (res.status === 200) {
          modelVersion = res.body.version as number;
          const back = await call('get', `/api/studies/${draftId}/model`).set(...eng());
          checkResponse('get-model after put', back, body);
          if (back.status !== 200 || back.body.version !== modelVersion)
            throw new Error(`model did not read back: ${back.status}`);
        }
      }),
      { numRuns: 1500 },
    );
  }, 120_000);

  it('POST /api/studies/:id/import (multipart files)', async () => {
    const jsonText = fc.oneof(
      mutated(smallModel).map((m) => JSON.stringify(m)),
      fc.json({ maxDepth: 4 }),
      fc.string({ maxLength: 300 }),
      fc.integer({ min: 10, max: 1000 }).map((n) => '{"buses":' + '['.repeat(n) + ']'.repeat(n) + '}'),
    );
    const tables = Object.keys(csvTables);
    const csvText = fc.oneof(
      // A valid table with cells replaced, rows dropped or duplicated, or a header broken.
      fc
        .tuple(
          fc.constantFrom(...tables),
          fc.array(
            fc.tuple(
              fc.nat(),
              fc.nat(),
              fc.oneof(
                fc.string({ maxLength: 20 }),
                fc.constantFrom('NaN', 'Infinity', '-1', '"', '""', '\n', ',,,', '1e309'),
              ),
            ),
            { minLength: 1, maxLength: 4 },
          ),
        )
        .map(([table, edits]) => {
          const rows = csvTables[table].split('\n').map((r) => r.split(','));
          for (const [r, c, v] of edits) {
            const row = rows[r % rows.length];
            row[c % row.length] = v;
          }
          return { name: `${table}.csv`, text: rows.map((r) => r.join(',')).join('\n') };
        }),
      fc
        .tuple(fc.constantFrom(...tables, 'unknown', 'Buses', ''), fc.string({ maxLength: 400 }))
        .map(([table, text]) => ({ name: `${table}.csv`, text })),
      fc
        .array(fc.array(fc.string({ maxLength: 8 }), { maxLength: 8 }), { maxLength: 10 })
        .map((rows) => ({ name: 'buses.csv', text: rows.map((r) => r.join(',')).join('\n') })),
    );
    const xlsxBytes = fc.oneof(
      fc.uint8Array({ maxLength: 1000 }).map((b) => Buffer.from(b)),
      // The valid workbook with bytes overwritten or cut short.
      fc
        .tuple(
          fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 20 }),
          fc.option(fc.nat()),
        )
        .map(([edits, cut]) => {
          const b = Buffer.from(workbook);
          for (const [i, v] of edits) b[i % b.length] = v;
          return cut === null ? b : b.subarray(0, cut % b.length);
        }),
    );
    type File = { name: string; data: Buffer };
    const file: fc.Arbitrary<File> = fc.oneof(
      jsonText.map((text) => ({ name: 'model.json', data: Buffer.from(text) })),
      csvText.map((f) => ({ name: f.name, data: Buffer.from(f.text) })),
      xlsxBytes.map((data) => ({ name: 'model.xlsx', data })),
      fc
        .tuple(
          fc.constantFrom('a.csv', 'b.json', 'c.xlsx', 'd.CSV', 'e.txt', 'noext'),
          fc.uint8Array({ maxLength: 500 }),
        )
        .map(([name, b]) => ({ name, data: Buffer.from(b) })),
    );
    const files = fc.array(file, { minLength: 0, maxLength: 4 });
    await fc.assert(
      fc.asyncProperty(files, async (fs) => {
        let req = call('post', `/api/studies/${draftId}/import`).set(...eng());
        for (const f of fs) req = req.attach('files', f.data, f.name);
        if (fs.length === 0) req = req.field('other', 'x');
        sent++;
        const res = await req;
        const summary = fs.map((f) => ({
          name: f.name,
          bytes: f.data.length,
          head: f.data.subarray(0, 300).toString('utf8'),
        }));
        checkResponse('import', res, summary);
      }),
      { numRuns: 1500 },
    );
  }, 120_000);

  it('POST /api/labels/:code/reports (multipart and JSON fields)', async () => {
    const text = fc.oneof(
      fc.string({ maxLength: 60 }),
      fc.constantFrom('', '  ', 'ab', '   abc  '),
      fc.integer({ min: 3990, max: 4100 }).map((n) => 'x'.repeat(n)),
    );
    const kind = fc.oneof(
      fc.constantFrom(...REPORT_KINDS),
      fc.string({ maxLength: 20 }),
      fc.constantFrom('', 'VOLTAGE', '__proto__'),
    );
    const form = fc.record(
      {
        kind,
        text,
        extra: fc.dictionary(fc.string({ minLength: 1, maxLength: 10 }), fc.string({ maxLength: 20 }), { maxKeys: 3 }),
        photo: fc.record({
          bytes: fc.uint8Array({ maxLength: 500 }),
          name: fc.constantFrom('p.png', 'p.jpg', 'p.txt', 'p'),
          type: fc.constantFrom('image/png', 'image/jpeg', 'text/plain', 'application/octet-stream'),
        }),
      },
      { requiredKeys: [] },
    );
    const asJson = fc.oneof(
      mutated(() => ({ kind: 'device', text: 'Feeder breaker differs from the label' })),
      randomObject,
    );
    const input = fc.oneof(
      form.map((f) => ({ multipart: f })),
      asJson.map((j) => ({ json: j })),
    );
    await fc.assert(
      fc.asyncProperty(input, async (inp) => {
        let req = call('post', `/api/labels/${labelCode}/reports`).set(...bearer(t.orgA.users.electrician.token));
        let res: request.Response;
        sent++;
        if ('multipart' in inp) {
          const f = inp.multipart;
          for (const [k, v] of Object.entries(f.extra ?? {})) if (k !== 'photo') req = req.field(k, v);
          if (f.kind !== undefined) req = req.field('kind', f.kind);
          if (f.text !== undefined) req = req.field('text', f.text);
          if (f.photo)
            req = req.attach('photo', Buffer.from(f.photo.bytes), {
              filename: f.photo.name,
              contentType: f.photo.type,
            });
          if (!f.extra && f.kind === undefined && f.text === undefined && !f.photo) req = req.field('x', 'y');
          res = await req;
          checkResponse('reports', res, { ...f, photo: f.photo && { ...f.photo, bytes: f.photo.bytes.length } });
        } else {
          res = await req.send(inp.json as object);
          checkResponse('reports', res, inp.json);
        }
      }),
      { numRuns: 1000 },
    );
  }, 120_000);

  it('extreme sizes (20 000 items, 1 500 levels, 20 000 brackets) are 4xx naming a field, not 5xx', async () => {
    const huge = new Array<Json>(20_000).fill(1);
    const deepArray = nested(1500, 'array');
    const deepObject = nested(1500, 'object');
    const brackets = '['.repeat(20_000) + ']'.repeat(20_000);
    const cases: {
      route: string;
      method: 'post' | 'put';
      url: string;
      valid: () => Record<string, unknown>;
      field: string;
    }[] = [
      { route: 'incident-energy', method: 'post', url: '/api/calc/incident-energy', valid: ie, field: 'voltageV' },
      { route: 'clearing-time', method: 'post', url: '/api/calc/clearing-time', valid: clearing(0), field: 'currentA' },
      {
        route: 'short-circuit',
        method: 'post',
        url: '/api/calc/short-circuit',
        valid: () => ({ model: smallModel() }),
        field: 'model',
      },
      {
        route: 'put-model',
        method: 'put',
        url: `/api/studies/${draftId}/model`,
        valid: () => ({ model: { ...smallModel(), buses: huge }, version: modelVersion }),
        field: 'version',
      },
    ];
    for (const c of cases) {
      const bodies: Body[] = [
        { kind: 'json', value: { ...c.valid(), [c.field]: huge } },
        { kind: 'json', value: { ...c.valid(), [c.field]: deepArray } },
        { kind: 'json', value: { ...c.valid(), [c.field]: deepObject } },
        { kind: 'raw', text: brackets },
      ];
      for (const body of bodies) {
        const { res, notJson } = await sendBody(c.method, c.url, body, false);
        checkResponse(c.route, res, body, notJson);
        expect(res.status).toBeGreaterThanOrEqual(400);
      }
    }
    const files = [
      '{"buses":' + '['.repeat(5000) + ']'.repeat(5000) + '}',
      JSON.stringify({ ...smallModel(), buses: huge }),
      JSON.stringify({ ...smallModel(), name: deepObject }),
    ];
    for (const text of files) {
      const res = await call('post', `/api/studies/${draftId}/import`)
        .set(...eng())
        .attach('files', Buffer.from(text), 'model.json');
      checkResponse('import', res, text.slice(0, 300));
      expect(res.status).toBeGreaterThanOrEqual(400);
    }
  }, 60_000);

  it('a body that is not JSON is a 400 that names `body`', async () => {
    const routes: ['post' | 'put', string][] = [
      ['post', '/api/calc/incident-energy'],
      ['put', `/api/studies/${draftId}/model`],
      ['post', `/api/labels/${labelCode}/reports`],
    ];
    for (const [method, url] of routes) {
      for (const text of ['{bad', '{"voltageV": 480,}', '"a string"']) {
        const res = await call(method, url)
          .set(...eng())
          .set('Content-Type', 'application/json')
          .send(text);
        expect(res.status).toBe(400);
        expect(res.body.error.code).toBe('bad_request');
        expect(Object.keys(res.body.error.fields ?? {})).toEqual(['body']);
        expect(res.body.error.fields.body).toMatch(/not valid JSON/i);
      }
    }
  });

  it('sent at least 10 000 generated bodies in all', () => {
    expect(sent).toBeGreaterThanOrEqual(10_000);
  });
});

describe('absurd magnitudes, deep nesting and bad encodings: still no 5xx and no hang', () => {
  /** A response must arrive within this; a request that waits longer counts as a hang (not a timing assertion). */
  const HANG_MS = 30_000;
  const routes = (): { route: string; method: 'post' | 'put'; url: string; valid: () => unknown }[] => [
    { route: 'incident-energy', method: 'post', url: '/api/calc/incident-energy', valid: ie },
    { route: 'incident-energy (clearing)', method: 'post', url: '/api/calc/incident-energy', valid: ieClearing },
    { route: 'clearing-time', method: 'post', url: '/api/calc/clearing-time', valid: clearing(0) },
    { route: 'clearing-time (2)', method: 'post', url: '/api/calc/clearing-time', valid: clearing(1) },
    { route: 'short-circuit', method: 'post', url: '/api/calc/short-circuit', valid: () => ({ model: smallModel() }) },
    {
      route: 'put-model',
      method: 'put',
      url: `/api/studies/${draftId}/model`,
      valid: () => ({ model: smallModel(), version: modelVersion }),
    },
  ];
  const send = (method: 'post' | 'put', url: string) =>
    call(method, url)
      .set(...eng())
      .timeout({ response: HANG_MS, deadline: HANG_MS });

  /** Numbers far outside any physical range, as JSON can carry them (1e400 parses to Infinity, 1e-400 to 0). */
  const ABSURD = ['1e300', '-1e300', '1e-300', '-1e-300', '1e308', '-1e308', '5e-324', '1e400', '-1e400', '1e-400'];
  /** Number tokens after `:`, `[` or `,` in JSON text (digits inside strings are left alone by the lookbehind). */
  const NUMBER = /(?<=[:[,])-?\d+(?:\.\d+)?(?:[eE][+-]?\d+)?/g;

  it('every number of a valid body replaced by ±1e300, ±1e-300, 1e308, 5e-324 or ±1e400', async () => {
    const cases = routes();
    await fc.assert(
      fc.asyncProperty(
        fc.nat(cases.length - 1),
        fc.array(fc.tuple(fc.nat(), fc.constantFrom(...ABSURD)), { minLength: 1, maxLength: 4 }),
        fc.boolean(),
        async (which, picks, all) => {
          const c = cases[which];
          let text = JSON.stringify(c.valid());
          const count = (text.match(NUMBER) ?? []).length;
          if (all) {
            let k = 0;
            text = text.replace(NUMBER, () => picks[k++ % picks.length][1]);
          } else {
            const chosen = new Map(picks.map(([i, v]) => [i % Math.max(count, 1), v]));
            let k = 0;
            text = text.replace(NUMBER, (m) => chosen.get(k++) ?? m);
          }
          const res = await send(c.method, c.url).set('Content-Type', 'application/json').send(text);
          checkResponse(c.route, res, text.slice(0, 300));
          if (c.route === 'put-model' && res.status === 200) modelVersion = res.body.version as number;
        },
      ),
      { numRuns: 240 },
    );
  }, 300_000);

  it('nesting deeper than 64 levels anywhere in the body is a 400 naming `body`; up to 64 is left to the schema', async () => {
    const cases = routes();
    await fc.assert(
      fc.asyncProperty(
        fc.nat(cases.length - 1),
        fc.integer({ min: 1, max: 10_000 }),
        fc.constantFrom<'array' | 'object'>('array', 'object'),
        fc.constantFrom('first', 'last', 'alone'),
        async (which, depth, kind, where) => {
          const c = cases[which];
          // Built as text: a value 10 000 levels deep would overflow the test's own JSON.stringify.
          const deep =
            kind === 'array' ? '['.repeat(depth) + ']'.repeat(depth) : '{"a":'.repeat(depth) + '1' + '}'.repeat(depth);
          const validText = JSON.stringify(c.valid());
          const text =
            where === 'alone'
              ? deep
              : where === 'first'
                ? `{"__deep":${deep},${validText.slice(1)}`
                : `${validText.slice(0, -1)},"__deep":${deep}}`;
          const levels = depth + (where === 'alone' ? 0 : 1); // the wrapping object is one level more
          const res = await send(c.method, c.url).set('Content-Type', 'application/json').send(text);
          checkResponse(c.route, res, `${kind} nested ${depth} (${where})`);
          if (levels > 64) {
            if (res.status !== 400 || typeof res.body.error?.fields?.body !== 'string')
              throw new Error(`${c.route}: ${levels} levels → ${res.status} ${preview(res.body, 300)}`);
          }
        },
      ),
      { numRuns: 150 },
    );
  }, 300_000);

  it('bad encodings, charsets and content types are 4xx naming the body', async () => {
    const valid = JSON.stringify(ie());
    const encodings = fc.oneof(
      // Labelled compressed but not (or corrupt).
      fc.tuple(fc.constantFrom('gzip', 'deflate', 'br'), fc.uint8Array({ maxLength: 300 })).map(([enc, bytes]) => ({
        headers: { 'Content-Encoding': enc, 'Content-Type': 'application/json' },
        body: Buffer.from(bytes),
      })),
      fc.constantFrom('gzip', 'deflate', 'br').map((enc) => ({
        headers: { 'Content-Encoding': enc, 'Content-Type': 'application/json' },
        body: Buffer.from(valid),
      })),
      // A real gzip cut short.
      fc.integer({ min: 1, max: 30 }).map((n) => ({
        headers: { 'Content-Encoding': 'gzip', 'Content-Type': 'application/json' },
        body: zlib.gzipSync(valid).subarray(0, n),
      })),
      // Properly compressed JSON, valid or not: the route decides (4xx or 200), never 5xx.
      fc
        .tuple(fc.constantFrom('gzip', 'deflate', 'br'), fc.oneof(fc.constant(valid), fc.string({ maxLength: 80 })))
        .map(([enc, text]) => ({
          headers: { 'Content-Encoding': enc, 'Content-Type': 'application/json' },
          body:
            enc === 'gzip'
              ? zlib.gzipSync(text)
              : enc === 'deflate'
                ? zlib.deflateSync(text)
                : zlib.brotliCompressSync(text),
        })),
      // 20 MB of spaces compressed to a few kB: refused for size (the JSON limit counts inflated bytes).
      fc.constant({
        headers: { 'Content-Encoding': 'gzip', 'Content-Type': 'application/json' },
        body: zlib.gzipSync(Buffer.alloc(20 * 1024 * 1024, 0x20)),
      }),
      // Unknown encodings and charsets.
      fc.constantFrom('x-squeeze', 'compress', 'gzip, gzip', 'identity, br', '*').map((enc) => ({
        headers: { 'Content-Encoding': enc, 'Content-Type': 'application/json' },
        body: Buffer.from(valid),
      })),
      fc.constantFrom('klingon-8', 'utf-99', 'latin1', 'utf-16', 'utf-32', 'ebcdic', '').map((cs) => ({
        headers: { 'Content-Type': `application/json; charset=${cs}` },
        body: Buffer.from(valid),
      })),
      // Bytes that are not UTF-8.
      fc.uint8Array({ minLength: 1, maxLength: 200 }).map((bytes) => ({
        headers: { 'Content-Type': 'application/json; charset=utf-8' },
        body: Buffer.concat([Buffer.from('{"voltageV":"'), Buffer.from(bytes), Buffer.from('"}')]),
      })),
      // Other content types.
      fc
        .constantFrom(
          'application/x-www-form-urlencoded',
          'text/plain',
          'application/xml',
          'application/octet-stream',
          'multipart/form-data; boundary=nothing-here',
          'multipart/form-data',
          'application/json-patch+json',
        )
        .map((type) => ({ headers: { 'Content-Type': type }, body: Buffer.from(valid) })),
    );
    await fc.assert(
      fc.asyncProperty(encodings, async ({ headers, body }) => {
        let req = send('post', '/api/calc/incident-energy');
        for (const [k, v] of Object.entries(headers)) req = req.set(k, v);
        const res = await req.send(body);
        checkResponse('encodings', res, { headers, bytes: body.length });
        if (res.status >= 400 && res.status !== 400 && res.status !== 413 && res.status !== 415)
          throw new Error(`unexpected ${res.status} for ${JSON.stringify(headers)}: ${preview(res.body, 300)}`);
        if ((res.status === 415 || res.status === 400) && !res.body.error.fields)
          throw new Error(`no field named for ${JSON.stringify(headers)}: ${preview(res.body, 300)}`);
      }),
      { numRuns: 200 },
    );
  }, 300_000);
});
