import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import turfDistance from '@turf/distance';
import { makeTestApp, type TestApp } from '../factories/test-app';
import { editableClaimOf, setClaimDates, siteOf } from '../fixtures/evidence-app';
import { scenePhoto, reencoded, resized } from '../fixtures/photos';
import { intakeFile } from '../../server/lib/photo/intake';
import { hammingDistance } from '../../server/lib/photo/hashes';
import { evidenceFlags, PHASH_MAX_DISTANCE, DAYS_AFTER_REPAIR, FAR_FROM_SITE_KM } from '../../server/modules/attachments/attachments.flags';

// The checks that help the reviewer. Photos are generated here with sharp and EXIF written into
// them. Distances are checked against @turf/distance 7 (reference library; mean Earth radius
// 6371.0088 km, IUGG). The thresholds are the project's own choices, stated in
// server/modules/attachments/attachments.flags.ts; the perceptual-hash one is measured below.

const ORIGIN = 'http://localhost:3000';
type Agent = Awaited<ReturnType<TestApp['signIn']>>;

/** A point `km` kilometres north of a position (1° of latitude ≈ 111.2 km on the mean sphere). */
const northOf = (p: { latitude: number; longitude: number }, km: number) => ({ latitude: p.latitude + km / 111.195, longitude: p.longitude });

describe('perceptual-hash threshold, measured on generated photos', () => {
  it('separates re-encoded and resized copies from unrelated photos', async () => {
    const near: number[] = [];
    const hashes: string[] = [];
    for (let s = 0; s < 10; s++) {
      const orig = await scenePhoto(7000 + s);
      const h = (await intakeFile(orig, 'o.jpg')).perceptualHash!;
      hashes.push(h);
      for (const [buf, name] of [
        [await reencoded(orig, 25), 'q25.jpg'],
        [await resized(orig, 0.5), 'half.jpg'],
        [await resized(orig, 0.4, 'webp'), 'small.webp'],
        [await reencoded(await resized(orig, 0.6), 40), 'both.jpg'],
      ] as const) {
        near.push(hammingDistance(h, (await intakeFile(buf, name)).perceptualHash!));
      }
    }
    const far: number[] = [];
    for (let i = 0; i < hashes.length; i++) for (let j = i + 1; j < hashes.length; j++) far.push(hammingDistance(hashes[i], hashes[j]));
    const maxNear = Math.max(...near);
    const minFar = Math.min(...far);
    console.log(`perceptual hash: near-duplicates differ in at most ${maxNear} bits, unrelated photos in at least ${minFar} (threshold ${PHASH_MAX_DISTANCE})`);
    expect(maxNear).toBeLessThanOrEqual(PHASH_MAX_DISTANCE / 2);
    expect(minFar).toBeGreaterThan(PHASH_MAX_DISTANCE * 1.5);
  });
});

