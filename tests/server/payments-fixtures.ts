/**
 * Set-up for the payment, part-return and export tests: a real app on a real SQLite file with
 * the demo scenario, plus approved claims written straight into the database (as the approval
 * transaction leaves them: approved amounts frozen on the claim and its lines, the decider,
 * the approval event), so a test controls agency, amounts, texts and return states exactly.
 * One test files a claim through the whole API instead (part-returns-flow.test.ts).
 */
import { and, eq } from 'drizzle-orm';
import type request from 'supertest';
import { makeTestApp, TestClock, type TestApp } from '../factories/test-app';
import { claimEvents, claimLaborLines, claimPartLines, claimTravel, claims, organisations, parts, repairCodes, units, users } from '../../server/db/schema/index';
import { newId } from '../../server/lib/ids';

export type Agent = ReturnType<typeof request.agent>;
export const TODAY = '2026-06-15';
export const HARBORVIEW = 'Harborview Appliance Service';
export const PRAIRIE = 'Prairie Line Kitchen Repair';

export type PaymentsApp = TestApp & { clock: TestClock };

export async function makePaymentsApp(): Promise<PaymentsApp> {
  const clock = new TestClock(new Date(`${TODAY}T12:00:00.000Z`));
  const t = await makeTestApp({ clock });
  return Object.assign(t, { clock });
}

export function userId(t: TestApp, email: string): string {
  const u = t.db.select({ id: users.id }).from(users).where(eq(users.email, email)).get();
  if (!u) throw new Error(`no user ${email}`);
  return u.id;
}

export function agencyId(t: TestApp, name: string): string {
  const o = t.db.select({ id: organisations.id }).from(organisations).where(eq(organisations.name, name)).get();
  if (!o) throw new Error(`no organisation ${name}`);
  return o.id;
}

let seq = 0;

export interface ApprovedClaimSpec {
  agency?: string;
  technicianEmail?: string;
  laborCents?: number;
  travelCents?: number;
  /** One part line per entry; `status` is the return status (not_required for parts that need no return). */
  parts?: Array<{ cents: number; status?: 'not_required' | 'awaiting' | 'shipped' | 'received' | 'waived'; condition?: 'failure_confirmed' | 'no_fault_found' | 'not_returned' }>;
  decidedByEmail?: string;
  /** Approval day, YYYY-MM-DD. */
  decidedOn?: string;
  repairDate?: string;
  number?: string;
  currency?: string;
  /** A unit of its own with this serial (the first unit of the demo otherwise). */
  unitSerial?: string;
  /** A technician of its own with this name, in the claim's agency. */
  technicianName?: string;
}

