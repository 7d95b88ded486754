import Database from 'better-sqlite3';
import { totpCodeFor } from '../../factories/second-factor';

const cookiesOf = (res: Response) => res.headers.getSetCookie().map((c) => c.split(';')[0]!);

/**
 * Signs a bench user in as a script would (no Origin header: a non-browser client), and completes
 * the second factor from the seeded authenticator secret in the bench database when the account
 * asks for one. Answers the session cookie.
 */
export async function benchSignIn(url: string, email: string, password: string, databasePath: string): Promise<string> {
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`bench sign-in as ${email} answered ${res.status}: ${await res.text()}`);
  let cookies = cookiesOf(res);
  const body = (await res.json()) as { secondFactor?: { purpose: string } };
  if (body.secondFactor) {
    const sqlite = new Database(databasePath, { readonly: true });
    let code: string;
    try {
      code = totpCodeFor(sqlite, email);
    } finally {
      sqlite.close();
    }
    const second = await fetch(`${url}/api/auth/second-factor/totp`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', cookie: cookies.join('; ') },
      body: JSON.stringify({ code }),
    });
    if (second.status !== 200) throw new Error(`bench second factor of ${email} answered ${second.status}: ${await second.text()}`);
    cookies = cookiesOf(second);
  }
  const session = cookies.find((c) => c.startsWith('fp_session='));
  if (!session) throw new Error('bench sign-in set no session cookie');
  return session;
}
