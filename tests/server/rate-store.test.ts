import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, type Db } from '../../server/db/client';
import { RateStore, type RateRule } from '../../server/lib/rate-store';
import { TestClock, makeTestApp, type TestApp } from '../factories/test-app';

// The SQLite rate store on its own: fixed windows on the app clock, all-or-none across checks,
// shared by connections (processes) on one file, rows pruned after their window.

const rows = (db: Db) => (db.$client.prepare('select count(*) as n from rate_counters').get() as { n: number }).n;

describe('RateStore', () => {
  let t: TestApp;
  const clock = new TestClock();
  beforeAll(async () => {
    t = await makeTestApp({ seed: false, clock });
  });
  afterAll(async () => {
    await t.close();
  });

  it('allows `limit` per window, then refuses with the seconds left, and allows again when the window ends', () => {
    const store = new RateStore(t.db, clock);
    const rule: RateRule = { name: 'test.window', tiers: [{ limit: 3, windowMs: 60_000 }] };
    const take = () => store.consume({ rule, key: 'someone' });
    expect([take(), take(), take()].map((d) => d.allowed)).toEqual([true, true, true]);
    clock.advance(20_000);
    expect(take()).toEqual({ allowed: false, retryAfterSec: 40 });
    expect(store.peek({ rule, key: 'someone' }).allowed).toBe(false);
    expect(store.peek({ rule, key: 'somebody else' }).allowed).toBe(true);
    clock.advance(40_000);
    expect(take().allowed).toBe(true);
  });

  it('counts all checks or none: a full tier of one check leaves the others untouched', () => {
    const store = new RateStore(t.db, clock);
    const a: RateRule = { name: 'test.a', tiers: [{ limit: 1, windowMs: 60_000 }] };
    const b: RateRule = { name: 'test.b', tiers: [{ limit: 5, windowMs: 60_000 }, { limit: 10, windowMs: 3_600_000 }] };
    expect(store.consume([{ rule: a, key: 'k' }, { rule: b, key: 'k' }]).allowed).toBe(true);
    for (let i = 0; i < 5; i++) expect(store.consume([{ rule: a, key: 'k' }, { rule: b, key: 'k' }]).allowed).toBe(false);
    // b was counted once only, so four more fit in its first tier.
    for (let i = 0; i < 4; i++) expect(store.consume({ rule: b, key: 'k' }).allowed).toBe(true);
    expect(store.consume({ rule: b, key: 'k' }).allowed).toBe(false);
    store.refund({ rule: b, key: 'k' });
    expect(store.consume({ rule: b, key: 'k' }).allowed).toBe(true);
    store.reset(b, 'k');
    expect(store.peek({ rule: b, key: 'k' }).allowed).toBe(true);
  });

  it('is shared by two connections on one file (two processes), and never stores the subject itself', () => {
    const other = openDatabase(t.env.DATABASE_PATH);
    try {
      const one = new RateStore(t.db, clock);
      const two = new RateStore(other, clock);
      const rule: RateRule = { name: 'test.shared', tiers: [{ limit: 4, windowMs: 60_000 }] };
      const answers = Array.from({ length: 8 }, (_, i) => (i % 2 ? one : two).consume({ rule, key: 'owner@harborview.test' }).allowed);
      expect(answers.filter(Boolean)).toHaveLength(4);
      const dump = JSON.stringify(other.$client.prepare('select * from rate_counters').all());
      expect(dump).not.toContain('harborview');
    } finally {
      other.$client.close();
    }
  });

  it('prunes rows whose window has ended', () => {
    const store = new RateStore(t.db, clock);
    const rule: RateRule = { name: 'test.prune', tiers: [{ limit: 1, windowMs: 1_000 }] };
    for (let i = 0; i < 150; i++) store.consume({ rule, key: `subject-${i}` });
    const before = rows(t.db);
    clock.advance(2_000);
    for (let i = 0; i < 250; i++) store.consume({ rule: { name: 'test.other', tiers: [{ limit: 1000, windowMs: 60_000 }] }, key: 'one' });
    expect(rows(t.db)).toBeLessThan(before - 100);
  });
});
