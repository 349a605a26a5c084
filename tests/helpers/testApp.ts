import { randomUUID } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import type { Express } from 'express';
import type { Role } from '../../shared/schemas/common';
import { createApp } from '../../server/app';
import { hashPassword } from '../../server/auth/passwords';
import { loadConfig, type Config } from '../../server/config';
import { migrate, openDb, type Db } from '../../server/db';
import { Organization, User } from '../../server/db/models';
import type { AppContext } from '../../server/services/context';
import { closeStudyWorkers } from '../../server/services/studyWorker';

export const TEST_PASSWORD = 'correct-horse-battery';
export const TEST_SECRET = 'test-secret-test-secret-test-secret-0123456789';

export interface TestOrg {
  id: string;
  users: Record<Role, { id: string; email: string; token: string }>;
}

export interface TestApp {
  app: Express;
  ctx: AppContext;
  db: Db;
  config: Config;
  orgA: TestOrg;
  orgB: TestOrg;
  /** Fix the server clock (null: the real clock again). */
  setNow(d: Date | null): void;
  close(): Promise<void>;
}

/**
 * A fresh app on its own database (in-memory SQLite by default; TEST_DATABASE_URL for PostgreSQL, which is emptied
 * first), with two organizations that each have one user per role, all signed in.
 */
export async function makeTestApp(): Promise<TestApp> {
  const databaseUrl = process.env.TEST_DATABASE_URL ?? 'sqlite::memory:';
  const config = loadConfig(
    { NODE_ENV: 'test' },
    {
      databaseUrl,
      jwtSecret: TEST_SECRET,
      dataDir: path.join(os.tmpdir(), `emberline-test-${randomUUID()}`),
    },
  );
  const db = await openDb(databaseUrl);
  if (db.dialect === 'postgres') {
    await db.sequelize.query('DROP SCHEMA public CASCADE; CREATE SCHEMA public;');
  }
  await migrate(db);
  let fixedNow: Date | null = null;
  const { app, ctx } = createApp({ config, db, now: () => fixedNow ?? new Date(), signInLimitPerMinute: 10_000 });
  // No SMTP_URL in the test config: mail goes over a real socket to the local sink, which files it in captured_mail.
  await ctx.mail.start();
  const hash = await hashPassword(TEST_PASSWORD);
  const roles: Role[] = ['admin', 'engineer', 'electrician', 'safety'];

  async function makeOrg(name: string, slug: string): Promise<TestOrg> {
    const org = await Organization.create({ id: randomUUID(), name });
    const users = {} as TestOrg['users'];
    for (const role of roles) {
      const email = `${role}@${slug}.example`;
      const u = await User.create({
        id: randomUUID(),
        organizationId: org.id,
        email,
        name: `${role} of ${slug}`,
        role,
        passwordHash: hash,
      });
      const res = await request(app).post('/api/auth/sign-in').send({ email, password: TEST_PASSWORD });
      if (res.status !== 200) throw new Error(`sign-in failed for ${email}: ${JSON.stringify(res.body)}`);
      users[role] = { id: u.id, email, token: res.body.token };
    }
    return { id: org.id, users };
  }

  const orgA = await makeOrg('Test Organization A', 'org-a');
  const orgB = await makeOrg('Test Organization B', 'org-b');
  return {
    app,
    ctx,
    db,
    config,
    orgA,
    orgB,
    setNow: (d) => {
      fixedNow = d;
    },
    close: async () => {
      await ctx.jobs.idle();
      await closeStudyWorkers();
      await ctx.mail.close();
      await db.close();
    },
  };
}

export const bearer = (token: string): [string, string] => ['Authorization', `Bearer ${token}`];
