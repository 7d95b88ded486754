import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { DEMO_PASSWORD, demoAccounts, makeTestApp, type TestApp } from '../factories/test-app';
import { SESSION_COOKIE } from '../../server/lib/session';

// Session cookie attributes, OWASP ASVS 5.0 3.3.x: HttpOnly, SameSite, Secure in production,
// host-wide path, and a lifetime no longer than the 30-minute idle limit.

const ORIGIN = 'http://localhost:3000';

function sessionCookie(res: request.Response): string {
  const all = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const c = all.find((v) => v.startsWith(`${SESSION_COOKIE}=`));
  if (!c) throw new Error('no session cookie');
  return c;
}

describe.each([
  { label: 'COOKIE_SECURE=true', env: { COOKIE_SECURE: 'true' }, secure: true },
  { label: 'COOKIE_SECURE=false', env: { COOKIE_SECURE: 'false' }, secure: false },
])('session cookie with $label', ({ env, secure }) => {
  let t: TestApp;
  beforeAll(async () => {
    t = await makeTestApp({ env });
  });
  afterAll(async () => {
    await t.close();
  });

  it('is HttpOnly, SameSite=Lax, path /, at most 30 minutes, and Secure exactly when configured', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.techA, password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    const c = sessionCookie(res);
    expect(c).toMatch(/;\s*HttpOnly/i);
    expect(c).toMatch(/;\s*SameSite=Lax/i);
    expect(c).toMatch(/;\s*Path=\//i);
    const maxAge = Number(/Max-Age=(\d+)/i.exec(c)?.[1]);
    expect(maxAge).toBeGreaterThan(0);
    expect(maxAge).toBeLessThanOrEqual(30 * 60);
    if (secure) expect(c).toMatch(/;\s*Secure/i);
    else expect(c).not.toMatch(/;\s*Secure/i);
  });

  it('is cleared with the same attributes on sign-out', async () => {
    const signin = await request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.reviewer, password: DEMO_PASSWORD });
    const token = sessionCookie(signin).split(';')[0];
    const out = await request(t.app).post('/api/auth/sign-out').set('Origin', ORIGIN).set('Cookie', token);
    expect(out.status).toBe(204);
    const c = sessionCookie(out);
    expect(c).toMatch(new RegExp(`^${SESSION_COOKIE}=;`));
    expect(c).toMatch(/Expires=Thu, 01 Jan 1970/i);
    expect(c).toMatch(/;\s*HttpOnly/i);
    if (secure) expect(c).toMatch(/;\s*Secure/i);
  });
});

describe('production default', () => {
  it('sets Secure when NODE_ENV=production and COOKIE_SECURE is not given', async () => {
    const t = await makeTestApp({ env: { NODE_ENV: 'production' } });
    try {
      const res = await request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.techB, password: DEMO_PASSWORD });
      expect(res.status).toBe(200);
      expect(sessionCookie(res)).toMatch(/;\s*Secure/i);
    } finally {
      await t.close();
    }
  });
});
