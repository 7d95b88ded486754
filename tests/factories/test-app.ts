import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { openDatabase, type Db } from '../../server/db/client';
import { createApp } from '../../server/app';
import { DEFAULT_USER_RATES as USER_RATES, parseEnv, type Env } from '../../server/env';
import { MailSink } from '../../server/lib/mail/sink';
import { smtpMailer } from '../../server/lib/mail/mailer';
import { seedDemo } from '../../server/db/seed/demo';
import type { Clock } from '../../server/lib/clock';
import { totpCodeFor } from './second-factor';

export const DEMO_PASSWORD = 'fieldproof-demo';

/** The per-user rate limits as a deployment has them by default (the factory raises them otherwise). */
export const DEFAULT_USER_RATES = Object.fromEntries(Object.entries(USER_RATES).map(([k, v]) => [k, String(v)]));
export const demoAccounts = {
  techA: 'tech@harborview.test',
  adminA: 'admin@harborview.test',
  techB: 'tech@prairieline.test',
  adminB: 'admin@prairieline.test',
  reviewer: 'reviewer@larkfield.test',
  accountant: 'accounts@larkfield.test',
  mfrAdmin: 'admin@larkfield.test',
} as const;
export type DemoKey = keyof typeof demoAccounts;

/** A settable clock for tests of expiry and windows. */
export class TestClock implements Clock {
  constructor(private t = new Date('2026-06-15T12:00:00.000Z')) {}
  now() {
    return new Date(this.t);
  }
  set(d: Date | string) {
    this.t = new Date(d);
  }
  advance(ms: number) {
    this.t = new Date(this.t.getTime() + ms);
  }
}

export interface TestApp {
  app: ReturnType<typeof createApp>['app'];
  deps: ReturnType<typeof createApp>['deps'];
  db: Db;
  sink: MailSink;
  env: Env;
  dir: string;
  /** A supertest agent signed in as a demo account (cookie kept), with the same-origin header set. */
  signIn(who: DemoKey | string, password?: string): Promise<ReturnType<typeof request.agent>>;
  close(): Promise<void>;
}

/**
 * A real app on a real SQLite file in a temp folder, seeded with the demo scenario, with mail
 * going over SMTP to an in-process sink on a free port. No mocks.
 */
export async function makeTestApp(opts: { seed?: boolean; clock?: Clock; env?: Partial<Record<keyof Env, string>> } = {}): Promise<TestApp> {
  const dir = mkdtempSync(join(tmpdir(), 'fieldproof-test-'));
  // Fresh random secrets for every app: no key is written into the tests.
  const env = parseEnv({
    SESSION_SECRET: randomBytes(32).toString('base64url'),
    PASSWORD_PEPPER: randomBytes(24).toString('base64url'),
    NODE_ENV: 'test',
    DATABASE_PATH: join(dir, 'test.sqlite'),
    STORAGE_DIR: join(dir, 'files'),
    BCRYPT_COST: '4',
    PUBLIC_URL: 'http://localhost:3000',
    // Tests replay thousands of requests on a frozen clock; the per-user rates are measured with
    // their defaults in rate-limits.test.ts (pass DEFAULT_USER_RATES to get them).
    RATE_WRITES_PER_MINUTE: '1000000',
    RATE_UPLOADS_PER_MINUTE: '1000000',
    RATE_UNIT_LOOKUPS_PER_MINUTE: '1000000',
    ...opts.env,
  });
  const db = openDatabase(env.DATABASE_PATH);
  if (opts.seed !== false) {
    const today = (opts.clock ?? { now: () => new Date() }).now().toISOString().slice(0, 10);
    seedDemo(db, { pepper: env.PASSWORD_PEPPER, bcryptCost: 4, today });
  }
  const sink = new MailSink();
  const port = await sink.listen(0);
  const { app, deps } = createApp({ db, env, mailer: smtpMailer(`smtp://127.0.0.1:${port}`, env.MAIL_FROM), clock: opts.clock, sink });

  return {
    app,
    deps,
    db,
    sink,
    env,
    dir,
    async signIn(who, password = DEMO_PASSWORD) {
      const email = who in demoAccounts ? demoAccounts[who as DemoKey] : who;
      const agent = request.agent(app);
      const res = await agent.post('/api/auth/sign-in').set('Origin', 'http://localhost:3000').send({ email, password });
      if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
      const second = res.body?.secondFactor as { purpose: 'verify' | 'enrol' } | undefined;
      if (second) await completeSecondFactor(agent, db, email, second.purpose, (opts.clock ?? { now: () => new Date() }).now().getTime());
      return agent;
    },
    async close() {
      await deps.outbox.stop();
      await sink.close();
      db.$client.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/**
 * Completes the second-factor step of a sign-in as a person with an authenticator app would:
 * the code is computed from the secret in the database (seeded, or the one enrolment shows).
 */
export async function completeSecondFactor(agent: ReturnType<typeof request.agent>, db: Db, email: string, purpose: 'verify' | 'enrol', nowMs: number): Promise<void> {
  const origin = 'http://localhost:3000';
  if (purpose === 'enrol') {
    const setup = await agent.post('/api/auth/second-factor/enrol/totp').set('Origin', origin).send({});
    if (setup.status !== 200) throw new Error(`TOTP enrolment of ${email} failed: ${setup.status} ${JSON.stringify(setup.body)}`);
  }
  // Tests sign the same person in many times within one 30-second step (often on a stopped clock);
  // the helper stands for a fresh code each time. Refusing a used code is tested on its own.
  db.$client.prepare('update totp_credentials set last_used_step = null where user_id = (select id from users where email = ?)').run(email);
  const code = totpCodeFor(db.$client, email, nowMs);
  const path = purpose === 'enrol' ? '/api/auth/second-factor/enrol/totp/confirm' : '/api/auth/second-factor/totp';
  const done = await agent.post(path).set('Origin', origin).send({ code });
  if (done.status !== 200) throw new Error(`second factor of ${email} failed: ${done.status} ${JSON.stringify(done.body)}`);
}

/** Waits until the dispatcher has flushed the outbox into the sink. */
export async function flushMail(t: TestApp): Promise<void> {
  await t.deps.outbox.flush();
}
