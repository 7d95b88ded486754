import { vi } from 'vitest';

export interface FakeCall {
  method: string;
  url: URL;
  body: unknown;
  init: RequestInit | undefined;
}

export type FakeHandler = (call: FakeCall) => Response | Promise<Response> | undefined;

export function json(body: unknown, init: ResponseInit = {}): Response {
  return new Response(JSON.stringify(body), { status: 200, ...init, headers: { 'Content-Type': 'application/json', ...(init.headers ?? {}) } });
}

/**
 * Replaces globalThis.fetch with a small fake of the network for component tests:
 * each handler may answer a call; an unanswered call fails the test loudly (501).
 */
export function installFakeFetch(...handlers: FakeHandler[]) {
  const calls: FakeCall[] = [];
  const original = globalThis.fetch;
  const fake = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = new URL(typeof input === 'string' ? input : input instanceof URL ? input.href : input.url, 'http://localhost');
    const raw = init?.body;
    const call: FakeCall = { method: init?.method ?? 'GET', url, body: typeof raw === 'string' ? JSON.parse(raw) : undefined, init };
    calls.push(call);
    for (const h of handlers) {
      const r = await h(call);
      if (r) return r;
    }
    return json({ error: { code: 'not_faked', message: `No fake for ${call.method} ${url.pathname}` } }, { status: 501 });
  });
  globalThis.fetch = fake as typeof fetch;
  return {
    calls,
    fake,
    restore: () => {
      globalThis.fetch = original;
    },
  };
}
