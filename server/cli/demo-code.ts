/**
 * `npm run demo:code -- <e-mail>`: prints the current authenticator code (RFC 6238) of a demo
 * account from the demo database, so the accountant and the manufacturer admin can sign in
 * without an authenticator app. Demo mode only (no SMTP_URL): a real deployment has no use for it.
 */
import Database from 'better-sqlite3';
import { existsSync } from 'node:fs';
import { TOTP_STEP_SECONDS, totpCodeAt, totpUri } from '../lib/totp';

function main(argv: string[]): number {
  const email = argv.find((a) => !a.startsWith('-'))?.trim().toLowerCase();
  if (!email) {
    console.error('Usage: npm run demo:code -- <e-mail>   (for example accounts@larkfield.test)');
    return 2;
  }
  if (process.env.SMTP_URL) {
    console.error('demo:code works in demo mode only (SMTP_URL is set): use the authenticator app of the account.');
    return 1;
  }
  const path = process.env.DATABASE_PATH || 'data/fieldproof.sqlite';
  if (!existsSync(path)) {
    console.error(`No database at ${path}: start the app once (npm start) so the demo is seeded.`);
    return 1;
  }
  const db = new Database(path, { readonly: true, fileMustExist: true });
  try {
    const row = db
      .prepare('select t.secret as secret from totp_credentials t join users u on u.id = t.user_id where lower(u.email) = ? and t.confirmed_at is not null')
      .get(email) as { secret: string } | undefined;
    if (!row) {
      console.error(`${email} has no authenticator set up in ${path}.`);
      return 1;
    }
    const now = Date.now();
    const left = TOTP_STEP_SECONDS - (Math.floor(now / 1000) % TOTP_STEP_SECONDS);
    console.log(`${totpCodeAt(row.secret, now)}  (code for ${email}, valid for ${left} more seconds; each code works once)`);
    if (argv.includes('--secret')) console.log(`Secret for an authenticator app: ${row.secret}\n${totpUri(row.secret, email)}`);
    else console.log('Add --secret to print the secret for an authenticator app instead.');
  } finally {
    db.close();
  }
  return 0;
}

process.exitCode = main(process.argv.slice(2));
