import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import type { RequestHandler } from 'express';
import { createApp } from '../../server/app';
import { smtpMailer } from '../../server/lib/mail/mailer';
import { hostnameOf } from '../../server/middleware/security';
import { auditLog, outbox, passwordResets } from '../../server/db/schema/index';
import { DEMO_PASSWORD, demoAccounts, flushMail, makeTestApp, type TestApp } from '../factories/test-app';

// Host allow-list and Origin checks against DNS rebinding and cross-site writes (OWASP ASVS 5.0
// 3.5.x and 13.4.x; OWASP CSRF Prevention Cheat Sheet, Origin verification and Fetch Metadata;
// RFC 9110 §15.5.20, 421 Misdirected Request). The allowed names come from PUBLIC_URL (plus the
// loopback names in demo mode), never from the request itself.

const ORIGIN = 'http://localhost:3000';

/** Stands in for the static client: answers every page it reaches. */
const fakeClient: RequestHandler = (_req, res) => void res.status(200).type('html').send('<!doctype html><title>client</title>');

describe('Host allow-list and Origin (demo mode, PUBLIC_URL http://localhost:3000)', () => {
  let t: TestApp;
  let withClient: ReturnType<typeof createApp>['app'];
  const counts = () => ({
    audit: t.db.select().from(auditLog).all().length,
    outbox: t.db.select().from(outbox).all().length,
    resets: t.db.select().from(passwordResets).all().length,
  });

  beforeAll(async () => {
    t = await makeTestApp();
    withClient = createApp({ db: t.db, env: t.env, mailer: smtpMailer('smtp://127.0.0.1:1', t.env.MAIL_FROM), sink: t.sink, client: [fakeClient] }).app;
  });
  afterAll(async () => {
    await t.close();
  });

  it('answers 421 to Host evil.example even with a matching Origin, and writes nothing (a sign-in with the right password sets no cookie)', async () => {
    const before = counts();
    const res = await request(t.app)
      .post('/api/auth/sign-in')
      .set('Host', 'evil.example')
      .set('Origin', 'http://evil.example')
      .send({ email: demoAccounts.techA, password: DEMO_PASSWORD });
    expect(res.status).toBe(421);
    expect(res.body).toEqual({ error: { code: 'misdirected_request', message: expect.any(String) } });
    expect(res.headers['set-cookie']).toBeUndefined();
    expect(counts()).toEqual(before);
    // The same with the configured Origin: the Host alone is refused.
    const same = await request(t.app).post('/api/auth/password-reset').set('Host', 'evil.example:3000').set('Origin', ORIGIN).send({ email: demoAccounts.techA });
    expect(same.status).toBe(421);
    expect(counts()).toEqual(before);
  });

  it('answers 421 before any route: reads, unknown API paths, the static client and the mailbox', async () => {
    for (const path of ['/api/auth/me', '/api/no-such-route', '/', '/claims', '/assets/index.js', '/dev/mailbox', '/api/dev/mailbox']) {
      const res = await request(withClient).get(path).set('Host', 'evil.example');
      expect(res.status, path).toBe(421);
      expect(res.body.error.code, path).toBe('misdirected_request');
    }
    // The same paths with an allowed Host are served (the check can pass).
    expect((await request(withClient).get('/claims').set('Host', 'localhost:3000')).status).toBe(200);
    expect((await request(withClient).get('/api/auth/me').set('Host', '127.0.0.1:3000')).status).toBe(401);
  });

  it('DNS rebinding: a page of evil.example rebound to 127.0.0.1 cannot read the mailbox', async () => {
    await request(t.app).post('/api/auth/password-reset').set('Origin', ORIGIN).send({ email: demoAccounts.accountant });
    await flushMail(t);
    expect(t.sink.to(demoAccounts.accountant).length).toBeGreaterThan(0);
    // The request comes from loopback (the browser runs on this machine) but names the attacker's host.
    for (const host of ['evil.example', 'evil.example:3000', 'EVIL.example.']) {
      for (const path of ['/api/dev/mailbox', `/api/dev/mailbox?to=${demoAccounts.accountant}`, '/dev/mailbox']) {
        const res = await request(withClient).get(path).set('Host', host).set('Origin', 'http://evil.example:3000');
        expect(res.status, `${host} ${path}`).toBe(421);
        expect(JSON.stringify(res.body)).not.toContain('reset');
      }
    }
    // From this machine with a loopback Host it is readable (the demo's own mailbox).
    const own = await request(t.app).get(`/api/dev/mailbox?to=${demoAccounts.accountant}`).set('Host', 'localhost:3000');
    expect(own.status).toBe(200);
    expect(own.body.messages.length).toBeGreaterThan(0);
  });

  it('refuses a Host that is not a plain host name (userinfo, paths, spaces) or is missing', async () => {
    for (const host of ['evil.example@127.0.0.1', 'localhost/x', 'local host', 'localhost:3000:1', '127.0.0.1.evil.example', 'localhost.evil.example']) {
      const res = await request(t.app).get('/api/auth/me').set('Host', host);
      expect(res.status, host).toBe(421);
    }
    expect(hostnameOf('[::1]:3000')).toBe('[::1]');
    expect(hostnameOf('LocalHost.:3000')).toBe('localhost');
    expect(hostnameOf('evil.example@127.0.0.1')).toBeNull();
    // An HTTP/1.0 request without any Host header.
    const server = t.app.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    try {
      const status = await new Promise<number>((resolve, reject) => {
        const req = http.request({ host: '127.0.0.1', port: (server.address() as AddressInfo).port, path: '/api/auth/me', setHost: false }, (res) => {
          res.resume();
          resolve(res.statusCode ?? 0);
        });
        req.on('error', reject);
        req.end();
      });
      // Node itself answers 400 to an HTTP/1.1 request without Host; either way nothing is served.
      expect([400, 421]).toContain(status);
    } finally {
      server.close();
    }
  });

  it('refuses a write from a foreign Origin with 403, and writes nothing', async () => {
    const before = counts();
    for (const origin of ['https://attacker.example', 'http://localhost:3000.attacker.example', 'http://localhost:3001', 'https://localhost:3000', 'null']) {
      const res = await request(t.app).post('/api/auth/password-reset').set('Host', 'localhost:3000').set('Origin', origin).send({ email: demoAccounts.techA });
      expect(res.status, origin).toBe(403);
      expect(res.body.error.code).toBe('forbidden');
    }
    expect(counts()).toEqual(before);
  });

  it('never derives the allowed Origin from the request: Host and Origin agreeing on another port is refused', async () => {
    // The old guard let any Origin through whose host equalled the Host header.
    const before = counts();
    const res = await request(t.app).post('/api/auth/sign-in').set('Host', '127.0.0.1:4999').set('Origin', 'http://127.0.0.1:4999').send({ email: demoAccounts.techA, password: DEMO_PASSWORD });
    expect(res.status).toBe(403);
    expect(res.headers['set-cookie']).toBeUndefined();
    expect(counts()).toEqual(before);
  });

  it('accepts a write from PUBLIC_URL’s origin, from the loopback origins on PORT in demo mode, and with Sec-Fetch-Site same-origin alone', async () => {
    for (const origin of [ORIGIN, 'http://127.0.0.1:3000', 'http://[::1]:3000']) {
      const res = await request(t.app).post('/api/auth/password-reset').set('Origin', origin).send({ email: 'nobody@harborview.test' });
      expect(res.status, origin).toBe(202);
    }
    const fetchMeta = await request(t.app).post('/api/auth/password-reset').set('Sec-Fetch-Site', 'same-origin').send({ email: 'nobody@harborview.test' });
    expect(fetchMeta.status).toBe(202);
  });

  it('without Origin: Sec-Fetch-Site other than same-origin is refused; a request with neither header (not a browser) passes', async () => {
    for (const site of ['cross-site', 'same-site', 'none']) {
      const res = await request(t.app).post('/api/auth/password-reset').set('Sec-Fetch-Site', site).send({ email: 'nobody@harborview.test' });
      expect(res.status, site).toBe(403);
    }
    const bare = await request(t.app).post('/api/auth/password-reset').send({ email: 'nobody@harborview.test' });
    expect(bare.status).toBe(202);
  });
});

