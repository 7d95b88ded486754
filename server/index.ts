import { readEnv, type Env } from './env';
import { openDatabase } from './db/client';
import { createApp } from './app';
import { MailSink } from './lib/mail/sink';
import { smtpMailer } from './lib/mail/mailer';
import { staticClient, viteClient } from './client-serving';
import { isEmpty, seedDemo, printDemoSignIns } from './db/seed/demo';
import { systemClock } from './lib/clock';
import type { Server } from 'node:http';
import { storageFor } from './lib/storage/create-storage';
import { describeSweep, sweepOrphans } from './modules/attachments/attachments.sweep';

async function main() {
  let env: Env;
  try {
    env = readEnv();
  } catch (e) {
    console.error((e as Error).message);
    process.exit(1);
  }

  const db = openDatabase(env.DATABASE_PATH);
  if (env.SEED_DEMO && isEmpty(db)) {
    seedDemo(db, { pepper: env.PASSWORD_PEPPER, bcryptCost: env.BCRYPT_COST, today: new Date().toISOString().slice(0, 10) });
    console.log('Seeded the demo scenario.');
  }

  // Files without rows and rows without files (a crash between a write and its commit).
  const sweep = await sweepOrphans(db, storageFor(env), { graceMs: env.STORAGE_DRIVER === 's3' ? 15 * 60_000 : 0 });
  console.log(describeSweep(sweep));

  let sink: MailSink | null = null;
  let smtpUrl = env.SMTP_URL;
  if (!smtpUrl) {
    sink = new MailSink();
    const port = await sink.listen(env.MAIL_SINK_PORT).catch(() => sink!.listen(0));
    smtpUrl = `smtp://127.0.0.1:${port}`;
    console.log(`Local mail sink listening on ${smtpUrl} (see /dev/mailbox).`);
  }

  const client = env.NODE_ENV === 'development' ? await viteClient() : env.NODE_ENV === 'test' ? [] : staticClient();
  const { app, deps } = createApp({ db, env, mailer: smtpMailer(smtpUrl, env.MAIL_FROM), clock: systemClock, sink, client });
  deps.outbox.start();

  const server: Server = app.listen(env.PORT, env.HOST, () => {
    console.log(`Fieldproof is running on ${env.PUBLIC_URL} (${env.NODE_ENV}).`);
    if (env.SEED_DEMO) printDemoSignIns();
  });
  server.on('error', (e) => {
    console.error(`Could not listen on ${env.HOST}:${env.PORT}: ${(e as Error).message}`);
    process.exit(1);
  });

  let stopping = false;
  const shutdown = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`${signal}: shutting down.`);
    server.close();
    server.closeAllConnections?.();
    await deps.outbox.stop();
    await sink?.close();
    db.$client.close();
    process.exit(0);
  };
  process.on('SIGINT', () => void shutdown('SIGINT'));
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
}

void main();
