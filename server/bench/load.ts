/**
 * `npm run bench:load`: HTTP load on four routes of an in-process server (SQLite in a temp folder, the demo seeded, and
 * a generated plant of about 2 000 buses run for the results routes).
 * 50 connections, LOAD_SECONDS (default 20) per route, one route after the other (`npm run bench:load -- labels` runs
 * the routes whose name contains the word). autocannon runs in a process of its own. Prints p50/p99 latency, requests
 * per second, the server's CPU time per request (steadier than latency on a shared machine), errors and non-2xx
 * responses per route; asserts nothing. As in production, JSON answers are not checked against their schemas.
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { createApp } from '../app';
import { loadConfig } from '../config';
import { migrate, openDb } from '../db';
import { DEMO_USERS, seedDemo } from '../seed/demo';
import { generatedPlant } from './study';

/** What one route is loaded with. */
interface AutocannonOptions {
  url: string;
  connections: number;
  duration: number;
  method?: 'GET' | 'POST';
  headers?: Record<string, string>;
  body?: string;
}
interface AutocannonResult {
  latency: { p50: number; p99: number; average: number };
  requests: { average: number; total: number };
  errors: number;
  timeouts: number;
  non2xx: number;
  statusCodeStats: Record<string, { count: number }>;
}
/**
 * autocannon in a process of its own (its command line, JSON result on stdout): the load generator shares neither
 * the server's event loop nor its CPU accounting, so the server's CPU time per request can be read here.
 */
function autocannon(opts: AutocannonOptions): Promise<AutocannonResult> {
  const args = [require.resolve('autocannon/autocannon.js'), '-j', '-c', String(opts.connections)];
  args.push('-d', String(opts.duration), '-m', opts.method ?? 'GET');
  for (const [k, v] of Object.entries(opts.headers ?? {})) args.push('-H', `${k}=${v}`);
  if (opts.body !== undefined) args.push('-b', opts.body);
  args.push(opts.url);
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, args, { stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    child.stdout.on('data', (c: Buffer) => (out += c.toString()));
    child.stderr.on('data', (c: Buffer) => (err += c.toString()));
    child.on('error', reject);
    child.on('close', (code) => {
      if (code !== 0) reject(new Error(`autocannon exited with ${code}: ${err.slice(0, 500)}`));
      else resolve(JSON.parse(out) as AutocannonResult);
    });
  });
}

const CONNECTIONS = 50;
const PASSWORD = 'bench-load-password-1';

/** IEEE 1584-2018 inputs of one 480 V VCB case (a valid request body, nothing more). */
const INCIDENT_ENERGY_BODY = {
  voltageV: 480,
  boltedFaultKa: 20,
  electrodeConfig: 'VCB',
  gapMm: 25,
  workingDistanceMm: 457.2,
  enclosureMm: { height: 508, width: 508, depth: 508 },
  arcDurationMs: 50,
};

function listen(server: Server): Promise<number> {
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => resolve((server.address() as AddressInfo).port));
  });
}

async function json<T>(res: Response, what: string): Promise<T> {
  if (!res.ok) throw new Error(`${what}: HTTP ${res.status} ${(await res.text()).slice(0, 300)}`);
  return (await res.json()) as T;
}

/** Requests cut off by autocannon keep running in the server for up to about a second: wait for them. */
const DRAIN_MS = 2000;
const drain = (): Promise<void> => new Promise((resolve) => setTimeout(resolve, DRAIN_MS));

const ms = (x: number): string => `${x.toFixed(1)} ms`.padStart(10);

