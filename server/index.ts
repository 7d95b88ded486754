import { isLoopbackHost, modeOf, readEnvWithSecrets, type Env, type ReadEnvResult } from './env';
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
  let secrets: ReadEnvResult['secrets'];
  try {
    ({ env, secrets } = readEnvWithSecrets());
  } catch (e) {
    console.error((e as Error).message);
    process.exit(1);
  }
  if (secrets.generated.length > 0) {
    console.log(`Generated ${secrets.generated.join(' and ')} into ${secrets.file} (mode 0600); later starts reuse it. Keep it with the database: without it sessions and passwords stop working.`);
  }
  const mode = modeOf(env);

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
  }

  const client = env.NODE_ENV === 'development' ? await viteClient() : env.NODE_ENV === 'test' ? [] : staticClient();
  const { app, deps } = createApp({ db, env, mailer: smtpMailer(smtpUrl, env.MAIL_FROM), clock: systemClock, sink, client });
  deps.outbox.start();

  const server: Server = app.listen(env.PORT, env.HOST, () => {
    const address = server.address();
    const port = address && typeof address === 'object' ? address.port : env.PORT;
    // HOST passed the loopback check by name; make sure the name did not resolve elsewhere.
    if (mode === 'demo' && address && typeof address === 'object' && !isLoopbackHost(address.address)) {
      console.error(`HOST ${env.HOST} resolved to ${address.address}, which is not a loopback address; demo mode listens on loopback only.`);
      process.exit(1);
    }
    console.log(startLine({ env, mode, port, smtpUrl: smtpUrl!, secretsFile: secrets.fromFile.length > 0 ? secrets.file : null }));
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

/** The one line that says how this process runs: mode, database, storage driver, mail path. */
function startLine(o: { env: Env; mode: 'demo' | 'deployment'; port: number; smtpUrl: string; secretsFile: string | null }): string {
  const { env } = o;
  const storage = env.STORAGE_DRIVER === 's3' ? `s3 (bucket ${env.S3_BUCKET}${env.S3_ENDPOINT ? ` at ${env.S3_ENDPOINT}` : ''})` : `local (${env.STORAGE_DIR})`;
  const mail =
    o.mode === 'demo'
      ? `local sink ${o.smtpUrl}, mailbox ${new URL('/dev/mailbox', env.PUBLIC_URL).href} (this machine only)`
      : `SMTP ${redactUrl(o.smtpUrl)}, no mailbox`;
  const secrets = o.secretsFile ? `, secrets from ${o.secretsFile}` : '';
  const listen = `http://${env.HOST.includes(':') ? `[${env.HOST}]` : env.HOST}:${o.port}`;
  return `Fieldproof in ${o.mode} mode on ${env.PUBLIC_URL} (listening on ${listen}, ${env.NODE_ENV}): database ${env.DATABASE_PATH}, storage ${storage}, mail ${mail}${secrets}.`;
}

function redactUrl(url: string): string {
  try {
    const u = new URL(url);
    if (u.password) u.password = '***';
    return u.href;
  } catch {
    return '(unparsable SMTP_URL)';
  }
}

void main();
