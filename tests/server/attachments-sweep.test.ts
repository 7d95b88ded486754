import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, type TestApp } from '../factories/test-app';
import { editableClaimOf, snapshot } from '../fixtures/evidence-app';
import { scenePhoto, simplePdf } from '../fixtures/photos';
import { startFakeS3, type FakeS3 } from '../fixtures/s3-server';
import { storageFor } from '../../server/lib/storage/create-storage';
import { sweepOrphans } from '../../server/modules/attachments/attachments.sweep';
import type { Storage } from '../../server/lib/storage/storage';

// The start-up sweep after a crash between a file write and its row's commit: files without
// rows and rows without files are removed and reported; nothing else is touched. Run against
// the local disk and against S3-compatible storage (s3rver), with the app on each.

const ORIGIN = 'http://localhost:3000';

async function keys(s: Storage): Promise<string[]> {
  const out: string[] = [];
  for await (const o of s.list('orgs/')) out.push(o.key);
  return out.sort();
}

for (const driver of ['local', 's3'] as const) {
  describe(`start-up sweep on ${driver} storage`, () => {
    let t: TestApp;
    let fake: FakeS3 | null = null;
    let storage: Storage;

    beforeAll(async () => {
      if (driver === 's3') fake = await startFakeS3();
      t = await makeTestApp({ env: fake ? fake.env : {} });
      storage = storageFor(t.env);
      expect(storage.driver).toBe(driver);
    });
    afterAll(async () => {
      await t.close();
      await fake?.close();
    });

    it('serves uploads through the API from this storage', async () => {
      const tech = await t.signIn('techA');
      const claim = editableClaimOf(t, 'tech@harborview.test');
      const jpeg = await scenePhoto(601);
      const res = await tech.post(`/api/claims/${claim.id}/attachments`).set('Origin', ORIGIN).field('roles', 'serial_plate').field('roles', 'invoice').attach('files', jpeg, 'plate.jpg').attach('files', simplePdf(), 'invoice.pdf');
      expect(res.status).toBe(201);
      const [photo] = res.body.attachments;
      const got = await tech.get(photo.url).buffer(true).parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
      expect(got.status).toBe(200);
      expect((got.body as Buffer).equals(jpeg)).toBe(true);
      expect((await tech.get(photo.thumbnailUrl)).status).toBe(200);
      // The photo, its thumbnail and the PDF.
      expect((await keys(storage)).length).toBe(3);
    });

    it('removes a file without a row and a row without a file, and reports both', async () => {
      const claim = editableClaimOf(t, 'tech@harborview.test');
      const stray = `orgs/${claim.agencyId}/claims/${claim.id}/00000000-dead-beef-0000-000000000000.jpg`;
      await storage.put(stray, Buffer.from('written, then the process died before the commit'), 'image/jpeg');
      const victim = t.db.$client.prepare("select id, storage_key, thumbnail_key from attachments where content_type = 'image/jpeg' limit 1").get() as { id: string; storage_key: string; thumbnail_key: string };
      await storage.delete(victim.storage_key);
      const before = snapshot(t);

      const report = await sweepOrphans(t.db, storage);
      expect(report.removedFiles).toEqual([stray]);
      expect(report.removedRows.map((r) => r.id)).toEqual([victim.id]);
      expect(await storage.stat(stray)).toBeNull();
      // The lost photo's thumbnail goes with its row.
      expect(await storage.stat(victim.thumbnail_key)).toBeNull();
      expect(snapshot(t).rows).toBe(before.rows - 1);
      const rows = t.db.$client.prepare('select storage_key, thumbnail_key from attachments').all() as Array<{ storage_key: string; thumbnail_key: string | null }>;
      const named = rows.flatMap((r) => [r.storage_key, r.thumbnail_key].filter(Boolean)).sort();
      expect(await keys(storage)).toEqual(named);
      const audit = t.db.$client.prepare("select detail from audit_log where action = 'attachment.sweep'").all() as Array<{ detail: string }>;
      expect(JSON.parse(audit.at(-1)!.detail)).toMatchObject({ removedFiles: 1, removedRows: [victim.id] });

      const again = await sweepOrphans(t.db, storage);
      expect(again).toEqual({ removedFiles: [], removedRows: [], clearedThumbnails: [], removedTemp: [] });
    });

    it('with a grace period, leaves a fresh file alone (an upload in flight on another server)', async () => {
      const claim = editableClaimOf(t, 'tech@harborview.test');
      const fresh = `orgs/${claim.agencyId}/claims/${claim.id}/11111111-0000-0000-0000-000000000000.jpg`;
      await storage.put(fresh, Buffer.from('in flight'), 'image/jpeg');
      const report = await sweepOrphans(t.db, storage, { graceMs: 15 * 60_000 });
      expect(report.removedFiles).toEqual([]);
      expect(await storage.stat(fresh)).not.toBeNull();
      expect((await sweepOrphans(t.db, storage)).removedFiles).toEqual([fresh]);
    });
  });
}
