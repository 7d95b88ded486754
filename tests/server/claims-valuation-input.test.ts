import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { valueClaim } from '@shared/calculations/valuation';
import type { ClaimValuationBasis } from '@shared/schemas/claim';
import { createCompleteDraft, grillFixture, makeClaimsApp, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;
let techB: Agent;
let reviewer: Agent;

beforeAll(async () => {
  t = await makeClaimsApp();
  techA = await t.signIn('techA');
  techB = await t.signIn('techB');
  reviewer = await t.signIn('reviewer');
});
afterAll(async () => {
  await t.close();
});

describe('GET /api/claims/:id/valuation-input', () => {
  it('gives the stored claim’s valuation input, which values to the same amounts as GET /valuation', async () => {
    const c = await createCompleteDraft(t, techA, 'tech@harborview.test');
    const res = await techA.get(`/api/claims/${c.id}/valuation-input`);
    expect(res.status).toBe(200);
    const basis = res.body as ClaimValuationBasis;
    expect(basis.claimId).toBe(c.id);
    expect(basis.version).toBe(c.version);
    expect(basis.problems).toEqual([]);
    expect(basis.input).not.toBeNull();
    expect(basis.input!.unit.serial).toBe(grillFixture(t).unit.serial);
    expect(basis.input!.labor).toHaveLength(1);
    expect(basis.input!.contract.laborRateCents).toBeGreaterThan(0);

    const server = await techA.get(`/api/claims/${c.id}/valuation`);
    expect(server.status).toBe(200);
    // The browser runs the same shared computation over this input: the totals agree to the cent.
    const inBrowser = valueClaim(basis.input!);
    expect(inBrowser.totals).toEqual(server.body.totals);
    expect(inBrowser.lines.map((l) => [l.id, l.claimedCents])).toEqual(server.body.lines.map((l: { id: string; claimedCents: number }) => [l.id, l.claimedCents]));
  });

  it('names the missing inputs while a new draft cannot be valued yet', async () => {
    const res = await techA.post('/api/claims').send({ serial: grillFixture(t).unit.serial });
    expect(res.status).toBe(201);
    const basis = (await techA.get(`/api/claims/${res.body.id}/valuation-input`)).body as ClaimValuationBasis;
    expect(basis.input).toBeNull();
    expect(basis.problems.map((p) => p.path).sort()).toEqual(['failureDate', 'repairDate']);
  });

  it('answers 404 to another agency and to a reviewer for a draft, as the claim itself does', async () => {
    const c = await createCompleteDraft(t, techA, 'tech@harborview.test');
    expect((await techB.get(`/api/claims/${c.id}/valuation-input`)).status).toBe(404);
    expect((await reviewer.get(`/api/claims/${c.id}/valuation-input`)).status).toBe(404);
    expect((await techA.get('/api/claims/no-such-claim/valuation-input')).status).toBe(404);
  });
});
