import express, { type Express, type RequestHandler } from 'express';
import { installMessages } from '@shared/schemas/messages';
import cookieParser from 'cookie-parser';
import type { Db } from './db/client';
import { modeOf, type Env } from './env';
import { systemClock, type Clock } from './lib/clock';
import { OutboxDispatcher } from './lib/mail/outbox';
import type { Mailer } from './lib/mail/mailer';
import type { MailSink } from './lib/mail/sink';
import { SessionTokens } from './lib/session';
import { RateStore } from './lib/rate-store';
import type { AppDeps } from './lib/deps';
import { authenticate } from './middleware/authenticate';
import { limitWrites } from './middleware/rate-limit';
import { csrfGuard, hostAllowList, localMailboxOnly, noStore, securityHeaders, siteNames } from './middleware/security';
import { apiNotFound, errorHandler } from './middleware/error-handler';
import { mountApi } from './routes';
import { idempotency } from './middleware/idempotency';

export interface CreateAppOptions {
  db: Db;
  env: Env;
  mailer: Mailer;
  clock?: Clock;
  sink?: MailSink | null;
  /** Serves the client after the API: static build in production, Vite middleware in development. */
  client?: RequestHandler[];
  /** Overrides of the sign-in and reset throttling limits (per app instance). */
  authLimits?: AppDeps['authLimits'];
}

export interface App {
  app: Express;
  deps: AppDeps;
}

/** Builds the Express app without listening, so tests drive it with supertest. */
installMessages();

export function createApp(opts: CreateAppOptions): App {
  const clock = opts.clock ?? systemClock;
  const deps: AppDeps = {
    db: opts.db,
    env: opts.env,
    clock,
    rates: new RateStore(opts.db, clock),
    outbox: new OutboxDispatcher(opts.db, opts.mailer, clock),
    tokens: new SessionTokens(opts.env.SESSION_SECRET),
    sink: opts.sink ?? null,
    secureCookies: opts.env.COOKIE_SECURE ?? opts.env.NODE_ENV === 'production',
    authLimits: opts.authLimits,
  };

  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', opts.env.TRUST_PROXY ? 1 : false);
  app.set('query parser', 'simple');
  app.use(securityHeaders({ dev: opts.env.NODE_ENV === 'development' }));
  // Before any route, the static client and the mailbox: a foreign Host is 421 (DNS rebinding).
  const demo = modeOf(opts.env) === 'demo';
  const names = siteNames({ publicUrl: opts.env.PUBLIC_URL, port: opts.env.PORT, demo });
  app.use(hostAllowList(names));
  // The demo mailbox (page and API) answers local requests only, and nobody in deployment mode.
  app.use(localMailboxOnly({ enabled: demo && deps.sink !== null }));

  const api = express.Router();
  api.use(noStore);
  api.use(csrfGuard(names.origins));
  api.use(express.json({ limit: '256kb', strict: true }));
  api.use(cookieParser());
  api.use(authenticate({ db: deps.db, tokens: deps.tokens, clock, secureCookies: deps.secureCookies }));
  api.use(limitWrites(deps));
  api.use(idempotency({ db: deps.db, clock }));
  mountApi(api, deps);
  api.use(apiNotFound);
  app.use('/api', api);
  app.use('/api', errorHandler);

  for (const h of opts.client ?? []) app.use(h);
  app.use(errorHandler);
  return { app, deps };
}
