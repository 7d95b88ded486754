/**
 * Evidence already attached: relabelled or deleted while the claim is a draft or returned
 * (audited, the file removed after the commit); retracted with a reason once filed, the file
 * kept and marked, the reason in the reviewer's view.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { scenePhoto } from '../fixtures/photos';
import { storedFiles } from '../fixtures/evidence-app';
import { claimIn, countRows, createCompleteDraft, makeClaimsApp, move, ORIGIN, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;
let colleague: Agent;
let adminB: Agent;
let reviewer: Agent;

beforeAll(async () => {
  t = await makeClaimsApp();
  techA = await t.signIn('techA');
  colleague = await t.signIn('priya.halvorsen@harborview.test');
  adminB = await t.signIn('adminB');
  reviewer = await t.signIn('reviewer');
});
afterAll(async () => {
  await t.close();
});

let seed = 500;
async function upload(claimId: string, role = 'failed_part') {
  const res = await techA
    .post(`/api/claims/${claimId}/attachments`)
    .set('Origin', ORIGIN)
    .field('role', role)
    .attach('files', await scenePhoto(seed++), { filename: 'part.jpg', contentType: 'image/jpeg' });
  expect(res.status).toBe(201);
  return res.body.attachments[0] as { id: string; role: string };
}
const files = () => storedFiles(t.env.STORAGE_DIR).filter((f) => !f.includes('.tmp')).length;

describe('while the claim is editable', () => {
  it('the agency relabels a file (audited) and no one else can', async () => {
    const c = await createCompleteDraft(t, techA, 'tech@harborview.test');
    const a = await upload(c.id);
    const res = await techA.patch(`/api/attachments/${a.id}`).set('Origin', ORIGIN).send({ role: 'serial_plate' });
    expect(res.status).toBe(200);
    expect(res.body.role).toBe('serial_plate');
    expect(countRows(t, 'audit_log', "record_id = ? and action = 'attachment.relabel' and outcome = 'success'", a.id)).toBe(1);
    expect((await techA.patch(`/api/attachments/${a.id}`).set('Origin', ORIGIN).send({ role: 'selfie' })).status).toBe(400);
    expect((await adminB.patch(`/api/attachments/${a.id}`).set('Origin', ORIGIN).send({ role: 'other' })).status).toBe(404);
    expect((await colleague.patch(`/api/attachments/${a.id}`).set('Origin', ORIGIN).send({ role: 'other' })).status).toBe(404);
  });

  it('the agency deletes a file: the row goes in one transaction with its audit row, the stored file after it', async () => {
    const c = await createCompleteDraft(t, techA, 'tech@harborview.test');
    const a = await upload(c.id);
    const before = files();
    const res = await techA.delete(`/api/attachments/${a.id}`).set('Origin', ORIGIN);
    expect(res.status).toBe(204);
    expect(countRows(t, 'attachments', 'id = ?', a.id)).toBe(0);
    expect(files()).toBeLessThan(before);
    expect(countRows(t, 'audit_log', "record_id = ? and action = 'attachment.delete' and outcome = 'success'", a.id)).toBe(1);
    expect((await techA.delete(`/api/attachments/${a.id}`).set('Origin', ORIGIN)).status).toBe(404);
    const retract = await techA.post(`/api/attachments/${(await upload(c.id)).id}/retraction`).set('Origin', ORIGIN).send({ reason: 'Wrong unit.' });
    expect(retract.status).toBe(409);
    expect(retract.body.error.code).toBe('delete_instead');
  });
});

describe('after filing', () => {
  it('deleting is refused; a retraction needs a reason, keeps the file marked retracted, and the reviewer sees why', async () => {
    const c = await createCompleteDraft(t, techA, 'tech@harborview.test');
    const a = await upload(c.id);
    const submitted = await move(techA, c.id, 'submit', c.version);
    expect(submitted.status).toBe(200);

    const del = await techA.delete(`/api/attachments/${a.id}`).set('Origin', ORIGIN);
    expect(del.status).toBe(409);
    expect(del.body.error.code).toBe('retract_instead');
    expect((await techA.patch(`/api/attachments/${a.id}`).set('Origin', ORIGIN).send({ role: 'other' })).status).toBe(409);
    expect((await reviewer.delete(`/api/attachments/${a.id}`).set('Origin', ORIGIN)).status).toBe(403);

    const none = await techA.post(`/api/attachments/${a.id}/retraction`).set('Origin', ORIGIN).send({ reason: '' });
    expect(none.status).toBe(400);
    expect(none.body.error.fields.reason).toBeTruthy();
    const before = files();
    const ok = await techA.post(`/api/attachments/${a.id}/retraction`).set('Origin', ORIGIN).send({ reason: 'This photo is of another fryer on the same site.' });
    expect(ok.status).toBe(200);
    expect(ok.body.retractedAt).toBeTruthy();
    expect(files()).toBe(before);
    expect(countRows(t, 'attachments', 'id = ?', a.id)).toBe(1);
    expect((await techA.post(`/api/attachments/${a.id}/retraction`).set('Origin', ORIGIN).send({ reason: 'Again.' })).status).toBe(409);

    const evidence = (await reviewer.get(`/api/claims/${c.id}/attachments`)).body;
    const seen = evidence.attachments.find((x: { id: string }) => x.id === a.id);
    expect(seen.retractionReason).toBe('This photo is of another fryer on the same site.');
    const detail = (await reviewer.get(`/api/claims/${c.id}`)).body;
    expect(detail.events.at(-1).type).toBe('evidence_retracted');
    expect(detail.events.at(-1).comment).toContain('another fryer');
    expect(countRows(t, 'audit_log', "record_id = ? and action = 'attachment.retract' and outcome = 'success'", a.id)).toBe(1);
  });

  it('a decided claim keeps its evidence as it is', async () => {
    const c = await claimIn(t, { tech: techA, reviewer }, 'approved');
    const a = t.db.$client.prepare('select id from attachments where claim_id = ?').get(c.id) as { id: string };
    const res = await techA.post(`/api/attachments/${a.id}/retraction`).set('Origin', ORIGIN).send({ reason: 'Too late.' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('not_retractable');
  });
});
