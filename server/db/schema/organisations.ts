import { sqliteTable, text, integer, real, index, uniqueIndex } from 'drizzle-orm/sqlite-core';

/** Manufacturer or service agency. Every tenant-owned row points at one of these. */
export const organisations = sqliteTable(
  'organisations',
  {
    id: text('id').primaryKey(),
    kind: text('kind', { enum: ['manufacturer', 'agency'] }).notNull(),
    name: text('name').notNull(),
    /** nameKey(name) from shared/schemas/text.ts: names are unique on the platform, compared case- and space-insensitively. */
    nameKey: text('name_key').notNull(),
    contactEmail: text('contact_email'),
    addressLine: text('address_line'),
    city: text('city'),
    region: text('region'),
    postalCode: text('postal_code'),
    country: text('country').notNull().default('US'),
    latitude: real('latitude'),
    longitude: real('longitude'),
    timeZone: text('time_zone').notNull().default('America/Chicago'),
    currency: text('currency').notNull().default('USD'),
    active: integer('active', { mode: 'boolean' }).notNull().default(true),
    /** The organisation's admin requires a second factor of every user (accountants and manufacturer admins always need one). */
    requireSecondFactor: integer('require_second_factor', { mode: 'boolean' }).notNull().default(false),
    createdAt: text('created_at').notNull(),
    updatedAt: text('updated_at').notNull(),
  },
  (t) => [index('organisations_kind_idx').on(t.kind), uniqueIndex('organisations_name_key_uq').on(t.nameKey)],
);

/** Contract terms between the manufacturer and one agency, in force from..to (inclusive). */
export const agencyTerms = sqliteTable(
  'agency_terms',
  {
    id: text('id').primaryKey(),
    agencyId: text('agency_id')
      .notNull()
      .references(() => organisations.id),
    effectiveFrom: text('effective_from').notNull(),
    effectiveTo: text('effective_to'),
    laborRateCents: integer('labor_rate_cents').notNull(),
    travelRateCents: integer('travel_rate_cents').notNull(),
    /** null: the IRS business standard mileage rate of the repair date's year. */
    mileageRateCents: real('mileage_rate_cents'),
    maxRoundTripMiles: real('max_round_trip_miles').notNull(),
    maxTravelHours: real('max_travel_hours').notNull(),
    partsDiscountBps: integer('parts_discount_bps').notNull().default(0),
    partsHandlingBps: integer('parts_handling_bps').notNull().default(0),
    overtimeMultiplier: real('overtime_multiplier').notNull().default(1.5),
    filingWindowDays: integer('filing_window_days').notNull().default(30),
    createdAt: text('created_at').notNull(),
  },
  (t) => [index('agency_terms_agency_idx').on(t.agencyId, t.effectiveFrom)],
);

export type Organisation = typeof organisations.$inferSelect;
export type NewOrganisation = typeof organisations.$inferInsert;
export type AgencyTerms = typeof agencyTerms.$inferSelect;
export type NewAgencyTerms = typeof agencyTerms.$inferInsert;
