import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { freePort } from './ports';

/** The real server (`server/start.ts`) in a child process, on its own port and data folder. */
export interface ChildServer {
  child: ChildProcess;
  port: number;
  baseUrl: string;
  /** Everything the child wrote to stdout and stderr so far. */
  log(): string;
  /** SIGKILL of the server and anything it spawned: no shutdown handler runs. Resolves when all are gone. */
  kill(): Promise<void>;
  /** A signal to the server; resolves with its exit code once it is gone. */
  stop(signal?: NodeJS.Signals): Promise<number | null>;
}

const ROOT = path.resolve(__dirname, '../..');

/**
 * Starts `node --import tsx server/start.ts` (one process, as `npm start` runs it: signals reach the server itself)
 * with PORT, HOST=127.0.0.1, DATA_DIR, SKIP_WEB_BUILD=1 and
 * DEMO_PASSWORD, and waits for the "is serving" log line and a 200 from GET /api/health.
 */
export async function startChildServer(opts: {
  dataDir: string;
  demoPassword: string;
  port?: number;
  timeoutMs?: number;
  /** More environment (applied last: e.g. NODE_ENV=production with JWT_SECRET and SMTP_URL). */
  env?: Record<string, string>;
}): Promise<ChildServer> {
  const port = opts.port ?? (await freePort());
  const env: NodeJS.ProcessEnv = { ...process.env };
  for (const k of ['DATABASE_URL', 'TEST_DATABASE_URL', 'JWT_SECRET', 'STORAGE', 'PUBLIC_BASE_URL', 'WEB_DIR'])
    delete env[k];
  Object.assign(env, {
    NODE_ENV: 'development',
    PORT: String(port),
    HOST: '127.0.0.1',
    DATA_DIR: opts.dataDir,
    SKIP_WEB_BUILD: '1',
    DEMO_PASSWORD: opts.demoPassword,
    LOG_REQUESTS: '0',
  });
  Object.assign(env, opts.env ?? {});
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/start.ts'], {
    cwd: ROOT,
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
    detached: true,
  });
  let output = '';
  child.stdout!.on('data', (d: Buffer) => (output += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (output += d.toString()));
  // 'close': the server has exited and every holder of its stdio is gone too.
  let exitCode: number | null = null;
  const exited = new Promise<void>((resolve) =>
    child.once('close', (code) => {
      exitCode = code;
      resolve();
    }),
  );
  let gone = false;
  void exited.then(() => (gone = true));
  const baseUrl = `http://127.0.0.1:${port}`;
  const server: ChildServer = {
    child,
    port,
    baseUrl,
    log: () => output,
    kill: async () => {
      // SIGKILL the whole process group: nothing the server started outlives it.
      if (!gone && child.pid) {
        try {
          process.kill(-child.pid, 'SIGKILL');
        } catch {
          // already gone
        }
      }
      await exited;
    },
    stop: async (signal = 'SIGTERM') => {
      if (!gone) child.kill(signal);
      await exited;
      return exitCode;
    },
  };

  const deadline = Date.now() + (opts.timeoutMs ?? 60_000);
  while (Date.now() < deadline) {
    if (gone) throw new Error(`The server exited before serving:\n${output}`);
    if (output.includes('is serving')) {
      try {
        const res = await fetch(`${baseUrl}/api/health`);
        if (res.status === 200) return server;
      } catch {
        // not listening yet
      }
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  await server.kill();
  throw new Error(`The server did not start within the time limit:\n${output}`);
}
