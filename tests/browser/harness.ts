import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

export const ROOT = path.resolve(__dirname, '../..');
export const SHOTS = path.join(ROOT, 'tests/screenshots');
export const DEMO_PASSWORD = 'browser-demo-password';
export const PHONE = { width: 390, height: 844 };
export const DESKTOP = { width: 1280, height: 800 };

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
    srv.on('error', reject);
  });
}

/**
 * Clears the page origin's local storage through the DevTools protocol (no script is evaluated in the page: the app's
 * CSP forbids eval, and some Chromium builds enforce it against test tools too).
 */
export async function clearLocalStorage(page: Page): Promise<void> {
  const origin = new URL(page.url()).origin;
  const cdp = await page.context().newCDPSession(page);
  try {
    await cdp.send('Storage.clearDataForOrigin', { origin, storageTypes: 'local_storage' });
  } finally {
    await cdp.detach().catch(() => undefined);
  }
}

/** Polls a condition from the test side (never a string evaluated in the page) until it holds or the time runs out. */
export async function pollUntil(check: () => Promise<boolean>, what: string, timeoutMs = 20_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** A browser spec: its name (the runner's filter matches it) and what it does. */
export type Spec = { name: string; run: (h: Harness) => Promise<void> };

export function assert(cond: unknown, message: string): asserts cond {
  if (!cond) throw new Error(message);
}

/** A JSON call to the harness's API from the test side (setting up data), failing with the answer's text. */
export async function api<T = unknown>(
  h: Harness,
  path: string,
  init: { method?: string; body?: unknown; token?: string } = {},
): Promise<T> {
  const res = await fetch(`${h.baseUrl}/api${path}`, {
    method: init.method ?? 'GET',
    headers: {
      ...(init.token ? { Authorization: `Bearer ${init.token}` } : {}),
      ...(init.body ? { 'Content-Type': 'application/json' } : {}),
    },
    body: init.body ? JSON.stringify(init.body) : undefined,
  });
  if (!res.ok) throw new Error(`${path}: ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

/** The demo engineer's token, signed in from the test side. */
export async function engineerToken(h: Harness): Promise<string> {
  const { token } = await api<{ token: string }>(h, '/auth/sign-in', {
    method: 'POST',
    body: { email: 'engineer@larkspur.example', password: DEMO_PASSWORD },
  });
  return token;
}

/**
 * A draft study on a site of the spec's own (no demo study gets a revision another spec would trip over) holding
 * `model`, set up through the API as the demo engineer.
 */
export async function draftStudyWithModel(
  h: Harness,
  { siteName, title, model }: { siteName: string; title: string; model: unknown },
): Promise<{ id: string; siteId: string; token: string }> {
  const token = await engineerToken(h);
  const site = await api<{ id: string }>(h, '/sites', { method: 'POST', token, body: { name: siteName } });
  const study = await api<{ id: string }>(h, `/sites/${site.id}/studies`, { method: 'POST', token, body: { title } });
  const env = await api<{ version: number }>(h, `/studies/${study.id}/model`, { token });
  await api(h, `/studies/${study.id}/model`, { method: 'PUT', token, body: { model, version: env.version } });
  return { id: study.id, siteId: site.id, token };
}

/** Runs a draft and waits for the run to be done (a failed run fails the spec). */
export async function runToDone(h: Harness, studyId: string, token: string, timeoutMs = 90_000): Promise<void> {
  await api(h, `/studies/${studyId}/run`, { method: 'POST', token });
  await pollUntil(
    async () => {
      const r = await api<{ status: string; message?: string }>(h, `/studies/${studyId}/run`, { token });
      if (r.status === 'failed') throw new Error(`the run failed: ${r.message ?? ''}`);
      return r.status === 'done';
    },
    'the run to finish',
    timeoutMs,
  );
}

export interface Harness {
  baseUrl: string;
  context: BrowserContext;
  newPage(viewport: { width: number; height: number }): Promise<Page>;
  signIn(page: Page, email: string): Promise<void>;
  shot(page: Page, name: string): Promise<string>;
  stop(): Promise<void>;
}

/** Starts the real server (`npm start` path: migrate, seed, build web when stale) on a fresh database, and Chromium. */
export async function startHarness(): Promise<Harness> {
  const port = await freePort();
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'emberline-browser-'));
  const server: ChildProcess = spawn(
    process.execPath,
    [path.join(ROOT, 'node_modules/tsx/dist/cli.mjs'), 'server/start.ts'],
    {
      cwd: ROOT,
      // Many sign-ins a minute from one address (the limit itself is tested in tests/api/auth.test.ts).
      env: {
        ...process.env,
        PORT: String(port),
        HOST: '127.0.0.1',
        DATA_DIR: dataDir,
        DEMO_PASSWORD,
        NODE_ENV: 'development',
        SIGN_IN_LIMIT_PER_MINUTE: '1000',
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    },
  );
  let log = '';
  server.stdout?.on('data', (d) => (log += d));
  server.stderr?.on('data', (d) => (log += d));
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 5 * 60_000;
  for (;;) {
    if (server.exitCode !== null) throw new Error(`server exited:\n${log}`);
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok && log.includes('is serving')) break;
    } catch {
      /* not up yet */
    }
    if (Date.now() > deadline) throw new Error(`server did not start:\n${log}`);
    await new Promise((r) => setTimeout(r, 500));
  }
  fs.mkdirSync(SHOTS, { recursive: true });
  const context = await chromium.launchPersistentContext(fs.mkdtempSync(path.join(os.tmpdir(), 'emberline-chrome-')), {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  return {
    baseUrl,
    context,
    async newPage(viewport) {
      const page = await context.newPage();
      await page.setViewportSize(viewport);
      page.setDefaultTimeout(20_000);
      return page;
    },
    async signIn(page, email) {
      // One browser profile is shared by all specs: start every sign-in from a clean session.
      await page.goto(`${baseUrl}/sign-in`);
      await clearLocalStorage(page);
      await page.goto(`${baseUrl}/sign-in`);
      await page.getByTestId('email').fill(email);
      await page.getByTestId('password').fill(DEMO_PASSWORD);
      await page.getByTestId('sign-in-submit').click();
    },
    async shot(page, name) {
      // The app scrolls inside its own views: grow the viewport to the tallest scroll content for a whole-page picture.
      const file = path.join(SHOTS, `${name}.png`);
      const viewport = page.viewportSize() ?? DESKTOP;
      const tallest = await page
        .locator('div')
        .evaluateAll((divs) => Math.max(0, ...divs.map((d) => d.scrollHeight - d.clientHeight)));
      const height = Math.min(6000, viewport.height + Math.max(0, tallest));
      await page.setViewportSize({ width: viewport.width, height });
      await page.waitForTimeout(150);
      await page.screenshot({ path: file });
      await page.setViewportSize(viewport);
      return file;
    },
    async stop() {
      await context.close().catch(() => undefined);
      server.kill('SIGTERM');
      await new Promise((r) => setTimeout(r, 300));
      if (server.exitCode === null) server.kill('SIGKILL');
    },
  };
}
