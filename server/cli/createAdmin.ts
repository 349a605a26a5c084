/**
 * `npm run create-admin -- --org "Name" --email a@b.example --name "Full Name"`: a new organization and its first
 * admin, for a production database (where no demo accounts are seeded). The password is read from ADMIN_PASSWORD when
 * set (scripts), else asked for twice on the terminal without echo. The app's password policy applies. Exit codes: 0
 * created, 1 refused (e-mail in use, password too short, …), 2 bad arguments or configuration.
 */
import { parseArgs } from 'node:util';
import { ConfigError, loadConfig } from '../config';
import { migrate, openDb } from '../db';
import { BootstrapError, createOrganizationWithAdmin } from '../services/bootstrap';

const USAGE =
  'Usage: npm run create-admin -- --org "Organization name" --email admin@example.net --name "Full Name"\n' +
  '  The password: ADMIN_PASSWORD=… in the environment, or typed at the prompt (not shown).';

function fail(message: string, code: number): never {
  console.error(message);
  process.exit(code);
}

/** Reads one line from the terminal without echoing it. */
function promptHidden(question: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const stdin = process.stdin;
    // No echo before the question shows: what is typed after it is never on the screen.
    stdin.setRawMode(true);
    process.stdout.write(question);
    stdin.resume();
    stdin.setEncoding('utf8');
    let value = '';
    const finish = (): void => {
      stdin.setRawMode(false);
      stdin.pause();
      stdin.off('data', onData);
      process.stdout.write('\n');
    };
    const onData = (chunk: string): void => {
      for (const c of chunk) {
        if (c === '\r' || c === '\n' || c === '\u0004') {
          finish();
          resolve(value);
          return;
        }
        if (c === '\u0003') {
          finish();
          reject(new Error('Cancelled'));
          return;
        }
        if (c === '\u007f' || c === '\b') value = value.slice(0, -1);
        else if (c >= ' ') value += c;
      }
    };
    stdin.on('data', onData);
  });
}

async function readPassword(): Promise<string> {
  const fromEnv = process.env.ADMIN_PASSWORD;
  if (fromEnv !== undefined && fromEnv !== '') return fromEnv;
  if (!process.stdin.isTTY) {
    fail('No password: set ADMIN_PASSWORD in the environment, or run the command in a terminal to type it.', 2);
  }
  const first = await promptHidden('Password for the new admin (at least 10 characters): ');
  const again = await promptHidden('The same password again: ');
  if (first !== again) fail('The two passwords differ; nothing was created.', 1);
  return first;
}

async function main(): Promise<void> {
  let args;
  try {
    args = parseArgs({
      options: { org: { type: 'string' }, email: { type: 'string' }, name: { type: 'string' } },
      strict: true,
      allowPositionals: false,
    }).values;
  } catch (e) {
    fail(`${e instanceof Error ? e.message : String(e)}\n${USAGE}`, 2);
  }
  const missing = (['org', 'email', 'name'] as const).filter((k) => !args[k]?.trim());
  if (missing.length) fail(`Missing ${missing.map((k) => `--${k}`).join(', ')}\n${USAGE}`, 2);

  let config;
  try {
    // The command neither signs tokens nor sends mail: production's JWT_SECRET and SMTP_URL are not needed for it.
    config = loadConfig(process.env, {
      jwtSecret: 'not-used-by-the-create-admin-command',
      smtpUrl: 'smtp://not-used.invalid',
    });
  } catch (e) {
    if (e instanceof ConfigError) fail(e.message, 2);
    throw e;
  }
  const password = await readPassword();
  const db = await openDb(config.databaseUrl);
  let refused: BootstrapError | null = null;
  try {
    await migrate(db);
    const created = await createOrganizationWithAdmin(db, {
      organization: args.org!,
      email: args.email!,
      name: args.name!,
      password,
    });
    console.log(
      `Created the organization "${args.org!.trim()}" and its admin ${created.email}; sign in with that address.`,
    );
  } catch (e) {
    if (!(e instanceof BootstrapError)) throw e;
    refused = e;
  } finally {
    await db.close();
  }
  if (refused) fail(`Nothing was created: ${refused.message}`, 1);
}

void main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
