import { sqliteTable, text, real, index, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { sql } from 'drizzle-orm';
import { models } from './catalog';

/** A restaurant where units are installed. */
export const sites = sqliteTable(
  'sites',
  {
    id: text('id').primaryKey(),
    name: text('name').notNull(),
    addressLine: text('address_line').notNull(),
    city: text('city').notNull(),
    region: text('region').notNull(),
    postalCode: text('postal_code').notNull(),
    latitude: real('latitude').notNull(),
    longitude: real('longitude').notNull(),
    createdAt: text('created_at').notNull(),
  },
  (t) => [index('sites_name_idx').on(t.name)],
);

export const units = sqliteTable(
  'units',
  {
    id: text('id').primaryKey(),
    serial: text('serial').notNull(),
    modelId: text('model_id')
      .notNull()
      .references(() => models.id),
    revision: text('revision').notNull(),
    shipDate: text('ship_date').notNull(),
    installDate: text('install_date'),
    /** Warranty registration date, when the unit was registered; its terms are those in force then. */
    registeredOn: text('registered_on'),
    /** The manufacturer's registration of where the unit is installed; only the manufacturer's data writes it. An agency's knowledge of a site lives on its claims (claims.site_id). */
    siteId: text('site_id').references(() => sites.id),
    createdAt: text('created_at').notNull(),
  },
  (t) => [
    uniqueIndex('units_serial_uq').on(t.serial),
    // The serial look-up ignores case: lower(serial) = lower(?) must not scan.
    index('units_serial_lower_idx').on(sql`lower(${t.serial})`),
    index('units_model_idx').on(t.modelId, t.shipDate),
    index('units_site_idx').on(t.siteId),
  ],
);

export type Site = typeof sites.$inferSelect;
export type Unit = typeof units.$inferSelect;