describe('Host allow-list and Origin (deployment mode, PUBLIC_URL https://claims.fieldproof.example)', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await makeTestApp({ env: { SMTP_URL: 'smtp://127.0.0.1:1', PUBLIC_URL: 'https://claims.fieldproof.example', NODE_ENV: 'production', COOKIE_SECURE: 'false' } });
  });
  afterAll(async () => {
    await t.close();
  });

  it('answers only for PUBLIC_URL’s host: loopback names are 421 outside the demo', async () => {
    expect((await request(t.app).get('/api/auth/me').set('Host', 'claims.fieldproof.example')).status).toBe(401);
    for (const host of ['localhost:3000', '127.0.0.1', '[::1]:3000', 'evil.example', 'fieldproof.example']) {
      const res = await request(t.app).get('/api/auth/me').set('Host', host);
      expect(res.status, host).toBe(421);
    }
  });

  it('takes writes only from https://claims.fieldproof.example', async () => {
    const ok = await request(t.app).post('/api/auth/password-reset').set('Host', 'claims.fieldproof.example').set('Origin', 'https://claims.fieldproof.example').send({ email: 'nobody@harborview.test' });
    expect(ok.status).toBe(202);
    for (const origin of ['http://claims.fieldproof.example', 'http://localhost:3000', 'https://evil.example']) {
      const res = await request(t.app).post('/api/auth/password-reset').set('Host', 'claims.fieldproof.example').set('Origin', origin).send({ email: 'nobody@harborview.test' });
      expect(res.status, origin).toBe(403);
    }
  });
});
