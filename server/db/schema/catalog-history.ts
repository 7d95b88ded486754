import { sqliteTable, text, integer, real, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { models, parts, repairCodes } from './catalog';
import { users } from './users';

/**
 * Effective-dated list prices: the price of a part on a repair date is the row with the latest
 * effective_from on or before that date. parts.list_price_cents mirrors the price in force on
 * the day of the last change; valuations read this table through priceOn().
 */
export const partPrices = sqliteTable(
  'part_prices',
  {
    id: text('id').primaryKey(),
    partId: text('part_id')
      .notNull()
      .references(() => parts.id),
    effectiveFrom: text('effective_from').notNull(),
    listPriceCents: integer('list_price_cents').notNull(),
    createdBy: text('created_by').references(() => users.id),
    createdAt: text('created_at').notNull(),
  },
  (t) => [uniqueIndex('part_prices_part_from_uq').on(t.partId, t.effectiveFrom)],
);

/** Effective-dated labor-time allowances of repair codes, read through allowanceOn(). */
export const repairCodeAllowances = sqliteTable(
  'repair_code_allowances',
  {
    id: text('id').primaryKey(),
    repairCodeId: text('repair_code_id')
      .notNull()
      .references(() => repairCodes.id),
    effectiveFrom: text('effective_from').notNull(),
    allowedHours: real('allowed_hours').notNull(),
    createdBy: text('created_by').references(() => users.id),
    createdAt: text('created_at').notNull(),
  },
  (t) => [uniqueIndex('repair_code_allowances_code_from_uq').on(t.repairCodeId, t.effectiveFrom)],
);

export type PartPrice = typeof partPrices.$inferSelect;
export type RepairCodeAllowance = typeof repairCodeAllowances.$inferSelect;

/**
 * Mileage rates as dated data the manufacturer admin keeps: in force from..to (inclusive; to
 * null = until further notice), per currency, per mile or per kilometre, in tenths of a cent
 * (655 = 65.5 cents) with the published source of the figure. Used when an agency's contract
 * terms carry no mileage rate of their own. Periods of one currency never overlap.
 */
export const mileageRates = sqliteTable(
  'mileage_rates',
  {
    id: text('id').primaryKey(),
    currency: text('currency').notNull(),
    unit: text('unit', { enum: ['mi', 'km'] }).notNull(),
    effectiveFrom: text('effective_from').notNull(),
    effectiveTo: text('effective_to'),
    rateTenthCents: integer('rate_tenth_cents').notNull(),
    source: text('source').notNull(),
    createdBy: text('created_by').references(() => users.id),
    createdAt: text('created_at').notNull(),
  },
  (t) => [uniqueIndex('mileage_rates_currency_from_uq').on(t.currency, t.effectiveFrom)],
);

export type MileageRateRow = typeof mileageRates.$inferSelect;

/**
 * Effective-dated warranty terms of a model. The terms of a unit are the row in force on its
 * registration date, or its ship date when it is not registered: the latest effective_from on
 * or before that date. A change applies to units shipped (or registered) on or after its
 * effective date; units already in the field keep theirs. The columns on `models` and the
 * `component_terms` rows mirror the terms in force today, for lists only.
 */
export const modelTerms = sqliteTable(
  'model_terms',
  {
    id: text('id').primaryKey(),
    modelId: text('model_id')
      .notNull()
      .references(() => models.id),
    effectiveFrom: text('effective_from').notNull(),
    partsMonths: integer('parts_months').notNull(),
    laborMonths: integer('labor_months').notNull(),
    capMonthsFromShip: integer('cap_months_from_ship').notNull(),
    installGraceDays: integer('install_grace_days').notNull(),
    /** JSON array of { partId, label, partsMonths }: parts-only terms of single components. */
    componentTerms: text('component_terms', { mode: 'json' }).$type<{ partId: string; label: string; partsMonths: number }[]>().notNull(),
    /** Why a change took effect in the past (required then). */
    reason: text('reason'),
    createdBy: text('created_by').references(() => users.id),
    createdAt: text('created_at').notNull(),
  },
  (t) => [uniqueIndex('model_terms_model_from_uq').on(t.modelId, t.effectiveFrom)],
);

export type ModelTermsRow = typeof modelTerms.$inferSelect;
