import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { auditLog, outbox, passwordResets, users } from '../../server/db/schema/index';
import { DEMO_PASSWORD, demoAccounts, makeTestApp, type TestApp } from '../factories/test-app';
import { SESSION_COOKIE } from '../../server/lib/session';

// Cross-site request forgery, OWASP ASVS 5.0 3.5.x and the OWASP CSRF Prevention Cheat Sheet
// (Fetch Metadata, Origin verification, and a JSON-only body that a cross-site form cannot send
// without a preflight): refused before anything is written; GET never writes.

const ORIGIN = 'http://localhost:3000';

describe('CSRF guard', () => {
  let t: TestApp;
  let cookie: string;
  const counts = () => ({
    audit: t.db.select().from(auditLog).all().length,
    outbox: t.db.select().from(outbox).all().length,
    resets: t.db.select().from(passwordResets).all().length,
    version: t.db.select().from(users).where(eq(users.email, demoAccounts.adminA)).get()!.sessionVersion,
  });

  beforeAll(async () => {
    t = await makeTestApp();
    const res = await request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: demoAccounts.adminA, password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    cookie = ([] as string[]).concat(res.headers['set-cookie']).find((c) => c.startsWith(`${SESSION_COOKIE}=`))!.split(';')[0];
  });
  afterAll(async () => {
    await t.close();
  });

  const writes = [
    { path: '/api/auth/sign-out', body: undefined },
    { path: '/api/auth/password-reset', body: { email: demoAccounts.adminA } },
    { path: '/api/auth/sign-in', body: { email: demoAccounts.adminA, password: DEMO_PASSWORD } },
  ];

  describe.each(writes)('POST $path', ({ path, body }) => {
    it.each([
      { label: 'a foreign Origin', headers: { Origin: 'https://attacker.example' } },
      { label: 'Origin null (sandboxed frame)', headers: { Origin: 'null' } },
      { label: 'a look-alike Origin', headers: { Origin: 'http://localhost:3000.attacker.example' } },
      { label: 'Sec-Fetch-Site: cross-site', headers: { 'Sec-Fetch-Site': 'cross-site' } },
      { label: 'Sec-Fetch-Site: same-site (a sibling subdomain)', headers: { 'Sec-Fetch-Site': 'same-site' } },
    ])('is refused with 403 for $label, and nothing is written', async ({ headers }) => {
      const before = counts();
      const res = await request(t.app).post(path).set('Cookie', cookie).set(headers).send(body);
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('forbidden');
      expect(res.headers['set-cookie']).toBeUndefined();
      expect(counts()).toEqual(before);
    });

    it('is refused with 415 for a form-encoded or text body, and nothing is written', async () => {
      const before = counts();
      const form = await request(t.app).post(path).set('Cookie', cookie).set('Origin', ORIGIN).type('form').send('email=admin%40harborview.test&password=x');
      expect(form.status).toBe(415);
      const text = await request(t.app).post(path).set('Cookie', cookie).set('Origin', ORIGIN).set('Content-Type', 'text/plain').send('{"email":"admin@harborview.test"}');
      expect(text.status).toBe(415);
      expect(counts()).toEqual(before);
    });
  });

  it('lets a same-origin JSON write through (the guard is not refusing everything)', async () => {
    const res = await request(t.app).post('/api/auth/password-reset').set('Origin', ORIGIN).set('Sec-Fetch-Site', 'same-origin').send({ email: 'not-registered@harborview.test' });
    expect(res.status).toBe(202);
  });

  it('never writes from GET: GET on a write route is 404 and the session survives', async () => {
    const before = counts();
    for (const path of ['/api/auth/sign-out', '/api/auth/password-reset', '/api/auth/password-reset/confirm', '/api/auth/sign-in']) {
      const res = await request(t.app).get(path).set('Cookie', cookie);
      expect(res.status).toBe(404);
    }
    expect(counts()).toEqual(before);
    expect((await request(t.app).get('/api/auth/me').set('Cookie', cookie)).status).toBe(200);
  });
});
