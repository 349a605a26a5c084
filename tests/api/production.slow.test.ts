/**
 * A production start: an empty database gets no demo accounts (their password is published), the banner says how to
 * make the first admin, `npm run create-admin` makes one who then signs in, and SIGTERM on an idle server exits 0.
 * The real server and the real command run in child processes, with NODE_ENV=production and what production requires
 * (JWT_SECRET, SMTP_URL — here a throwaway SMTP server on 127.0.0.1 that accepts and drops every message).
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { QueryTypes, Sequelize } from 'sequelize';
import { SMTPServer } from 'smtp-server';
import { shouldSeedDemo } from '../../server/seed/decision';
import { startChildServer, type ChildServer } from '../helpers/childServer';

const ROOT = path.resolve(__dirname, '../..');
const DEMO_PASSWORD = 'published-demo-password';
const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'emberline-production-'));
const started: ChildServer[] = [];
let smtp: SMTPServer;
let prodEnv: Record<string, string>;

beforeAll(async () => {
  smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    onData(stream, _session, callback) {
      stream.resume();
      stream.on('end', () => callback());
    },
  });
  await new Promise<void>((resolve) => smtp.listen(0, '127.0.0.1', resolve));
  const { port } = smtp.server.address() as AddressInfo;
  prodEnv = {
    NODE_ENV: 'production',
    JWT_SECRET: 'production-test-secret-0123456789-abcdefghij',
    SMTP_URL: `smtp://127.0.0.1:${port}`,
    LOG_LEVEL: 'info',
  };
});

afterAll(async () => {
  for (const s of started) await s.kill();
  await new Promise<void>((resolve) => smtp.close(() => resolve()));
  fs.rmSync(dataDir, { recursive: true, force: true });
});

async function start(): Promise<ChildServer> {
  const s = await startChildServer({ dataDir, demoPassword: DEMO_PASSWORD, timeoutMs: 90_000, env: prodEnv });
  started.push(s);
  return s;
}

function createAdmin(
  args: string[],
  env: Record<string, string>,
): Promise<{ code: number | null; stdout: string; stderr: string }> {
  const childEnv: NodeJS.ProcessEnv = { ...process.env, DATA_DIR: dataDir, ...prodEnv, ...env };
  delete childEnv.DATABASE_URL;
  return new Promise((resolve) => {
    const child = spawn(process.execPath, ['node_modules/tsx/dist/cli.mjs', 'server/cli/createAdmin.ts', ...args], {
      cwd: ROOT,
      env: childEnv,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
}

async function signIn(srv: ChildServer, email: string, password: string): Promise<Response> {
  return fetch(`${srv.baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
}

async function countRows(table: string): Promise<number> {
  const sequelize = new Sequelize({
    dialect: 'sqlite',
    storage: path.join(dataDir, 'emberline.sqlite'),
    logging: false,
  });
  try {
    const [row] = await sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM ${table}`, {
      type: QueryTypes.SELECT,
    });
    return Number(row.n);
  } finally {
    await sequelize.close();
  }
}

describe('the demo seeding decision', () => {
  it('seeds an empty database outside production, never in production unless SEED_DEMO=1, never a used one', () => {
    expect(shouldSeedDemo({ env: 'development', seedDemo: null }, true)).toBe(true);
    expect(shouldSeedDemo({ env: 'test', seedDemo: null }, true)).toBe(true);
    expect(shouldSeedDemo({ env: 'production', seedDemo: null }, true)).toBe(false);
    expect(shouldSeedDemo({ env: 'production', seedDemo: '1' }, true)).toBe(true);
    expect(shouldSeedDemo({ env: 'development', seedDemo: '0' }, true)).toBe(false);
    expect(shouldSeedDemo({ env: 'development', seedDemo: null }, false)).toBe(false);
    expect(shouldSeedDemo({ env: 'production', seedDemo: '1' }, false)).toBe(false);
  });
});

describe('a production start on an empty database', () => {
  it('creates no account, prints no demo password, says how to create the admin, and stops with exit 0', async () => {
    const srv = await start();
    const log = srv.log();
    expect(log).not.toMatch(/Demo accounts/);
    expect(log).not.toContain(DEMO_PASSWORD);
    expect(log).toMatch(/npm run create-admin -- --org/);
    // Production logs are JSON lines.
    expect(log.split('\n').some((l) => l.startsWith('{') && JSON.parse(l).service === 'emberline')).toBe(true);
    expect((await signIn(srv, 'admin@larkspur.example', DEMO_PASSWORD)).status).toBe(401);
    // An idle server (one keep-alive connection open from fetch) stops at once and cleanly on SIGTERM.
    expect(await srv.stop('SIGTERM')).toBe(0);
    expect(srv.log()).toMatch(/SIGTERM: stopping/);
    expect(await countRows('users')).toBe(0);
    expect(await countRows('organizations')).toBe(0);
  }, 120_000);

  it('create-admin refuses bad arguments and a short password, with a non-zero exit and nothing written', async () => {
    const missing = await createAdmin(['--org', 'Orchard Hill Works', '--email', 'lead@orchard.example'], {
      ADMIN_PASSWORD: 'a-long-enough-password',
    });
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/Missing --name/);
    const unknown = await createAdmin(['--org', 'X', '--email', 'a@b.example', '--name', 'A', '--role', 'admin'], {
      ADMIN_PASSWORD: 'a-long-enough-password',
    });
    expect(unknown.code).toBe(2);
    const badEmail = await createAdmin(['--org', 'X', '--email', 'not-an-address', '--name', 'A'], {
      ADMIN_PASSWORD: 'a-long-enough-password',
    });
    expect(badEmail.code).toBe(1);
    expect(badEmail.stderr).toMatch(/email: Enter a valid e-mail address/);
    const short = await createAdmin(['--org', 'X', '--email', 'a@b.example', '--name', 'A'], {
      ADMIN_PASSWORD: 'short',
    });
    expect(short.code).toBe(1);
    expect(short.stderr).toMatch(/password: Use at least 10 characters/);
    const noPassword = await createAdmin(['--org', 'X', '--email', 'a@b.example', '--name', 'A'], {
      ADMIN_PASSWORD: '',
    });
    expect(noPassword.code).toBe(2);
    expect(noPassword.stderr).toMatch(/ADMIN_PASSWORD/);
    expect(await countRows('users')).toBe(0);
    expect(await countRows('organizations')).toBe(0);
  }, 120_000);

  it('create-admin makes the organization and its admin, who signs in; the same e-mail again is refused', async () => {
    const made = await createAdmin(
      ['--org', 'Orchard Hill Works', '--email', 'Lead@Orchard.example', '--name', 'Ada Quillfeather'],
      { ADMIN_PASSWORD: 'orchard-admin-password' },
    );
    expect(made.stderr).toBe('');
    expect(made.code).toBe(0);
    expect(made.stdout).toMatch(/Created the organization "Orchard Hill Works" and its admin lead@orchard\.example/);

    const again = await createAdmin(['--org', 'Another', '--email', 'lead@orchard.example', '--name', 'Someone'], {
      ADMIN_PASSWORD: 'another-admin-password',
    });
    expect(again.code).toBe(1);
    expect(again.stderr).toMatch(/already exists/);
    expect(await countRows('organizations')).toBe(1);
    // The audit log has the organization's and the user's creation.
    expect(await countRows("audit_events WHERE action IN ('organization.created', 'user.created')")).toBe(2);

    const srv = await start();
    expect(srv.log()).not.toMatch(/Demo accounts|create-admin/);
    const res = await signIn(srv, 'lead@orchard.example', 'orchard-admin-password');
    expect(res.status).toBe(200);
    const body = (await res.json()) as { token: string; user: { role: string; name: string } };
    expect(body.user.role).toBe('admin');
    expect(body.user.name).toBe('Ada Quillfeather');
    // The new organization starts with the default reminder rules, like every organization.
    const rules = await fetch(`${srv.baseUrl}/api/reminder-rules`, {
      headers: { Authorization: `Bearer ${body.token}` },
    });
    expect(rules.status).toBe(200);
    expect(((await rules.json()) as { rules: unknown[] }).rules.length).toBeGreaterThan(0);
    expect((await signIn(srv, 'admin@larkspur.example', DEMO_PASSWORD)).status).toBe(401);
    expect(await srv.stop('SIGINT')).toBe(0);
  }, 120_000);
});
