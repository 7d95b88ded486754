import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { makeTestApp, type TestApp } from '../factories/test-app';
import { editableClaimOf, claimInState, snapshot } from '../fixtures/evidence-app';
import { scenePhoto, pngScene, webpScene, undecodableHeic, simplePdf } from '../fixtures/photos';

// Accepted uploads: the type comes from the bytes (file-type), the name is kept only as data,
// the object key is generated under the organisation, the thumbnail is upright and carries no
// metadata, and each upload writes an audit row (OWASP ASVS 5.0 5.2.x, 5.3.x; 16.2.x).

const ORIGIN = 'http://localhost:3000';
type Agent = Awaited<ReturnType<TestApp['signIn']>>;

describe('evidence uploads that are accepted', () => {
  let t: TestApp;
  let tech: Agent;
  let claimId: string;
  let agencyId: string;

  beforeAll(async () => {
    t = await makeTestApp();
    tech = await t.signIn('techA');
    const c = editableClaimOf(t, 'tech@harborview.test');
    claimId = c.id;
    agencyId = c.agencyId;
  });
  afterAll(async () => {
    await t.close();
  });

  it('stores a JPEG under a server-generated key that includes the organisation, and serves it back unchanged', async () => {
    const jpeg = await scenePhoto(101, { exif: { takenAt: '2026:03:05 14:22:10', offset: '-08:00', latitude: 32.6401, longitude: -117.0842 } });
    const before = snapshot(t);
    const res = await tech
      .post(`/api/claims/${claimId}/attachments`)
      .set('Origin', ORIGIN)
      .field('role', 'serial_plate')
      .attach('files', jpeg, { filename: 'Plate phöto.JPG', contentType: 'image/jpeg' });
    expect(res.status).toBe(201);
    const a = res.body.attachments[0];
    expect(a).toMatchObject({ role: 'serial_plate', originalName: 'Plate phöto.JPG', contentType: 'image/jpeg', kind: 'photo', sizeBytes: jpeg.length, width: 1200, height: 900, hasThumbnail: true });
    expect(a.takenAtRaw).toBe('2026:03:05 14:22:10');
    expect(a.takenAtOffset).toBe('-08:00');
    // 14:22:10 at UTC-08:00 is 22:22:10 UTC, whatever the server's own time zone.
    expect(a.takenAtUtc).toBe('2026-03-05T22:22:10.000Z');
    expect(a.gps.latitude).toBeCloseTo(32.6401, 4);
    expect(a.gps.longitude).toBeCloseTo(-117.0842, 4);

    const row = t.db.$client.prepare('select storage_key, thumbnail_key, sha256, perceptual_hash, organisation_id from attachments where id = ?').get(a.id) as Record<string, string>;
    expect(row.storage_key).toBe(`orgs/${agencyId}/claims/${claimId}/${a.id}.jpg`);
    expect(row.storage_key).not.toContain('Plate');
    expect(row.thumbnail_key).toBe(`orgs/${agencyId}/claims/${claimId}/${a.id}.thumb.jpg`);
    expect(row.organisation_id).toBe(agencyId);
    expect(row.perceptual_hash).toMatch(/^[0-9a-f]{16}$/);
    const after = snapshot(t);
    expect(after.rows).toBe(before.rows + 1);
    expect(after.files).toBe(before.files + 2);

    const got = await tech.get(a.url).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(got.status).toBe(200);
    expect(Buffer.compare(got.body as Buffer, jpeg)).toBe(0);
    expect(got.headers['content-type']).toBe('image/jpeg');
    expect(got.headers['x-content-type-options']).toBe('nosniff');
    expect(got.headers['content-security-policy']).toContain('sandbox');
    expect(got.headers['content-security-policy']).toContain("default-src 'none'");
    // RFC 6266: an ASCII fallback and the exact name in UTF-8 (RFC 8187 encoding).
    expect(got.headers['content-disposition']).toBe(`attachment; filename="Plate ph_to.JPG"; filename*=UTF-8''Plate%20ph%C3%B6to.JPG`);

    const audit = t.db.$client.prepare("select action, outcome, actor_id from audit_log where record_id = ? order by at").all(a.id) as Array<{ action: string; outcome: string }>;
    expect(audit.map((x) => `${x.action}:${x.outcome}`)).toEqual(['attachment.upload:success', 'attachment.download:success']);
  });

  it('makes the thumbnail upright (EXIF orientation applied) and strips all metadata from it', async () => {
    // Orientation 6: the stored pixels must be turned 90° clockwise to be seen upright.
    const jpeg = await scenePhoto(102, { width: 800, height: 600, exif: { takenAt: '2026:03:05 10:00:00', offset: '+01:00', latitude: 51.5, longitude: -0.12, orientation: 6 } });
    expect((await sharp(jpeg).metadata()).orientation).toBe(6);
    const res = await tech.post(`/api/claims/${claimId}/attachments`).set('Origin', ORIGIN).field('role', 'unit_overall').attach('files', jpeg, 'turned.jpg');
    expect(res.status).toBe(201);
    const a = res.body.attachments[0];
    expect([a.width, a.height]).toEqual([600, 800]);
    const thumb = await tech.get(a.thumbnailUrl).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(thumb.status).toBe(200);
    expect(thumb.headers['content-type']).toBe('image/jpeg');
    expect(thumb.headers['x-content-type-options']).toBe('nosniff');
    const m = await sharp(thumb.body as Buffer).metadata();
    expect(m.width).toBe(360);
    expect(m.height).toBe(480);
    expect(m.orientation).toBeUndefined();
    expect(m.exif).toBeUndefined();
    expect(m.xmp).toBeUndefined();
    expect(m.icc).toBeUndefined();
  });

  it('accepts PNG, WebP, PDF and a strict UTF-8 CSV with one role per file', async () => {
    const csv = Buffer.from('key,phase,value,unit\r\noil_temp,after,350,F\r\n', 'utf8');
    const res = await tech
      .post(`/api/claims/${claimId}/attachments`)
      .set('Origin', ORIGIN)
      .field('roles', 'failed_part')
      .field('roles', 'replacement_part')
      .field('roles', 'invoice')
      .field('roles', 'readings_sheet')
      .attach('files', await pngScene(5), 'part.png')
      .attach('files', await webpScene(6), 'new-part.webp')
      .attach('files', simplePdf(), 'invoice.pdf')
      .attach('files', csv, 'readings.csv');
    expect(res.status).toBe(201);
    expect(res.body.attachments.map((a: { role: string; contentType: string }) => [a.role, a.contentType])).toEqual([
      ['failed_part', 'image/png'],
      ['replacement_part', 'image/webp'],
      ['invoice', 'application/pdf'],
      ['readings_sheet', 'text/csv; charset=utf-8'],
    ]);
    expect(res.body.attachments.map((a: { hasThumbnail: boolean }) => a.hasThumbnail)).toEqual([true, true, false, false]);
  });

  it('keeps a HEIC it cannot decode and serves a generated placeholder thumbnail, not an error', async () => {
    const res = await tech.post(`/api/claims/${claimId}/attachments`).set('Origin', ORIGIN).field('role', 'failed_part').attach('files', undecodableHeic(), 'IMG_0001.HEIC');
    expect(res.status).toBe(201);
    const a = res.body.attachments[0];
    expect(a.contentType).toBe('image/heic');
    expect(a.hasThumbnail).toBe(false);
    const thumb = await tech.get(a.thumbnailUrl).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(thumb.status).toBe(200);
    expect(thumb.headers['content-type']).toBe('image/png');
    const m = await sharp(thumb.body as Buffer).metadata();
    expect(m.format).toBe('png');
    expect(m.width).toBe(480);
  });

  it('ignores the Content-Type the client sends: a real JPEG labelled text/html is stored and served as image/jpeg', async () => {
    const jpeg = await scenePhoto(103);
    const res = await tech.post(`/api/claims/${claimId}/attachments`).set('Origin', ORIGIN).attach('files', jpeg, { filename: 'fine.jpg', contentType: 'text/html' });
    expect(res.status).toBe(201);
    expect(res.body.attachments[0].contentType).toBe('image/jpeg');
    expect(res.body.attachments[0].role).toBe('other');
  });

  it('lists the claim evidence with limits and usage for the gallery', async () => {
    const res = await tech.get(`/api/claims/${claimId}/attachments`);
    expect(res.status).toBe(200);
    expect(res.body.attachments.length).toBe(snapshot(t).rows);
    expect(res.body.limits).toMatchObject({ maxFileBytes: 15 * 1024 * 1024, maxFilesPerRequest: 10 });
    expect(res.body.usage.files).toBe(res.body.attachments.length);
  });

  it('refuses uploads to a claim that is no longer editable (409), by a reviewer (403 or 404), and to another agency (404)', async () => {
    const submitted = claimInState(t, 'tech@harborview.test', 'submitted');
    const jpeg = await scenePhoto(104);
    const before = snapshot(t);
    const late = await tech.post(`/api/claims/${submitted.id}/attachments`).set('Origin', ORIGIN).attach('files', jpeg, 'late.jpg');
    expect(late.status).toBe(409);
    expect(late.body.error.message).toMatch(/draft or returned/);

    const reviewer = await t.signIn('reviewer');
    const r2 = await reviewer.post(`/api/claims/${submitted.id}/attachments`).set('Origin', ORIGIN).attach('files', jpeg, 'x.jpg');
    expect(r2.status).toBe(403);
    const r3 = await reviewer.post(`/api/claims/${claimId}/attachments`).set('Origin', ORIGIN).attach('files', jpeg, 'x.jpg');
    expect(r3.status).toBe(404); // a draft is not visible to the manufacturer

    const techB = await t.signIn('techB');
    const r4 = await techB.post(`/api/claims/${claimId}/attachments`).set('Origin', ORIGIN).attach('files', jpeg, 'x.jpg');
    expect(r4.status).toBe(404);
    expect(snapshot(t)).toEqual(before);
  });
});
