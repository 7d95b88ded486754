import { sqliteTable, text, integer, index, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { sql } from 'drizzle-orm';
import { organisations } from './organisations';
import { users } from './users';
import { claims } from './claims';

export const paymentRuns = sqliteTable(
  'payment_runs',
  {
    id: text('id').primaryKey(),
    number: text('number').notNull(),
    agencyId: text('agency_id')
      .notNull()
      .references(() => organisations.id),
    /** The agency's name when the run was made: the run, its CSV and remittance pay this name, whatever the agency is called later. */
    payeeName: text('payee_name').notNull().default(''),
    state: text('state', { enum: ['open', 'paid', 'void'] }).notNull().default('open'),
    totalCents: integer('total_cents').notNull(),
    currency: text('currency').notNull().default('USD'),
    createdBy: text('created_by')
      .notNull()
      .references(() => users.id),
    paymentDate: text('payment_date'),
    reference: text('reference'),
    paidBy: text('paid_by').references(() => users.id),
    paidAt: text('paid_at'),
    voidedAt: text('voided_at'),
    createdAt: text('created_at').notNull(),
  },
  (t) => [uniqueIndex('payment_runs_number_uq').on(t.number), index('payment_runs_agency_idx').on(t.agencyId, t.state)],
);

export const paymentRunItems = sqliteTable(
  'payment_run_items',
  {
    id: text('id').primaryKey(),
    runId: text('run_id')
      .notNull()
      .references(() => paymentRuns.id),
    claimId: text('claim_id')
      .notNull()
      .references(() => claims.id),
    amountCents: integer('amount_cents').notNull(),
    /** 1 while the run is open or paid; null once the run is voided (frees the claim). */
    active: integer('active'),
  },
  (t) => [
    index('payment_run_items_run_idx').on(t.runId),
    uniqueIndex('payment_run_items_active_claim_uq').on(t.claimId).where(sql`active = 1`),
  ],
);

export type PaymentRun = typeof paymentRuns.$inferSelect;
export type PaymentRunItem = typeof paymentRunItems.$inferSelect;
