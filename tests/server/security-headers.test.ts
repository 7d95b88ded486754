import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { makeTestApp, type TestApp } from '../factories/test-app';

// Response headers, OWASP ASVS 5.0 3.4.x and the OWASP HTTP Headers Cheat Sheet: a strict CSP
// with frame-ancestors 'none', X-Content-Type-Options nosniff, a Referrer-Policy, no caching of
// API answers (Cache-Control: no-store), and no X-Powered-By; on successes and on errors alike.

const ORIGIN = 'http://localhost:3000';

describe('security headers on /api routes', () => {
  let t: TestApp;
  let agent: Awaited<ReturnType<TestApp['signIn']>>;
  beforeAll(async () => {
    t = await makeTestApp();
    agent = await t.signIn('reviewer');
  });
  afterAll(async () => {
    await t.close();
  });

  const cases: { label: string; run: () => Promise<request.Response>; status: number }[] = [
    { label: 'GET /api/auth/me signed in', run: () => agent.get('/api/auth/me'), status: 200 },
    { label: 'GET /api/auth/me signed out (401)', run: () => request(t.app).get('/api/auth/me'), status: 401 },
    { label: 'unknown API route (404)', run: () => request(t.app).get('/api/no-such-thing'), status: 404 },
    { label: 'wrong password (401)', run: () => request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: 'x@harborview.test', password: 'wrong-password-here' }), status: 401 },
    { label: 'invalid body (400)', run: () => request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).send({ email: 3 }), status: 400 },
    { label: 'malformed JSON (400)', run: () => request(t.app).post('/api/auth/sign-in').set('Origin', ORIGIN).set('Content-Type', 'application/json').send('{'), status: 400 },
    { label: 'cross-site write (403)', run: () => request(t.app).post('/api/auth/sign-out').set('Origin', 'https://elsewhere.example'), status: 403 },
    { label: 'form body (415)', run: () => request(t.app).post('/api/auth/sign-in').type('form').send('email=a&password=b'), status: 415 },
    { label: 'password reset (202)', run: () => request(t.app).post('/api/auth/password-reset').set('Origin', ORIGIN).send({ email: 'someone@prairieline.test' }), status: 202 },
    { label: 'sign-out (204)', run: () => request(t.app).post('/api/auth/sign-out').set('Origin', ORIGIN), status: 204 },
  ];

  it.each(cases)('$label', async ({ run, status }) => {
    const res = await run();
    expect(res.status).toBe(status);
    const csp = String(res.headers['content-security-policy']);
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).not.toMatch(/script-src[^;]*'unsafe-inline'/);
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['referrer-policy']).toBe('no-referrer');
    expect(res.headers['cache-control']).toBe('no-store');
    expect(res.headers['x-frame-options']).toBe('SAMEORIGIN');
    expect(res.headers).not.toHaveProperty('x-powered-by');
    if (res.status >= 400) {
      expect(res.headers['content-type']).toMatch(/^application\/json/);
      expect(res.body.error).toEqual(expect.objectContaining({ code: expect.any(String), message: expect.any(String) }));
    }
  });

  it('sends Strict-Transport-Security outside development', async () => {
    const res = await request(t.app).get('/api/auth/me');
    expect(res.headers['strict-transport-security']).toMatch(/max-age=\d+/);
  });
});
