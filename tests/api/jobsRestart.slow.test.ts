/**
 * The job lifecycle across a stop of the real server: a label print batch killed mid-render (SIGKILL, no handler runs)
 * is marked failed with the reason when the server starts again, and the batch API says so; a graceful stop whose
 * time runs out marks the batch it could not finish failed and exits non-zero.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { QueryTypes, Sequelize } from 'sequelize';
import type { Response as SupertestResponse } from 'supertest';
import { startChildServer, type ChildServer } from '../helpers/childServer';

const DEMO_PASSWORD = 'jobs-restart-demo-pw';
/** A JSON response body, read as loosely as supertest types its own (`Response['body']`). */
type ApiBody = SupertestResponse['body'];
const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'emberline-jobs-'));
const started: ChildServer[] = [];
let srv: ChildServer;
let token = '';
const labelIds: string[] = [];
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function start(env: Record<string, string> = {}): Promise<ChildServer> {
  const s = await startChildServer({ dataDir, demoPassword: DEMO_PASSWORD, timeoutMs: 90_000, env });
  started.push(s);
  return s;
}

async function api(method: string, url: string, body?: unknown): Promise<{ status: number; body: ApiBody }> {
  const res = await fetch(`${srv.baseUrl}/api${url}`, {
    method,
    headers: {
      Authorization: `Bearer ${token}`,
      ...(body === undefined ? {} : { 'Content-Type': 'application/json' }),
    },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: res.status, body: await res.json() };
}

async function signIn(): Promise<void> {
  const res = await fetch(`${srv.baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email: 'electrician@larkspur.example', password: DEMO_PASSWORD }),
  });
  expect(res.status).toBe(200);
  token = ((await res.json()) as { token: string }).token;
}

async function batchRow(id: string): Promise<Record<string, unknown>> {
  const sequelize = new Sequelize({
    dialect: 'sqlite',
    storage: path.join(dataDir, 'emberline.sqlite'),
    logging: false,
  });
  try {
    const [row] = await sequelize.query<Record<string, unknown>>('SELECT * FROM label_batches WHERE id = ?', {
      replacements: [id],
      type: QueryTypes.SELECT,
    });
    return row;
  } finally {
    await sequelize.close();
  }
}

/** A batch of the demo's labels, over and over up to 5000 (the most one batch takes). */
async function postBatch(): Promise<string> {
  const ids = Array.from({ length: 5000 }, (_, i) => labelIds[i % labelIds.length]);
  const created = await api('POST', '/label-batches', { labelIds: ids, size: '4x6' }).catch((e: unknown) => {
    throw new Error(`${String(e)}\n${srv.log().slice(-3000)}`);
  });
  expect(created.status).toBe(202);
  return created.body.id as string;
}

/** Posts a batch and waits until it renders. */
async function startBigBatch(): Promise<string> {
  const id = await postBatch();
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    const b = await api('GET', `/label-batches/${id}`);
    if (b.body.status !== 'queued') {
      expect(b.body.status).toBe('running');
      return id;
    }
    await sleep(20);
  }
  throw new Error('the batch never started');
}

beforeAll(async () => {
  srv = await start();
  await signIn();
  const sites = await api('GET', '/sites');
  const list = (Array.isArray(sites.body) ? sites.body : sites.body.sites) as { id: string }[];
  for (const s of list) {
    const labels = await api('GET', `/sites/${s.id}/labels?current=1`);
    labelIds.push(...(labels.body.labels as { id: string }[]).map((l) => l.id));
  }
  expect(labelIds.length).toBeGreaterThan(0);
}, 120_000);

afterAll(async () => {
  for (const s of started) await s.kill();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('a print batch and a server stop', () => {
  it('killed mid-render is failed at restart with the reason, and the batch API says so', async () => {
    // Killed as soon as the batch is accepted: the job has just started (or is about to), far from done.
    const id = await postBatch();
    await srv.kill();
    // Nothing ran at the kill: the row is still unfinished, as a power cut would leave it.
    expect(['queued', 'running']).toContain((await batchRow(id)).status);

    srv = await start();
    expect(srv.log()).toMatch(/1 interrupted label print batch\(es\) marked failed/);
    await signIn();
    const b = await api('GET', `/label-batches/${id}`);
    expect(b.status).toBe(200);
    expect(b.body.status).toBe('failed');
    expect(b.body.message).toMatch(/interrupted by a server restart; make the print batch again/i);
    // No file for a failed batch.
    expect((await api('GET', `/label-batches/${id}/file`)).status).toBe(409);
  }, 180_000);

  it('a graceful stop that runs out of time marks the unfinished batch failed and exits non-zero', async () => {
    await srv.stop('SIGTERM');
    srv = await start({ SHUTDOWN_TIMEOUT_MS: '100' });
    await signIn();
    const id = await startBigBatch();
    const code = await srv.stop('SIGTERM');
    expect(code).toBe(1);
    expect(srv.log()).toMatch(/Shutdown timed out after 100 ms; 1 unfinished job\(s\) marked failed/);
    const row = await batchRow(id);
    expect(row.status).toBe('failed');
    expect(String(row.message)).toMatch(/server was shut down/);

    // Already failed: the next start has nothing to mark.
    srv = await start();
    expect(srv.log()).not.toMatch(/interrupted label print batch/);
  }, 180_000);
});
