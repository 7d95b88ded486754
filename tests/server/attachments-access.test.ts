import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { makeTestApp, type TestApp, type DemoKey } from '../factories/test-app';
import { editableClaimOf } from '../fixtures/evidence-app';
import { scenePhoto } from '../fixtures/photos';

// Files are served only after the same read check as their claim; any other user gets the same
// 404 as for an id that does not exist (OWASP ASVS 5.0 8.2.2 and 8.4.1; 5.3.x served files).

const ORIGIN = 'http://localhost:3000';

describe('who may fetch an attachment and its thumbnail', () => {
  let t: TestApp;
  let attachmentId: string;
  let claimId: string;
  const agents: Partial<Record<DemoKey, Awaited<ReturnType<TestApp['signIn']>>>> = {};

  beforeAll(async () => {
    t = await makeTestApp();
    for (const k of ['techA', 'adminA', 'techB', 'adminB', 'reviewer', 'accountant', 'mfrAdmin'] as DemoKey[]) agents[k] = await t.signIn(k);
    claimId = editableClaimOf(t, 'tech@harborview.test').id;
    const res = await agents.techA!.post(`/api/claims/${claimId}/attachments`).set('Origin', ORIGIN).field('role', 'failed_part').attach('files', await scenePhoto(501), 'part.jpg');
    expect(res.status).toBe(201);
    attachmentId = res.body.attachments[0].id;
  });
  afterAll(async () => {
    await t.close();
  });

  const paths = (id: string) => [`/api/attachments/${id}`, `/api/attachments/${id}/thumbnail`, `/api/attachments/${id}/preview`];

  it('the technician who owns the claim and the admin of the same agency may', async () => {
    for (const who of ['techA', 'adminA'] as const) {
      for (const p of paths(attachmentId)) expect((await agents[who]!.get(p)).status, `${who} ${p}`).toBe(200);
    }
  });

  it('the other agency, the accountant, the manufacturer admin and (on a draft) the reviewer get 404, the same body as an unknown id', async () => {
    const unknown = await agents.techB!.get('/api/attachments/00000000-0000-0000-0000-000000000000');
    expect(unknown.status).toBe(404);
    for (const who of ['techB', 'adminB', 'accountant', 'mfrAdmin', 'reviewer'] as const) {
      for (const p of paths(attachmentId)) {
        const res = await agents[who]!.get(p);
        expect(res.status, `${who} ${p}`).toBe(404);
        expect(res.body).toEqual(unknown.body);
        expect(res.headers['content-disposition']).toBeUndefined();
      }
      expect((await agents[who]!.get(`/api/claims/${claimId}/attachments`)).status).toBe(404);
    }
  });

  it('ids of agency A in the query, a header or a path of agency B change nothing', async () => {
    const agencyA = editableClaimOf(t, 'tech@harborview.test').agencyId;
    for (const p of paths(attachmentId)) {
      const res = await agents.techB!.get(`${p}?agency=${agencyA}&organisationId=${agencyA}`).set('X-Organisation-Id', agencyA);
      expect(res.status).toBe(404);
    }
  });

  it('signed out: 401', async () => {
    for (const p of paths(attachmentId)) expect((await request(t.app).get(p)).status).toBe(401);
  });

  it('once the claim is filed the reviewer may read it, and the download is audited', async () => {
    t.db.$client.prepare("update claims set state = 'submitted', submitted_at = ? where id = ?").run(new Date().toISOString(), claimId);
    const res = await agents.reviewer!.get(`/api/attachments/${attachmentId}`);
    expect(res.status).toBe(200);
    const rows = t.db.$client.prepare("select actor_id, outcome from audit_log where action = 'attachment.download' and record_id = ?").all(attachmentId) as Array<{ actor_id: string }>;
    const reviewerId = (t.db.$client.prepare("select id from users where email = 'reviewer@larkfield.test'").get() as { id: string }).id;
    expect(rows.some((r) => r.actor_id === reviewerId)).toBe(true);
    // The accountant still may not (it reads approved and paid claims, and never the evidence).
    expect((await agents.accountant!.get(`/api/attachments/${attachmentId}`)).status).toBe(404);
    t.db.$client.prepare("update claims set state = 'draft', submitted_at = null where id = ?").run(claimId);
  });

  it('a malformed id is a 404, never a 500', async () => {
    for (const id of ['..%2F..%2Fetc', "1' or '1'='1", 'x'.repeat(200)]) {
      const res = await agents.techA!.get(`/api/attachments/${id}`);
      expect(res.status).toBe(404);
    }
  });
});
