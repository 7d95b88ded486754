import type { AddressInfo } from 'node:net';
import { openDatabase } from '../../../server/db/client';
import { createApp } from '../../../server/app';
import { readEnv } from '../../../server/env';
import { MailSink } from '../../../server/lib/mail/sink';
import { smtpMailer } from '../../../server/lib/mail/mailer';

/** The real app (createApp, every middleware) on the bench database, mail to an in-process sink. Sends `{ port }`. */
const env = readEnv(process.env);
const db = openDatabase(env.DATABASE_PATH);
const sink = new MailSink();
const smtpPort = await sink.listen(0);
const { app, deps } = createApp({ db, env, mailer: smtpMailer(`smtp://127.0.0.1:${smtpPort}`, env.MAIL_FROM), sink });

const server = app.listen(0, '127.0.0.1', () => {
  process.send?.({ port: (server.address() as AddressInfo).port });
});

process.on('SIGTERM', () => {
  server.close();
  server.closeAllConnections();
  void deps.outbox
    .stop()
    .then(() => sink.close())
    .finally(() => {
      db.$client.close();
      process.exit(0);
    });
});
