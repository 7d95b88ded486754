import type { ApiErrorBody } from '@shared/schemas/api-error';

/** An API answer that was not 2xx (or no answer at all: status 0). */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields: Record<string, string> | undefined;
  /** Seconds to wait, from Retry-After on a 429. */
  readonly retryAfterSeconds: number | undefined;

  constructor(init: { status: number; code: string; message: string; fields?: Record<string, string>; retryAfterSeconds?: number }) {
    super(init.message);
    this.name = 'ApiError';
    this.status = init.status;
    this.code = init.code;
    this.fields = init.fields;
    this.retryAfterSeconds = init.retryAfterSeconds;
  }
}

export function isApiError(e: unknown, status?: number): e is ApiError {
  return e instanceof ApiError && (status === undefined || e.status === status);
}

export type QueryValue = string | number | boolean | null | undefined;

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  /** Sent as JSON. */
  body?: unknown;
  /** Appended as search params; empty, null and undefined values are left out. */
  query?: Record<string, QueryValue>;
  signal?: AbortSignal;
  /** Sent as the Idempotency-Key header: one key per intended action, the same on a retry. */
  idempotencyKey?: string;
}

const fallbackMessages: Record<number, string> = {
  400: 'Some fields need attention.',
  401: 'Please sign in.',
  403: 'You are not allowed to do that.',
  404: 'Not found.',
  409: 'This record changed meanwhile. Reload it and try again.',
  413: 'That is too large.',
  415: 'That file type is not accepted.',
  429: 'Too many attempts. Try again later.',
};

export function buildUrl(path: string, query?: Record<string, QueryValue>): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    params.set(key, String(value));
  }
  const qs = params.toString();
  return qs ? `${path}${path.includes('?') ? '&' : '?'}${qs}` : path;
}

function parseRetryAfter(header: string | null): number | undefined {
  if (!header) return undefined;
  const seconds = Number(header);
  if (Number.isFinite(seconds) && seconds >= 0) return Math.ceil(seconds);
  const at = Date.parse(header);
  return Number.isNaN(at) ? undefined : Math.max(0, Math.ceil((at - Date.now()) / 1000));
}

function isErrorBody(x: unknown): x is ApiErrorBody {
  if (!x || typeof x !== 'object' || !('error' in x)) return false;
  const e = (x as { error: unknown }).error;
  return !!e && typeof e === 'object' && typeof (e as { message?: unknown }).message === 'string';
}

async function toApiError(response: Response): Promise<ApiError> {
  let body: unknown = null;
  try {
    body = await response.json();
  } catch {
    body = null;
  }
  const retryAfterSeconds = parseRetryAfter(response.headers.get('Retry-After'));
  if (isErrorBody(body)) {
    return new ApiError({
      status: response.status,
      code: typeof body.error.code === 'string' ? body.error.code : `http_${response.status}`,
      message: body.error.message,
      fields: body.error.fields,
      retryAfterSeconds,
    });
  }
  return new ApiError({
    status: response.status,
    code: `http_${response.status}`,
    message: fallbackMessages[response.status] ?? 'Something went wrong on the server. Try again in a moment.',
    retryAfterSeconds,
  });
}

/**
 * Step-up: when the server answers 401 `step_up_required` (a sensitive change and no sign-in
 * within 5 minutes), the registered handler asks the user to confirm it is them; the request is
 * then sent once more. The handler rejects when the user cancels, and the first error stands.
 */
type StepUpHandler = () => Promise<void>;
let stepUpHandler: StepUpHandler | null = null;
export function setStepUpHandler(handler: StepUpHandler | null): void {
  stepUpHandler = handler;
}

/**
 * The one way the client talks to /api: same-origin cookies, JSON both ways, and any
 * answer that is not ok thrown as an ApiError carrying status, code, message and fields.
 */
export async function apiRequest<T>(path: string, options: RequestOptions = {}): Promise<T> {
  try {
    return await sendRequest<T>(path, options);
  } catch (e) {
    if (!(e instanceof ApiError) || e.code !== 'step_up_required' || !stepUpHandler) throw e;
    try {
      await stepUpHandler();
    } catch {
      throw e;
    }
    return sendRequest<T>(path, options);
  }
}

async function sendRequest<T>(path: string, options: RequestOptions): Promise<T> {
  const { method = 'GET', body, query, signal, idempotencyKey } = options;
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (body !== undefined) headers['Content-Type'] = 'application/json';
  if (idempotencyKey) headers['Idempotency-Key'] = `"${idempotencyKey}"`;
  let response: Response;
  try {
    response = await globalThis.fetch(buildUrl(path, query), {
      method,
      headers,
      body: body === undefined ? undefined : JSON.stringify(body),
      credentials: 'same-origin',
      signal,
    });
  } catch (e) {
    if (e instanceof DOMException && e.name === 'AbortError') throw e;
    throw new ApiError({ status: 0, code: 'network_error', message: 'Fieldproof could not be reached. Check the connection and try again.' });
  }
  if (!response.ok) throw await toApiError(response);
  if (response.status === 204 || response.status === 205) return undefined as T;
  const text = await response.text();
  if (!text) return undefined as T;
  try {
    return JSON.parse(text) as T;
  } catch {
    throw new ApiError({ status: response.status, code: 'invalid_response', message: 'The server sent an answer the app could not read.' });
  }
}

export const api = {
  get: <T>(path: string, query?: Record<string, QueryValue>, signal?: AbortSignal) => apiRequest<T>(path, { query, signal }),
  post: <T>(path: string, body?: unknown, opts: { idempotencyKey?: string } = {}) => apiRequest<T>(path, { method: 'POST', body, ...opts }),
  patch: <T>(path: string, body?: unknown) => apiRequest<T>(path, { method: 'PATCH', body }),
  put: <T>(path: string, body?: unknown) => apiRequest<T>(path, { method: 'PUT', body }),
  delete: <T>(path: string) => apiRequest<T>(path, { method: 'DELETE' }),
};

/** A sentence for any error, for alerts. */
export function errorMessage(e: unknown): string {
  if (e instanceof ApiError) {
    if (e.status === 429 && e.retryAfterSeconds !== undefined) {
      const wait = e.retryAfterSeconds >= 90 ? `${Math.ceil(e.retryAfterSeconds / 60)} minutes` : `${e.retryAfterSeconds} seconds`;
      return `${e.message} You can try again in ${wait}.`;
    }
    return e.message;
  }
  if (e instanceof Error && e.message) return e.message;
  return 'Something went wrong. Try again.';
}
