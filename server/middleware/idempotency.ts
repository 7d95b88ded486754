/**
 * The Idempotency-Key request header (IETF HTTP API working group draft "The Idempotency-Key
 * HTTP Header Field") on every signed-in POST with a JSON or empty body.
 *
 * The first request with a key reserves it (one INSERT, per user and key) with a fingerprint
 * of its method, path and body, runs, and stores its status and JSON answer. A retry with the
 * same key and the same request gets that answer again (header `Idempotent-Replayed: true`);
 * the same key with another request is 422; a retry while the first is still running waits
 * for its answer (up to a few seconds, then 409). Answers of 5xx are not kept, so the client
 * may retry. Keys are kept 24 hours. Multipart uploads are not covered: their body is read
 * by the route, after this middleware.
 */
import { createHash } from 'node:crypto';
import type { RequestHandler, Response } from 'express';
import { and, eq, lt } from 'drizzle-orm';
import type { Db } from '../db/client';
import { idempotencyKeys } from '../db/schema/index';
import type { Clock } from '../lib/clock';
import { AppError } from '../lib/errors';

export const IDEMPOTENCY_HEADER = 'idempotency-key';
const KEEP_MS = 24 * 60 * 60 * 1000;
const WAIT_MS = 10_000;
const POLL_MS = 15;

/** A key is an RFC 8941 sf-string (`"..."`) or, leniently, the bare characters; 1 to 255 visible ASCII characters. */
export function parseIdempotencyKey(raw: string): string | null {
  let v = raw.trim();
  if (v.length >= 2 && v.startsWith('"') && v.endsWith('"')) v = v.slice(1, -1);
  if (v.length < 1 || v.length > 255) return null;
  return /^[\x21\x23-\x5b\x5d-\x7e]+$/.test(v) ? v : null;
}

function fingerprintOf(method: string, path: string, body: unknown): string {
  return createHash('sha256')
    .update(`${method}\n${path}\n${body === undefined ? '' : JSON.stringify(body)}`)
    .digest('hex');
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export function idempotency(deps: { db: Db; clock: Clock }): RequestHandler {
  const { db, clock } = deps;
  const find = (userId: string, key: string) => db.select().from(idempotencyKeys).where(and(eq(idempotencyKeys.userId, userId), eq(idempotencyKeys.key, key))).get();

  function replay(res: Response, row: { responseStatus: number | null; responseBody: string | null }) {
    res.setHeader('Idempotent-Replayed', 'true');
    res.status(row.responseStatus ?? 200);
    if (row.responseBody === null) res.end();
    else res.type('application/json').send(row.responseBody);
  }

  return async (req, res, next) => {
    const raw = req.get(IDEMPOTENCY_HEADER);
    if (req.method !== 'POST' || raw === undefined || !req.ctx || req.is('multipart/form-data')) return next();
    const key = parseIdempotencyKey(raw);
    if (!key) {
      return next(new AppError(400, 'idempotency_key_invalid', 'The Idempotency-Key header must be 1 to 255 visible characters.', { 'Idempotency-Key': 'Use 1 to 255 visible characters, e.g. a random UUID.' }));
    }
    const userId = req.ctx.user.id;
    const path = req.originalUrl.split('?')[0]!;
    const fingerprint = fingerprintOf(req.method, req.originalUrl, req.body);
    const now = clock.now();

    db.delete(idempotencyKeys).where(lt(idempotencyKeys.createdAt, new Date(now.getTime() - KEEP_MS).toISOString())).run();
    const reserved = db
      .insert(idempotencyKeys)
      .values({ userId, key, method: req.method, path, fingerprint, status: 'pending', createdAt: now.toISOString() })
      .onConflictDoNothing()
      .run();

    if (reserved.changes === 0) {
      let row = find(userId, key);
      const started = Date.now();
      while (row && row.fingerprint === fingerprint && row.status === 'pending' && Date.now() - started < WAIT_MS) {
        await sleep(POLL_MS);
        row = find(userId, key);
      }
      if (!row) return next(new AppError(409, 'idempotency_key_in_use', 'The first request with this Idempotency-Key failed; send the request again.'));
      if (row.fingerprint !== fingerprint) {
        return next(new AppError(422, 'idempotency_key_reused', 'This Idempotency-Key was already used for a different request. Use a new key for a new action.'));
      }
      if (row.status === 'pending') return next(new AppError(409, 'idempotency_key_in_use', 'A request with this Idempotency-Key is still being processed. Try again shortly.'));
      return replay(res, row);
    }

    let settled = false;
    const settle = (status: number, body: string | null) => {
      if (settled) return;
      settled = true;
      const where = and(eq(idempotencyKeys.userId, userId), eq(idempotencyKeys.key, key));
      if (status >= 500 || body === null) db.delete(idempotencyKeys).where(where).run();
      else db.update(idempotencyKeys).set({ status: 'done', responseStatus: status, responseBody: body }).where(where).run();
    };
    const json = res.json.bind(res);
    res.json = (body: unknown) => {
      settle(res.statusCode, body === undefined ? null : JSON.stringify(body));
      return json(body);
    };
    // an answer that is not JSON (or none at all) cannot be replayed: free the key
    res.on('close', () => settle(500, null));
    next();
  };
}
