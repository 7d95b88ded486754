import { afterEach, describe, expect, it } from 'vitest';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { ApiError, api, buildUrl, errorMessage } from './api-client';

let fake: ReturnType<typeof installFakeFetch> | null = null;
afterEach(() => fake?.restore());

describe('api client', () => {
  it('throws an ApiError carrying status, code, message and field errors on a 400', async () => {
    fake = installFakeFetch(() =>
      json({ error: { code: 'validation_failed', message: 'Some fields need attention.', fields: { email: 'Enter a valid e-mail address.' } } }, { status: 400 }),
    );
    const error = await api.post('/api/auth/sign-in', { email: 'x', password: 'y' }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 400, code: 'validation_failed', message: 'Some fields need attention.', fields: { email: 'Enter a valid e-mail address.' } });
  });

  it('sends JSON with same-origin credentials and parses the answer', async () => {
    fake = installFakeFetch((c) => (c.url.pathname === '/api/thing' ? json({ ok: 1 }) : undefined));
    await expect(api.post('/api/thing', { a: 1 })).resolves.toEqual({ ok: 1 });
    const init = fake.calls[0].init!;
    expect(init.credentials).toBe('same-origin');
    expect(init.method).toBe('POST');
    expect((init.headers as Record<string, string>)['Content-Type']).toBe('application/json');
    expect(fake.calls[0].body).toEqual({ a: 1 });
  });

  it('returns undefined for 204 No Content', async () => {
    fake = installFakeFetch(() => new Response(null, { status: 204 }));
    await expect(api.post('/api/auth/sign-out')).resolves.toBeUndefined();
  });

  it('reads Retry-After on a 429 and says how long to wait', async () => {
    fake = installFakeFetch(() => json({ error: { code: 'too_many_requests', message: 'Too many attempts.' } }, { status: 429, headers: { 'Retry-After': '120' } }));
    const error = (await api.post('/api/auth/sign-in', {}).catch((e: unknown) => e)) as ApiError;
    expect(error.status).toBe(429);
    expect(error.retryAfterSeconds).toBe(120);
    expect(errorMessage(error)).toBe('Too many attempts. You can try again in 2 minutes.');
  });

  it('turns a body that is not the error shape into an ApiError with a plain message', async () => {
    fake = installFakeFetch(() => new Response('<html>bad gateway</html>', { status: 502 }));
    const error = (await api.get('/api/home').catch((e: unknown) => e)) as ApiError;
    expect(error).toBeInstanceOf(ApiError);
    expect(error.status).toBe(502);
    expect(error.code).toBe('http_502');
    expect(error.fields).toBeUndefined();
  });

  it('reports an unreachable server as status 0', async () => {
    const original = globalThis.fetch;
    globalThis.fetch = (() => Promise.reject(new TypeError('Failed to fetch'))) as typeof fetch;
    try {
      await expect(api.get('/api/home')).rejects.toMatchObject({ status: 0, code: 'network_error' });
    } finally {
      globalThis.fetch = original;
    }
  });

  it('leaves empty filters out of the query string', () => {
    expect(buildUrl('/api/claims', { state: 'submitted', q: '', agency: undefined, cursor: null, limit: 25 })).toBe('/api/claims?state=submitted&limit=25');
    expect(buildUrl('/api/claims', { q: '' })).toBe('/api/claims');
  });
});
