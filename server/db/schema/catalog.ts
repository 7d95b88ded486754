import { sqliteTable, text, integer, real, index, uniqueIndex } from 'drizzle-orm/sqlite-core';

export const productFamilies = sqliteTable(
  'product_families',
  {
    id: text('id').primaryKey(),
    code: text('code').notNull(),
    name: text('name').notNull(),
    fuel: text('fuel', { enum: ['gas', 'electric'] }).notNull(),
    active: integer('active', { mode: 'boolean' }).notNull().default(true),
    createdAt: text('created_at').notNull(),
  },
  (t) => [uniqueIndex('product_families_code_uq').on(t.code)],
);

/** A model and its warranty terms (months counted from install, capped from ship). */
export const models = sqliteTable(
  'models',
  {
    id: text('id').primaryKey(),
    familyId: text('family_id')
      .notNull()
      .references(() => productFamilies.id),
    modelNumber: text('model_number').notNull(),
    name: text('name').notNull(),
    partsMonths: integer('parts_months').notNull(),
    laborMonths: integer('labor_months').notNull(),
    capMonthsFromShip: integer('cap_months_from_ship').notNull(),
    installGraceDays: integer('install_grace_days').notNull().default(90),
    active: integer('active', { mode: 'boolean' }).notNull().default(true),
    createdAt: text('created_at').notNull(),
    updatedAt: text('updated_at').notNull(),
  },
  (t) => [uniqueIndex('models_number_uq').on(t.modelNumber), index('models_family_idx').on(t.familyId)],
);

export const parts = sqliteTable(
  'parts',
  {
    id: text('id').primaryKey(),
    partNumber: text('part_number').notNull(),
    description: text('description').notNull(),
    familyId: text('family_id').references(() => productFamilies.id),
    listPriceCents: integer('list_price_cents').notNull(),
    returnRequired: integer('return_required', { mode: 'boolean' }).notNull().default(false),
    active: integer('active', { mode: 'boolean' }).notNull().default(true),
    createdAt: text('created_at').notNull(),
    updatedAt: text('updated_at').notNull(),
  },
  (t) => [uniqueIndex('parts_number_uq').on(t.partNumber), index('parts_family_idx').on(t.familyId)],
);

/** A longer parts-only term on one component of a model (e.g. a heating element). */
export const componentTerms = sqliteTable(
  'component_terms',
  {
    id: text('id').primaryKey(),
    modelId: text('model_id')
      .notNull()
      .references(() => models.id),
    partId: text('part_id')
      .notNull()
      .references(() => parts.id),
    label: text('label').notNull(),
    partsMonths: integer('parts_months').notNull(),
  },
  (t) => [uniqueIndex('component_terms_uq').on(t.modelId, t.partId)],
);

/** The labor-time guide: allowed hours and the evidence a repair requires. */
export const repairCodes = sqliteTable(
  'repair_codes',
  {
    id: text('id').primaryKey(),
    code: text('code').notNull(),
    familyId: text('family_id')
      .notNull()
      .references(() => productFamilies.id),
    description: text('description').notNull(),
    allowedHours: real('allowed_hours').notNull(),
    /** JSON array of attachment roles, e.g. ["serial_plate","failed_part"]. */
    requiredEvidence: text('required_evidence', { mode: 'json' }).$type<string[]>().notNull(),
    active: integer('active', { mode: 'boolean' }).notNull().default(true),
    createdAt: text('created_at').notNull(),
    updatedAt: text('updated_at').notNull(),
  },
  (t) => [uniqueIndex('repair_codes_code_uq').on(t.code), index('repair_codes_family_idx').on(t.familyId)],
);

export const readingSpecs = sqliteTable(
  'reading_specs',
  {
    id: text('id').primaryKey(),
    modelId: text('model_id')
      .notNull()
      .references(() => models.id),
    key: text('key').notNull(),
    label: text('label').notNull(),
    unit: text('unit', { enum: ['F', 'C', 'in', 'mm', 'A', 'V'] }).notNull(),
    nominal: real('nominal').notNull(),
    tolerance: real('tolerance').notNull(),
    phase: text('phase', { enum: ['before', 'after', 'both'] }).notNull(),
    /** JSON array of repair codes that require this reading. */
    requiredForCodes: text('required_for_codes', { mode: 'json' }).$type<string[]>().notNull(),
  },
  (t) => [uniqueIndex('reading_specs_uq').on(t.modelId, t.key)],
);

export type ProductFamily = typeof productFamilies.$inferSelect;
export type Model = typeof models.$inferSelect;
export type Part = typeof parts.$inferSelect;
export type ComponentTerm = typeof componentTerms.$inferSelect;
export type RepairCode = typeof repairCodes.$inferSelect;
export type ReadingSpec = typeof readingSpecs.$inferSelect;
