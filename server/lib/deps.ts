import type { Db } from '../db/client';
import type { Env } from '../env';
import type { Clock } from './clock';
import type { RateStore } from './rate-store';
import type { OutboxDispatcher } from './mail/outbox';
import type { MailSink } from './mail/sink';
import type { SessionTokens } from './session';
import type { AuthLimits } from '../modules/auth/auth.service';

/** What every module receives: built once in createApp, never a global. */
export interface AppDeps {
  db: Db;
  env: Env;
  clock: Clock;
  /** Rate-limit counters in SQLite, shared by every process on the database. */
  rates: RateStore;
  outbox: OutboxDispatcher;
  tokens: SessionTokens;
  /** The in-process SMTP sink when no SMTP_URL is configured (development mailbox). */
  sink: MailSink | null;
  secureCookies: boolean;
  /** Sign-in and reset throttling overrides; the auth router builds its limiters from these per app. */
  authLimits?: Partial<AuthLimits>;
}
