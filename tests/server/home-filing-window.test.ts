import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import type { HomeCard } from '../../shared/schemas/home';
import { claims } from '../../server/db/schema/index';
import { termsOn } from '../../server/modules/admin/agencies.queries';
import { completeDraftBody, daysAgo, makeClaimsApp, type Agent } from './claims-fixtures';

type App = Awaited<ReturnType<typeof makeClaimsApp>>;
let t: App;
let techA: Agent;

beforeAll(async () => {
  t = await makeClaimsApp();
  techA = await t.signIn('techA');
});
afterAll(async () => {
  await t.close();
});

/** A draft listed first on the drafts card (oldest created), repaired `repairedDaysAgo` days ago. */
async function draftRepaired(repairedDaysAgo: number) {
  const res = await techA.post('/api/claims').send(completeDraftBody(t, { failureDate: daysAgo(repairedDaysAgo + 1), repairDate: daysAgo(repairedDaysAgo) }));
  expect(res.status).toBe(201);
  t.db.update(claims).set({ createdAt: `2001-01-0${repairedDaysAgo % 9}T00:00:00.000Z` }).where(eq(claims.id, res.body.id)).run();
  return res.body as { id: string; agencyId: string; repairDate: string };
}

const draftsCard = async (): Promise<HomeCard> => {
  const res = await techA.get('/api/home');
  expect(res.status).toBe(200);
  return res.body.cards.find((c: HomeCard) => c.key === 'my_drafts');
};

describe('home drafts: the filing window', () => {
  it('gives the days left to file from the terms in force on the repair date, and says when the window has passed', async () => {
    const onTime = await draftRepaired(3);
    const window = termsOn(t.db, onTime.agencyId, onTime.repairDate)!.filingWindowDays;
    const late = await draftRepaired(window + 2);
    const card = await draftsCard();
    const a = card.items.find((i) => i.id === onTime.id)!;
    const b = card.items.find((i) => i.id === late.id)!;
    // last day = repair date + window (the last day counts), days left counted on the agency's today
    expect(a.filing).toEqual({ lastDay: expect.any(String), daysLeft: window - 3, late: false });
    expect(b.filing).toMatchObject({ daysLeft: -2, late: true });
  });
});