describe('evidence flags', () => {
  let t: TestApp;
  let techA: Agent;
  let techB: Agent;
  const savedTz = process.env.TZ;
  let claimX: ReturnType<typeof editableClaimOf>;
  let claimY: ReturnType<typeof editableClaimOf>;
  let claimB: ReturnType<typeof editableClaimOf>;
  let original: Buffer;

  beforeAll(async () => {
    // A zone far from every offset used below: the capture times must not depend on it.
    process.env.TZ = 'Asia/Kathmandu';
    t = await makeTestApp();
    techA = await t.signIn('techA');
    techB = await t.signIn('techB');
    claimX = editableClaimOf(t, 'tech@harborview.test');
    claimY = editableClaimOf(t, 'tech@harborview.test', { skip: 1 });
    claimB = editableClaimOf(t, 'tech@prairieline.test');
    for (const c of [claimX, claimY, claimB]) setClaimDates(t, c.id, '2026-03-10', '2026-03-12');
    original = await scenePhoto(8001);
  });
  afterAll(async () => {
    process.env.TZ = savedTz;
    await t.close();
  });

  const upload = (agent: Agent, claimId: string, buf: Buffer, name: string, role = 'failed_part') =>
    agent.post(`/api/claims/${claimId}/attachments`).set('Origin', ORIGIN).field('role', role).attach('files', buf, name);
  const codesFor = (claimId: string, attachmentId: string) => evidenceFlags(t.db, claimId).filter((f) => f.attachmentId === attachmentId).map((f) => f.code);

  it('the same file on another claim of the agency: photo_reused by SHA-256, naming that claim', async () => {
    const first = await upload(techA, claimX.id, original, 'part.jpg');
    expect(first.status).toBe(201);
    expect(first.body.flags).toEqual([]);
    const again = await upload(techA, claimY.id, original, 'part-again.jpg');
    expect(again.status).toBe(201);
    expect(again.body.flags.map((f: { code: string }) => f.code)).toEqual(['photo_reused']);
    expect(again.body.flags[0].message).toContain(`claim ${claimX.number}`);
    expect(again.body.flags[0].message).toContain('identical SHA-256');
    const row = t.db.$client.prepare('select flags from claims where id = ?').get(claimY.id) as { flags: string };
    expect(JSON.parse(row.flags)).toContain('photo_reused');
    // The claim the photo came from now carries the flag as well.
    const rowX = t.db.$client.prepare('select flags from claims where id = ?').get(claimX.id) as { flags: string };
    expect(JSON.parse(rowX.flags)).toContain('photo_reused');
  });

  it('a re-encoded and resized copy on another agency\'s claim: nothing for the agency; photo_reused_other_agency by perceptual hash for the manufacturer', async () => {
    const copy = await reencoded(await resized(original, 0.5), 50);
    const res = await upload(techB, claimB.id, copy, 'mine.jpg');
    expect(res.status).toBe(201);
    expect(res.body.flags.filter((x: { code: string }) => x.code.startsWith('photo_reused'))).toEqual([]);
    // The manufacturer's reviewer sees which claim.
    const forReviewer = evidenceFlags(t.db, claimB.id, { revealOtherAgencies: true }).find((x) => x.code === 'photo_reused_other_agency')!;
    expect([claimX.number, claimY.number]).toContain(forReviewer.otherClaimNumber);
    expect(forReviewer.message).toMatch(/nearly identical \(perceptual hashes differ in \d+ of 64 bits; at most 10 counts as the same picture\) to a photo on claim FP-\d{4}-\d{6} of another agency/);
  });

  it('an unrelated photo is not flagged', async () => {
    const res = await upload(techB, claimB.id, await scenePhoto(8002), 'other.jpg');
    expect(res.status).toBe(201);
    expect(codesFor(claimB.id, res.body.attachments[0].id)).toEqual([]);
  });

  it('capture time before the failure date, read in its own offset: photo_outside_service_window', async () => {
    // 23:30 on 9 March at UTC-08:00 is 07:30 UTC on the 10th: on site it was still the 9th.
    const res = await upload(techA, claimX.id, await scenePhoto(8003, { exif: { takenAt: '2026:03:09 23:30:00', offset: '-08:00' } }), 'early.jpg');
    expect(res.status).toBe(201);
    const a = res.body.attachments[0];
    expect(a.takenAtUtc).toBe('2026-03-10T07:30:00.000Z');
    const flags = evidenceFlags(t.db, claimX.id).filter((f) => f.attachmentId === a.id);
    expect(flags.map((f) => f.code)).toEqual(['photo_outside_service_window']);
    expect(flags[0].message).toContain('2026:03:09 23:30:00 (UTC-08:00), before the failure date 2026-03-10');
  });

  it(`up to ${DAYS_AFTER_REPAIR} days after the repair is inside the window; the day after is outside`, async () => {
    // 22:00 on the 19th at UTC-08:00 is already the 20th in UTC, but on site it is day 7.
    const inside = await upload(techA, claimX.id, await scenePhoto(8004, { exif: { takenAt: '2026:03:19 22:00:00', offset: '-08:00' } }), 'day7.jpg');
    expect(codesFor(claimX.id, inside.body.attachments[0].id)).toEqual([]);
    const outside = await upload(techA, claimX.id, await scenePhoto(8005, { exif: { takenAt: '2026:03:20 08:00:00', offset: '-08:00' } }), 'day8.jpg');
    const flags = evidenceFlags(t.db, claimX.id).filter((f) => f.attachmentId === outside.body.attachments[0].id);
    expect(flags.map((f) => f.code)).toEqual(['photo_outside_service_window']);
    expect(flags[0].message).toContain(`more than ${DAYS_AFTER_REPAIR} days after the repair date 2026-03-12`);
  });

  it('a capture time without an offset is judged by its wall-clock date and says so', async () => {
    const res = await upload(techA, claimX.id, await scenePhoto(8006, { exif: { takenAt: '2026:02:01 12:00:00' } }), 'nooffset.jpg');
    const a = res.body.attachments[0];
    expect(a.takenAtOffset).toBeNull();
    expect(a.takenAtUtc).toBeNull();
    const f = evidenceFlags(t.db, claimX.id).find((x) => x.attachmentId === a.id)!;
    expect(f.message).toContain('no UTC offset recorded');
  });

  it(`GPS within ${FAR_FROM_SITE_KM} km of the site is fine; farther is photo_far_from_site with the distance`, async () => {
    const site = siteOf(t, claimX.siteId!);
    const nearBy = northOf(site, 0.5);
    const farAway = northOf(site, 30);
    const near = await upload(techA, claimX.id, await scenePhoto(8007, { exif: { takenAt: '2026:03:11 10:00:00', offset: '-08:00', ...nearBy } }), 'near.jpg');
    expect(codesFor(claimX.id, near.body.attachments[0].id)).toEqual([]);
    const far = await upload(techA, claimX.id, await scenePhoto(8008, { exif: { takenAt: '2026:03:11 10:00:00', offset: '-08:00', ...farAway } }), 'far.jpg');
    const a = far.body.attachments[0];
    const f = evidenceFlags(t.db, claimX.id).find((x) => x.attachmentId === a.id)!;
    expect(f.code).toBe('photo_far_from_site');
    const km = turfDistance([a.gps.longitude, a.gps.latitude], [site.longitude, site.latitude], { units: 'kilometers' });
    expect(km).toBeGreaterThan(29.5);
    expect(f.message).toContain(`taken ${Math.round(km)} km from the site`);
  });

  it('after-repair readings out of tolerance are a flag; before-repair ones are not', async () => {
    const spec = t.db.$client
      .prepare('select rs.key, rs.nominal, rs.tolerance, rs.unit, rs.id from reading_specs rs join units u on u.model_id = rs.model_id where u.id = ? and rs.phase = ? limit 1')
      .get(claimX.unitId, 'both') as { key: string; nominal: number; tolerance: number; unit: string; id: string };
    const ins = t.db.$client.prepare('insert into claim_readings (id, claim_id, spec_id, key, phase, value, unit, created_at) values (?, ?, ?, ?, ?, ?, ?, ?)');
    t.db.$client.prepare('delete from claim_readings where claim_id = ?').run(claimX.id);
    ins.run('r-before', claimX.id, spec.id, spec.key, 'before', spec.nominal + 3 * spec.tolerance, spec.unit, new Date().toISOString());
    expect(evidenceFlags(t.db, claimX.id).some((f) => f.code === 'readings_out_of_tolerance')).toBe(false);
    ins.run('r-after', claimX.id, spec.id, spec.key, 'after', spec.nominal + 2 * spec.tolerance, spec.unit, new Date().toISOString());
    const f = evidenceFlags(t.db, claimX.id).find((x) => x.code === 'readings_out_of_tolerance')!;
    expect(f.readingKey).toBe(spec.key);
    expect(f.message).toContain('above tolerance');
  });

  it('the gallery lists the flags with their reasons', async () => {
    const res = await techA.get(`/api/claims/${claimX.id}/attachments`);
    expect(res.status).toBe(200);
    const codes = new Set(res.body.flags.map((f: { code: string }) => f.code));
    // The first copy of the reused photo is flagged too: the same file now sits on claim Y.
    expect(codes).toEqual(new Set(['photo_reused', 'photo_outside_service_window', 'photo_far_from_site', 'readings_out_of_tolerance']));
    expect(res.body.flags.find((f: { code: string }) => f.code === 'photo_reused').message).toContain(claimY.number);
  });
});
