import { eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '../client';
import { claims, claimLaborLines, claimPartLines, claimTravel, paymentRunItems, paymentRuns } from '../schema/index';
import { loadClaimInputs, valueFromInputs } from '../../modules/claims/valuation.builder';

/**
 * Revalues every seeded claim with the same computation the server uses, so the demo's
 * stored claimed totals, flags and frozen approved amounts agree with what the claim page
 * shows. Runs inside the seed's transaction.
 */
export function settleSeededAmounts(t: Db, today: string): void {
  const rows = t.select().from(claims).all();
  for (const row of rows) {
    const inputs = loadClaimInputs(t, row);
    const v = valueFromInputs(inputs, today).valuation;
    if (!v) continue;
    const set: Partial<typeof claims.$inferInsert> = {};
    if (row.state !== 'draft') {
      set.claimedTotalCents = v.totals.claimed.totalCents;
      set.flags = [...new Set(v.flags.map((f) => f.code))];
    } else {
      set.claimedTotalCents = v.totals.claimed.totalCents;
    }
    if (row.state === 'approved' || row.state === 'paid') {
      set.approvedLaborCents = v.totals.approved.laborCents;
      set.approvedTravelCents = v.totals.approved.travelCents;
      set.approvedPartsCents = v.totals.approved.partsCents;
      set.approvedTotalCents = v.totals.approved.totalCents;
      const byId = new Map(v.lines.map((l) => [l.id, l]));
      for (const l of inputs.labor) t.update(claimLaborLines).set({ approvedAmountCents: byId.get(l.id)?.approvedCents ?? 0 }).where(eq(claimLaborLines.id, l.id)).run();
      for (const p of inputs.parts) t.update(claimPartLines).set({ approvedAmountCents: byId.get(p.id)?.approvedCents ?? 0 }).where(eq(claimPartLines.id, p.id)).run();
      const tr = inputs.travel;
      if (tr) {
        const cents = (byId.get(`${tr.id}-distance`)?.approvedCents ?? 0) + (byId.get(`${tr.id}-time`)?.approvedCents ?? 0);
        t.update(claimTravel).set({ approvedAmountCents: cents }).where(eq(claimTravel.id, tr.id)).run();
      }
      t.update(paymentRunItems).set({ amountCents: v.totals.approved.totalCents }).where(eq(paymentRunItems.claimId, row.id)).run();
    }
    t.update(claims).set(set).where(eq(claims.id, row.id)).run();
  }
  const runIds = t.select({ id: paymentRuns.id }).from(paymentRuns).all().map((r) => r.id);
  if (runIds.length > 0) {
    t.update(paymentRuns)
      .set({ totalCents: sql`(SELECT COALESCE(SUM(${paymentRunItems.amountCents}), 0) FROM ${paymentRunItems} WHERE ${paymentRunItems.runId} = ${paymentRuns.id})` })
      .where(inArray(paymentRuns.id, runIds))
      .run();
  }
}