/** An approved claim as the approval transaction leaves it. Returns its id and number. */
export function insertApprovedClaim(t: TestApp, spec: ApprovedClaimSpec = {}): { id: string; number: string; totalCents: number } {
  const agency = agencyId(t, spec.agency ?? HARBORVIEW);
  const techEmail = spec.technicianEmail ?? (agency === agencyId(t, HARBORVIEW) ? 'tech@harborview.test' : 'tech@prairieline.test');
  seq += 1;
  let tech = userId(t, techEmail);
  if (spec.technicianName !== undefined) {
    tech = newId();
    const now = new Date().toISOString();
    t.db.insert(users).values({ id: tech, organisationId: agency, role: 'technician', email: `tech-${seq}@fixture.test`, name: spec.technicianName, passwordHash: null, createdAt: now, updatedAt: now }).run();
  }
  const decider = userId(t, spec.decidedByEmail ?? 'reviewer@larkfield.test');
  let unit = t.db.select().from(units).orderBy(units.serial).limit(1).get()!;
  if (spec.unitSerial !== undefined) {
    const own = { ...unit, id: newId(), serial: spec.unitSerial };
    t.db.insert(units).values(own).run();
    unit = own;
  }
  const code = t.db.select().from(repairCodes).limit(1).get()!;
  const part = t.db.select().from(parts).limit(1).get()!;
  const labor = spec.laborCents ?? 12_000;
  const travel = spec.travelCents ?? 0;
  const partList = spec.parts ?? [];
  const partsCents = partList.reduce((s, p) => s + p.cents, 0);
  const total = labor + travel + partsCents;
  const id = newId();
  const number = spec.number ?? `FP-2026-${String(900_000 + seq).padStart(6, '0')}`;
  const decidedAt = `${spec.decidedOn ?? '2026-06-10'}T15:00:00.000Z`;
  const created = '2026-06-01T09:00:00.000Z';
  t.db.transaction((tx) => {
    tx.insert(claims)
      .values({
        id,
        number,
        agencyId: agency,
        technicianId: tech,
        unitId: unit.id,
        siteId: unit.siteId,
        state: 'approved',
        version: 5,
        complaint: 'Unit does not heat.',
        cause: 'Failed component.',
        correction: 'Replaced the component and verified a cook cycle.',
        failureDate: '2026-05-30',
        repairDate: spec.repairDate ?? '2026-05-31',
        currency: spec.currency ?? 'USD',
        claimedTotalCents: total,
        approvedTotalCents: total,
        approvedLaborCents: labor,
        approvedTravelCents: travel,
        approvedPartsCents: partsCents,
        firstSubmittedAt: '2026-06-01T10:00:00.000Z',
        submittedAt: '2026-06-01T10:00:00.000Z',
        reviewerId: decider,
        decidedAt,
        decidedBy: decider,
        createdAt: created,
        updatedAt: decidedAt,
      })
      .run();
    tx.insert(claimLaborLines).values({ id: newId(), claimId: id, position: 1, repairCodeId: code.id, hoursWorked: 1, approvedAmountCents: labor }).run();
    if (travel > 0) tx.insert(claimTravel).values({ id: newId(), claimId: id, roundTripMiles: 20, travelHours: 0.5, approvedAmountCents: travel }).run();
    partList.forEach((p, i) => {
      const status = p.status ?? 'not_required';
      tx.insert(claimPartLines)
        .values({
          id: newId(),
          claimId: id,
          position: i + 1,
          partId: part.id,
          quantity: 1,
          approvedAmountCents: p.cents,
          returnStatus: status,
          carrier: status === 'shipped' || status === 'received' ? 'Parcel carrier' : null,
          trackingNumber: status === 'shipped' || status === 'received' ? `TRK${seq}${i}` : null,
          shippedAt: status === 'shipped' || status === 'received' ? '2026-06-11T10:00:00.000Z' : null,
          receivedAt: status === 'received' ? '2026-06-13T10:00:00.000Z' : null,
          receivedCondition: status === 'received' ? (p.condition ?? 'failure_confirmed') : null,
          waiveReason: status === 'waived' ? 'Part scrapped on site with the reviewer’s agreement.' : null,
        })
        .run();
    });
    tx.insert(claimEvents).values({ id: newId(), claimId: id, actorId: decider, organisationId: null, type: 'approve', fromState: 'in_review', toState: 'approved', at: decidedAt }).run();
  });
  return { id, number, totalCents: total };
}

export function partLineIds(t: TestApp, claimId: string): string[] {
  return t.db
    .select({ id: claimPartLines.id })
    .from(claimPartLines)
    .where(eq(claimPartLines.claimId, claimId))
    .orderBy(claimPartLines.position)
    .all()
    .map((r) => r.id);
}

export function claimRow(t: TestApp, id: string) {
  return t.db.select().from(claims).where(eq(claims.id, id)).get()!;
}

export function countRows(t: TestApp, table: string, where = '1 = 1', ...params: unknown[]): number {
  return (t.db.$client.prepare(`select count(*) as n from ${table} where ${where}`).get(...params) as { n: number }).n;
}

export function payEvents(t: TestApp, claimId: string) {
  return t.db
    .select()
    .from(claimEvents)
    .where(and(eq(claimEvents.claimId, claimId), eq(claimEvents.type, 'pay')))
    .all();
}

export const ORIGIN = 'http://localhost:3000';
