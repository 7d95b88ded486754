import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync, mkdirSync, utimesSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { LocalStorage } from '../../server/lib/storage/local-storage';
import { S3Storage } from '../../server/lib/storage/s3-storage';
import { createStorage } from '../../server/lib/storage/create-storage';
import { envSchema } from '../../server/env';
import type { Storage } from '../../server/lib/storage/storage';
import { startFakeS3, type FakeS3 } from '../fixtures/s3-server';

// One contract, two implementations: the local disk and S3-compatible object storage through
// the AWS SDK v3, the latter against a real local S3 server (s3rver), never a mock of the SDK.

async function collect(it: AsyncIterable<{ key: string }>) {
  const out: string[] = [];
  for await (const o of it) out.push(o.key);
  return out.sort();
}

function contract(name: string, make: () => Promise<{ storage: Storage; done: () => Promise<void> }>) {
  describe(`${name} storage`, () => {
    let storage: Storage;
    let done: () => Promise<void>;
    beforeAll(async () => {
      ({ storage, done } = await make());
    });
    afterAll(async () => {
      await done();
    });

    it('writes, reads, stats, streams and deletes an object', async () => {
      const data = Buffer.from('evidence bytes \u00e9\u0000\u00ff', 'latin1');
      await storage.put('orgs/org-1/claims/c-1/a-1.jpg', data, 'image/jpeg');
      expect(Buffer.compare((await storage.read('orgs/org-1/claims/c-1/a-1.jpg'))!, data)).toBe(0);
      const info = await storage.stat('orgs/org-1/claims/c-1/a-1.jpg');
      expect(info?.size).toBe(data.length);
      const opened = await storage.open('orgs/org-1/claims/c-1/a-1.jpg');
      const chunks: Buffer[] = [];
      for await (const c of opened!.stream) chunks.push(Buffer.from(c));
      expect(Buffer.concat(chunks).equals(data)).toBe(true);
      expect(opened!.size).toBe(data.length);
      await storage.delete('orgs/org-1/claims/c-1/a-1.jpg');
      expect(await storage.read('orgs/org-1/claims/c-1/a-1.jpg')).toBeNull();
      expect(await storage.stat('orgs/org-1/claims/c-1/a-1.jpg')).toBeNull();
      expect(await storage.open('orgs/org-1/claims/c-1/a-1.jpg')).toBeNull();
      await storage.delete('orgs/org-1/claims/c-1/a-1.jpg'); // deleting a missing object is fine
    });

    it('replaces an object whole on a second write', async () => {
      await storage.put('orgs/org-1/claims/c-1/same.pdf', Buffer.alloc(3000, 1), 'application/pdf');
      await storage.put('orgs/org-1/claims/c-1/same.pdf', Buffer.from('short'), 'application/pdf');
      expect((await storage.read('orgs/org-1/claims/c-1/same.pdf'))!.toString()).toBe('short');
    });

    it('lists by prefix, so each organisation has its own', async () => {
      await storage.put('orgs/org-a/claims/c/1.jpg', Buffer.from('a'), 'image/jpeg');
      await storage.put('orgs/org-a/claims/c/2.jpg', Buffer.from('b'), 'image/jpeg');
      await storage.put('orgs/org-b/claims/c/3.jpg', Buffer.from('c'), 'image/jpeg');
      expect(await collect(storage.list('orgs/org-a/'))).toEqual(['orgs/org-a/claims/c/1.jpg', 'orgs/org-a/claims/c/2.jpg']);
      expect(await collect(storage.list('orgs/org-b/'))).toEqual(['orgs/org-b/claims/c/3.jpg']);
    });

    it('refuses keys that are paths out of its root', async () => {
      for (const key of ['../escape.jpg', '/etc/passwd', 'orgs/../../x', 'orgs//x', 'orgs/./x', '', 'a\\b', 'orgs/x\0.jpg', 'orgs/x\n.jpg']) {
        await expect(storage.put(key, Buffer.from('x'), 'image/jpeg'), JSON.stringify(key)).rejects.toThrow(/Invalid storage key/);
        await expect(storage.read(key)).rejects.toThrow(/Invalid storage key/);
      }
    });
  });
}

let fake: FakeS3;
beforeAll(async () => {
  fake = await startFakeS3();
});
afterAll(async () => {
  await fake.close();
});

contract('local disk', async () => {
  const dir = mkdtempSync(join(tmpdir(), 'fieldproof-store-'));
  return { storage: new LocalStorage(dir), done: async () => rmSync(dir, { recursive: true, force: true }) };
});

contract('S3-compatible (s3rver)', async () => ({
  storage: new S3Storage({ bucket: fake.bucket, endpoint: fake.endpoint, region: 'us-east-1', accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' }),
  done: async () => undefined,
}));

describe('local disk specifics', () => {
  it('writes through a temporary name and leaves none behind; cleanTemp removes old leftovers of a crash only', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'fieldproof-store-'));
    try {
      const s = new LocalStorage(dir);
      await s.put('orgs/o/claims/c/a.jpg', Buffer.from('x'), 'image/jpeg');
      expect(await collect(s.list(''))).toEqual(['orgs/o/claims/c/a.jpg']);
      mkdirSync(join(dir, '.tmp'), { recursive: true });
      writeFileSync(join(dir, '.tmp', 'old.part'), 'half a file');
      writeFileSync(join(dir, '.tmp', 'fresh.part'), 'in flight');
      const hourAgo = new Date(Date.now() - 3_600_000);
      utimesSync(join(dir, '.tmp', 'old.part'), hourAgo, hourAgo);
      const removed = await s.cleanTemp(new Date(Date.now() - 60_000));
      expect(removed).toEqual(['.tmp/old.part']);
      expect(existsSync(join(dir, '.tmp', 'fresh.part'))).toBe(true);
      // Temporary files are never listed as objects.
      expect(await collect(s.list(''))).toEqual(['orgs/o/claims/c/a.jpg']);
      await expect(s.put('.tmp/x.part', Buffer.from('x'), 'image/jpeg')).rejects.toThrow(/Invalid storage key|Reserved/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('configuration', () => {
  it('STORAGE_DRIVER chooses the implementation; s3 needs a bucket', () => {
    const local = createStorage(envSchema.parse({ STORAGE_DIR: '/tmp/x' }));
    expect(local.driver).toBe('local');
    const s3 = createStorage(envSchema.parse(fake.env));
    expect(s3.driver).toBe('s3');
    expect(() => createStorage(envSchema.parse({ STORAGE_DRIVER: 's3' }))).toThrow(/S3_BUCKET/);
  });
});
