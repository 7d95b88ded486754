import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, type TestApp } from '../factories/test-app';
import { editableClaimOf } from '../fixtures/evidence-app';
import { scenePhoto } from '../fixtures/photos';

// A reuse flag must not tell one agency that another agency holds the same picture (OWASP ASVS
// 5.0 V8.2.2: data of one tenant is not disclosed to another, also through derived values).
// The check is on the API answers themselves, not on what the screens choose to show.

const ORIGIN = 'http://localhost:3000';
type Agent = Awaited<ReturnType<TestApp['signIn']>>;

describe('the cross-agency photo-reuse flag', () => {
  let t: TestApp;
  let techA: Agent;
  let techB: Agent;
  let adminB: Agent;
  let reviewer: Agent;
  let claimA: ReturnType<typeof editableClaimOf>;
  let claimB: ReturnType<typeof editableClaimOf>;
  let photo: Buffer;

  beforeAll(async () => {
    t = await makeTestApp();
    techA = await t.signIn('techA');
    techB = await t.signIn('techB');
    adminB = await t.signIn('adminB');
    reviewer = await t.signIn('reviewer');
    claimA = editableClaimOf(t, 'tech@harborview.test');
    claimB = editableClaimOf(t, 'tech@prairieline.test');
    photo = await scenePhoto(9101);
  });
  afterAll(async () => {
    await t.close();
  });

  const upload = (agent: Agent, claimId: string, name: string) =>
    agent.post(`/api/claims/${claimId}/attachments`).set('Origin', ORIGIN).field('role', 'failed_part').attach('files', photo, name);
  const reuseFlags = (flags: Array<string | { code: string }>) => flags.map((f) => (typeof f === 'string' ? f : f.code)).filter((c) => c.startsWith('photo_reused'));
  const storedFlags = (id: string) => JSON.parse((t.db.$client.prepare('select flags from claims where id = ?').get(id) as { flags: string }).flags) as string[];

  it('agency B uploads a photo agency A holds: none of agency B’s answers carries a reuse flag, nor agency A’s', async () => {
    expect((await upload(techA, claimA.id, 'a.jpg')).status).toBe(201);
    const res = await upload(techB, claimB.id, 'b.jpg');
    expect(res.status).toBe(201);
    expect(reuseFlags(res.body.flags)).toEqual([]);
    expect(JSON.stringify(res.body)).not.toMatch(/another agency|reused/i);

    // stored for the manufacturer on both claims
    expect(storedFlags(claimB.id)).toContain('photo_reused_other_agency');
    expect(storedFlags(claimA.id)).toContain('photo_reused_other_agency');

    for (const [agent, id] of [
      [techB, claimB.id],
      [adminB, claimB.id],
      [techA, claimA.id],
    ] as const) {
      const evidence = await agent.get(`/api/claims/${id}/attachments`);
      expect(evidence.status).toBe(200);
      expect(reuseFlags(evidence.body.flags)).toEqual([]);
      expect(JSON.stringify(evidence.body)).not.toMatch(/another agency/i);
      const detail = await agent.get(`/api/claims/${id}`);
      expect(detail.status).toBe(200);
      expect(reuseFlags(detail.body.flags)).toEqual([]);
      const list = await agent.get('/api/claims?limit=100');
      for (const item of list.body.items) expect(reuseFlags(item.flags)).toEqual([]);
    }
    // filtering by the manufacturer's flag finds nothing for an agency (list agrees with detail)
    const filtered = await adminB.get('/api/claims?flag=photo_reused_other_agency');
    expect(filtered.status).toBe(200);
    expect(filtered.body.items).toEqual([]);
    expect(filtered.body.total).toBe(0);
  });

  it('the manufacturer’s reviewer sees it, naming the other claim', async () => {
    t.db.$client.prepare("update claims set state = 'submitted', submitted_at = ?, first_submitted_at = ? where id = ?").run(new Date().toISOString(), new Date().toISOString(), claimB.id);
    const detail = await reviewer.get(`/api/claims/${claimB.id}`);
    expect(detail.status).toBe(200);
    expect(detail.body.flags).toContain('photo_reused_other_agency');
    const evidence = await reviewer.get(`/api/claims/${claimB.id}/attachments`);
    const f = evidence.body.flags.find((x: { code: string }) => x.code === 'photo_reused_other_agency');
    expect(f.otherClaimNumber).toBe(claimA.number);
    expect(f.message).toContain(`claim ${claimA.number} of another agency`);
    const filtered = await reviewer.get('/api/claims?flag=photo_reused_other_agency&limit=100');
    expect(filtered.body.items.map((i: { id: string }) => i.id)).toContain(claimB.id);
  });
});
