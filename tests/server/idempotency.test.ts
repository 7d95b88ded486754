/**
 * The Idempotency-Key header (IETF HTTP API working group draft "The Idempotency-Key HTTP
 * Header Field"): a retry gets the first answer, the key cannot be reused for another request,
 * and parallel retries create one record.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { completeDraftBody, countRows, grillFixture, makeClaimsApp, userId, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;
let colleague: Agent;

beforeAll(async () => {
  t = await makeClaimsApp();
  techA = await t.signIn('techA');
  colleague = await t.signIn('priya.halvorsen@harborview.test');
});
afterAll(async () => {
  await t.close();
});

const claimsOf = (email: string) => countRows(t, 'claims', 'technician_id = ?', userId(t, email));

describe('Idempotency-Key on creates', () => {
  it('answers a retry with the first answer and creates one claim', async () => {
    const key = randomUUID();
    const before = claimsOf('tech@harborview.test');
    const body = { serial: grillFixture(t).unit.serial };
    const first = await techA.post('/api/claims').set('Idempotency-Key', `"${key}"`).send(body);
    expect(first.status).toBe(201);
    const again = await techA.post('/api/claims').set('Idempotency-Key', `"${key}"`).send(body);
    expect(again.status).toBe(201);
    expect(again.headers['idempotent-replayed']).toBe('true');
    expect(again.body).toEqual(first.body);
    expect(claimsOf('tech@harborview.test')).toBe(before + 1);
  });

  it('refuses the same key with another body with 422 and changes nothing', async () => {
    const key = randomUUID();
    expect((await techA.post('/api/claims').set('Idempotency-Key', key).send({ serial: grillFixture(t).unit.serial })).status).toBe(201);
    const before = claimsOf('tech@harborview.test');
    const other = await techA.post('/api/claims').set('Idempotency-Key', key).send(completeDraftBody(t));
    expect(other.status).toBe(422);
    expect(other.body.error.code).toBe('idempotency_key_reused');
    expect(claimsOf('tech@harborview.test')).toBe(before);
  });

  it('20 parallel POSTs with one key make exactly one claim and all get the same answer', async () => {
    const key = randomUUID();
    const before = claimsOf('tech@harborview.test');
    const body = completeDraftBody(t);
    const results = await Promise.all(Array.from({ length: 20 }, () => techA.post('/api/claims').set('Idempotency-Key', key).send(body)));
    expect(results.map((r) => r.status)).toEqual(Array(20).fill(201));
    expect(new Set(results.map((r) => r.body.id)).size).toBe(1);
    expect(new Set(results.map((r) => JSON.stringify(r.body))).size).toBe(1);
    expect(claimsOf('tech@harborview.test')).toBe(before + 1);
    expect(countRows(t, 'idempotency_keys', 'key = ?', key)).toBe(1);
  });

  it('keeps keys per user, answers a malformed key with 400, and leaves requests without a key alone', async () => {
    const key = randomUUID();
    const body = { serial: grillFixture(t).unit.serial };
    const mine = await techA.post('/api/claims').set('Idempotency-Key', key).send(body);
    const theirs = await colleague.post('/api/claims').set('Idempotency-Key', key).send(body);
    expect(theirs.status).toBe(201);
    expect(theirs.body.id).not.toBe(mine.body.id);

    const bad = await techA.post('/api/claims').set('Idempotency-Key', 'has space').send(body);
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('idempotency_key_invalid');

    const before = claimsOf('tech@harborview.test');
    await techA.post('/api/claims').send(body);
    await techA.post('/api/claims').send(body);
    expect(claimsOf('tech@harborview.test')).toBe(before + 2);
  });

  it('keeps a refused answer too, and lets a key be used again after 24 hours', async () => {
    const key = randomUUID();
    const refused = await techA.post('/api/claims').set('Idempotency-Key', key).send({ serial: 'NO-SUCH-SERIAL' });
    expect(refused.status).toBe(400);
    const again = await techA.post('/api/claims').set('Idempotency-Key', key).send({ serial: 'NO-SUCH-SERIAL' });
    expect(again.status).toBe(400);
    expect(again.headers['idempotent-replayed']).toBe('true');
    const dayAgo = new Date(t.clock.now().getTime() - 25 * 60 * 60 * 1000).toISOString();
    t.db.$client.prepare('update idempotency_keys set created_at = ? where key = ?').run(dayAgo, key);
    const later = await techA.post('/api/claims').set('Idempotency-Key', key).send({ serial: grillFixture(t).unit.serial });
    expect(later.status).toBe(201);
  });
});

describe('Idempotency-Key on a slow, asynchronous create', () => {
  it('parallel retries wait for the first answer instead of running again', async () => {
    const express = (await import('express')).default;
    const request = (await import('supertest')).default;
    const { idempotency } = await import('../../server/middleware/idempotency');
    const { errorHandler } = await import('../../server/middleware/error-handler');
    let runs = 0;
    const app = express();
    app.use(express.json());
    app.use((req, _res, next) => {
      (req as unknown as { ctx: unknown }).ctx = { user: { id: userId(t, 'tech@harborview.test') } };
      next();
    });
    app.use(idempotency({ db: t.db, clock: t.clock }));
    app.post('/slow', async (_req, res) => {
      runs += 1;
      const n = runs;
      await new Promise((r) => setTimeout(r, 150));
      res.status(201).json({ n });
    });
    app.use(errorHandler);
    const key = randomUUID();
    const results = await Promise.all(Array.from({ length: 20 }, () => request(app).post('/slow').set('Idempotency-Key', key).send({ a: 1 })));
    expect(runs).toBe(1);
    expect(results.map((r) => r.status)).toEqual(Array(20).fill(201));
    expect(results.every((r) => r.body.n === 1)).toBe(true);
  });
});