async function main(): Promise<void> {
  const seconds = Number(process.env.LOAD_SECONDS ?? 20);
  const filter = process.argv[2];
  if (!Number.isFinite(seconds) || seconds <= 0)
    throw new Error(`LOAD_SECONDS must be a positive number, got ${process.env.LOAD_SECONDS}`);

  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'emberline-load-'));
  const databaseUrl = `sqlite:${path.join(dir, 'load.sqlite')}`;
  const config = loadConfig(
    { NODE_ENV: 'test' },
    { databaseUrl, dataDir: dir, jwtSecret: 'load-secret-load-secret-load-secret-123456' },
  );
  const db = await openDb(databaseUrl);
  await migrate(db);
  // As in production: JSON answers are not checked against their response schemas (tests do that).
  const { app, ctx } = createApp({
    config,
    db,
    signInLimitPerMinute: 1000,
    publicCheckPerMinute: 1e9,
    checkResponses: false,
  });
  const server = createServer(app);
  try {
    console.log('Seeding the demo (model, run, approval)…');
    await seedDemo(ctx, PASSWORD);
    const port = await listen(server);
    const base = `http://127.0.0.1:${port}/api`;

    // Sign in as the demo engineer, then find the study and one of its labels through the API.
    const engineer = DEMO_USERS.find((u) => u.role === 'engineer');
    if (!engineer) throw new Error('no demo engineer');
    const signIn = await json<{ token: string }>(
      await fetch(`${base}/auth/sign-in`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ email: engineer.email, password: PASSWORD }),
      }),
      'sign-in',
    );
    const auth = { Authorization: `Bearer ${signIn.token}` };
    const sites = await json<{ sites: { id: string }[] }>(
      await fetch(`${base}/sites`, { headers: auth }),
      'list sites',
    );
    const siteId = sites.sites[0]?.id;
    if (!siteId) throw new Error('demo site not found');
    const studies = await json<{ studies: { id: string; status: string }[] }>(
      await fetch(`${base}/sites/${siteId}/studies`, { headers: auth }),
      'list studies',
    );
    const study = studies.studies.find((s) => s.status === 'approved') ?? studies.studies[0];
    if (!study) throw new Error('demo study not found');
    const labels = await json<{ labels: { code: string }[] }>(
      await fetch(`${base}/studies/${study.id}/labels`, { headers: auth }),
      'list labels',
    );
    const code = labels.labels[0]?.code;
    if (!code) throw new Error('demo study has no labels');

    // A generated plant (about 2 000 labelled buses) saved, run and read a page at a time: the results page under
    // load is one of a large study, sorted by energy, past the first page.
    console.log('Running a generated plant…');
    const big = await json<{ id: string }>(
      await fetch(`${base}/sites/${siteId}/studies`, {
        method: 'POST',
        headers: { ...auth, 'content-type': 'application/json' },
        body: JSON.stringify({ title: 'Generated plant (load)' }),
      }),
      'create study',
    );
    const envelope = await json<{ version: number }>(
      await fetch(`${base}/studies/${big.id}/model`, { headers: auth }),
      'read model',
    );
    await json(
      await fetch(`${base}/studies/${big.id}/model`, {
        method: 'PUT',
        headers: { ...auth, 'content-type': 'application/json' },
        body: JSON.stringify({ model: generatedPlant(), version: envelope.version }),
      }),
      'save model',
    );
    await json(await fetch(`${base}/studies/${big.id}/run`, { method: 'POST', headers: auth }), 'start run');
    for (;;) {
      const run = await json<{ status: string; message: string }>(
        await fetch(`${base}/studies/${big.id}/run`, { headers: auth }),
        'poll run',
      );
      if (run.status === 'failed') throw new Error(`generated plant run failed: ${run.message}`);
      if (run.status === 'done') break;
      await new Promise((r) => setTimeout(r, 250));
    }
    const page = await json<{ summary: { buses: number } }>(
      await fetch(`${base}/studies/${big.id}/results?pageSize=1`, { headers: auth }),
      'results page',
    );

    const targets: { name: string; opts: Omit<AutocannonOptions, 'connections' | 'duration'> }[] = [
      {
        name: `GET …/results page (${page.summary.buses} buses)`,
        opts: { url: `${base}/studies/${big.id}/results?sort=energy&page=3&pageSize=50`, headers: auth },
      },
      {
        name: `GET …/results/buses/:busId`,
        opts: { url: `${base}/studies/${big.id}/results/buses/MCC-7-42`, headers: auth },
      },
      { name: `GET /api/labels/:code (public)`, opts: { url: `${base}/labels/${encodeURIComponent(code)}` } },
      {
        name: `POST /api/calc/incident-energy`,
        opts: {
          url: `${base}/calc/incident-energy`,
          method: 'POST',
          headers: { ...auth, 'content-type': 'application/json' },
          body: JSON.stringify(INCIDENT_ENERGY_BODY),
        },
      },
    ];

    console.log(
      `Emberline load (node ${process.version}, SQLite, ${CONNECTIONS} connections, ${seconds} s per route)\n`,
    );
    const rows: string[] = [];
    for (const t of targets) {
      if (filter && !t.name.includes(filter)) continue;
      process.stdout.write(`  ${t.name} …\n`);
      // One request first: the steady state is measured, not the first read of a cold cache.
      const first = await fetch(t.opts.url, {
        method: t.opts.method ?? 'GET',
        headers: t.opts.headers,
        body: t.opts.body,
      });
      if (!first.ok) throw new Error(`${t.name}: HTTP ${first.status}`);
      await first.arrayBuffer();
      const cpu0 = process.cpuUsage();
      const r = await autocannon({ ...t.opts, connections: CONNECTIONS, duration: seconds });
      // The server's CPU time (this process: its event loop, the database's threads, GC) per answered request.
      const cpu = process.cpuUsage(cpu0);
      const cpuPerRequestMs = (cpu.user + cpu.system) / 1000 / Math.max(1, r.requests.total);
      // autocannon drops its sockets at the end; let the requests still in the server finish before the next route.
      await drain();
      const codes = Object.entries(r.statusCodeStats)
        .map(([status, s]) => `${status}×${s.count}`)
        .join(' ');
      rows.push(
        `${t.name.padEnd(34)}${ms(r.latency.p50)}${ms(r.latency.p99)}${r.requests.average.toFixed(0).padStart(10)}` +
          `${cpuPerRequestMs.toFixed(2).padStart(12)}${String(r.errors + r.timeouts).padStart(8)}` +
          `${String(r.non2xx).padStart(8)}   ${codes}`,
      );
    }
    console.log(
      `\n${'route'.padEnd(34)}${'p50'.padStart(10)}${'p99'.padStart(10)}${'req/s'.padStart(10)}${'CPU ms/req'.padStart(12)}${'errors'.padStart(8)}${'non2xx'.padStart(8)}   status codes`,
    );
    for (const row of rows) console.log(row);
  } finally {
    await new Promise<void>((resolve) => server.close(() => resolve()));
    server.closeAllConnections();
    await drain();
    await ctx.jobs.idle();
    await db.close();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

void main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
