import { sqliteTable, text, integer, real, index, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { sql } from 'drizzle-orm';
import { organisations } from './organisations';
import { users } from './users';
import { units, sites } from './sites';
import { parts, repairCodes, readingSpecs } from './catalog';

export const claimStates = ['draft', 'submitted', 'in_review', 'returned', 'approved', 'denied', 'paid', 'withdrawn'] as const;
export type ClaimStateValue = (typeof claimStates)[number];

export const claims = sqliteTable(
  'claims',
  {
    id: text('id').primaryKey(),
    /** Human number, e.g. FP-2026-000042; kept across resubmissions. */
    number: text('number').notNull(),
    agencyId: text('agency_id')
      .notNull()
      .references(() => organisations.id),
    technicianId: text('technician_id')
      .notNull()
      .references(() => users.id),
    unitId: text('unit_id').references(() => units.id),
    siteId: text('site_id').references(() => sites.id),
    state: text('state', { enum: claimStates }).notNull().default('draft'),
    version: integer('version').notNull().default(1),
    complaint: text('complaint').notNull().default(''),
    cause: text('cause').notNull().default(''),
    correction: text('correction').notNull().default(''),
    failureDate: text('failure_date'),
    repairDate: text('repair_date'),
    preAuthorization: text('pre_authorization'),
    currency: text('currency').notNull().default('USD'),
    claimedTotalCents: integer('claimed_total_cents').notNull().default(0),
    approvedTotalCents: integer('approved_total_cents'),
    approvedLaborCents: integer('approved_labor_cents'),
    approvedTravelCents: integer('approved_travel_cents'),
    approvedPartsCents: integer('approved_parts_cents'),
    /** JSON array of flag codes computed at the last submit. */
    flags: text('flags', { mode: 'json' }).$type<string[]>().notNull().default(sql`'[]'`),
    resubmissionCount: integer('resubmission_count').notNull().default(0),
    firstSubmittedAt: text('first_submitted_at'),
    submittedAt: text('submitted_at'),
    reviewerId: text('reviewer_id').references(() => users.id),
    decidedAt: text('decided_at'),
    decidedBy: text('decided_by').references(() => users.id),
    /** A first approval above the reviewer's limit, waiting for a second reviewer to confirm. */
    firstApprovedBy: text('first_approved_by').references(() => users.id),
    firstApprovedAt: text('first_approved_at'),
    firstApprovedCents: integer('first_approved_cents'),
    paidAt: text('paid_at'),
    createdAt: text('created_at').notNull(),
    updatedAt: text('updated_at').notNull(),
  },
  (t) => [
    uniqueIndex('claims_number_uq').on(t.number),
    index('claims_agency_state_idx').on(t.agencyId, t.state, t.createdAt),
    index('claims_state_submitted_idx').on(t.state, t.submittedAt),
    index('claims_state_created_idx').on(t.state, t.createdAt),
    index('claims_technician_idx').on(t.technicianId, t.createdAt),
    index('claims_unit_idx').on(t.unitId, t.repairDate),
    index('claims_created_idx').on(t.createdAt),
    index('claims_repair_date_idx').on(t.repairDate),
  ],
);

export const claimLaborLines = sqliteTable(
  'claim_labor_lines',
  {
    id: text('id').primaryKey(),
    claimId: text('claim_id')
      .notNull()
      .references(() => claims.id, { onDelete: 'cascade' }),
    position: integer('position').notNull(),
    repairCodeId: text('repair_code_id')
      .notNull()
      .references(() => repairCodes.id),
    hoursWorked: real('hours_worked').notNull(),
    overtime: integer('overtime', { mode: 'boolean' }).notNull().default(false),
    note: text('note').notNull().default(''),
    approvedHours: real('approved_hours'),
    adjustmentReason: text('adjustment_reason'),
    approvedAmountCents: integer('approved_amount_cents'),
  },
  (t) => [index('claim_labor_lines_claim_idx').on(t.claimId, t.position), index('claim_labor_lines_code_idx').on(t.repairCodeId)],
);

export const claimTravel = sqliteTable(
  'claim_travel',
  {
    id: text('id').primaryKey(),
    claimId: text('claim_id')
      .notNull()
      .references(() => claims.id, { onDelete: 'cascade' }),
    /** Round trip as entered, in miles. */
    roundTripMiles: real('round_trip_miles').notNull(),
    travelHours: real('travel_hours').notNull(),
    approvedAmountCents: integer('approved_amount_cents'),
    adjustmentReason: text('adjustment_reason'),
  },
  (t) => [uniqueIndex('claim_travel_claim_uq').on(t.claimId)],
);

export const partReturnStatuses = ['not_required', 'awaiting', 'shipped', 'received', 'waived'] as const;

export const claimPartLines = sqliteTable(
  'claim_part_lines',
  {
    id: text('id').primaryKey(),
    claimId: text('claim_id')
      .notNull()
      .references(() => claims.id, { onDelete: 'cascade' }),
    position: integer('position').notNull(),
    partId: text('part_id')
      .notNull()
      .references(() => parts.id),
    quantity: integer('quantity').notNull(),
    approvedQuantity: integer('approved_quantity'),
    approvedAmountCents: integer('approved_amount_cents'),
    adjustmentReason: text('adjustment_reason'),
    returnStatus: text('return_status', { enum: partReturnStatuses }).notNull().default('not_required'),
    carrier: text('carrier'),
    trackingNumber: text('tracking_number'),
    shippedAt: text('shipped_at'),
    receivedAt: text('received_at'),
    receivedCondition: text('received_condition', { enum: ['failure_confirmed', 'no_fault_found', 'not_returned'] }),
    waiveReason: text('waive_reason'),
  },
  (t) => [index('claim_part_lines_claim_idx').on(t.claimId, t.position), index('claim_part_lines_return_idx').on(t.returnStatus), index('claim_part_lines_part_idx').on(t.partId)],
);

export const claimReadings = sqliteTable(
  'claim_readings',
  {
    id: text('id').primaryKey(),
    claimId: text('claim_id')
      .notNull()
      .references(() => claims.id, { onDelete: 'cascade' }),
    specId: text('spec_id').references(() => readingSpecs.id),
    key: text('key').notNull(),
    phase: text('phase', { enum: ['before', 'after'] }).notNull(),
    value: real('value').notNull(),
    unit: text('unit').notNull(),
    createdAt: text('created_at').notNull(),
  },
  (t) => [uniqueIndex('claim_readings_uq').on(t.claimId, t.key, t.phase)],
);

export const attachmentRoles = ['serial_plate', 'failed_part', 'replacement_part', 'unit_overall', 'invoice', 'readings_sheet', 'other'] as const;

export const attachments = sqliteTable(
  'attachments',
  {
    id: text('id').primaryKey(),
    claimId: text('claim_id').references(() => claims.id),
    organisationId: text('organisation_id')
      .notNull()
      .references(() => organisations.id),
    role: text('role', { enum: attachmentRoles }).notNull(),
    originalName: text('original_name').notNull(),
    storageKey: text('storage_key').notNull(),
    thumbnailKey: text('thumbnail_key'),
    contentType: text('content_type').notNull(),
    sizeBytes: integer('size_bytes').notNull(),
    sha256: text('sha256').notNull(),
    perceptualHash: text('perceptual_hash'),
    width: integer('width'),
    height: integer('height'),
    /** EXIF capture time as written in the file, and its offset when present. */
    takenAtRaw: text('taken_at_raw'),
    takenAtOffset: text('taken_at_offset'),
    takenAtUtc: text('taken_at_utc'),
    gpsLatitude: real('gps_latitude'),
    gpsLongitude: real('gps_longitude'),
    uploadedBy: text('uploaded_by')
      .notNull()
      .references(() => users.id),
    createdAt: text('created_at').notNull(),
    /** A removal after filing: the file stays, marked retracted, with the agency's reason. */
    retractedAt: text('retracted_at'),
    retractedBy: text('retracted_by').references(() => users.id),
    retractionReason: text('retraction_reason'),
  },
  (t) => [
    index('attachments_claim_idx').on(t.claimId),
    index('attachments_sha_idx').on(t.sha256),
    index('attachments_org_idx').on(t.organisationId),
    uniqueIndex('attachments_storage_uq').on(t.storageKey),
  ],
);

/** The audit trail of one claim: creation, every transition, adjustments. Never updated. */
export const claimEvents = sqliteTable(
  'claim_events',
  {
    id: text('id').primaryKey(),
    claimId: text('claim_id')
      .notNull()
      .references(() => claims.id),
    actorId: text('actor_id').references(() => users.id),
    organisationId: text('organisation_id').references(() => organisations.id),
    type: text('type').notNull(),
    fromState: text('from_state'),
    toState: text('to_state'),
    reason: text('reason'),
    comment: text('comment'),
    /** On submit events: what the claim said at that submission (labelled fields), to show a resubmission's changes. */
    snapshot: text('snapshot', { mode: 'json' }).$type<Record<string, string>>(),
    at: text('at').notNull(),
  },
  (t) => [index('claim_events_claim_idx').on(t.claimId, t.at)],
);

export const comments = sqliteTable(
  'comments',
  {
    id: text('id').primaryKey(),
    claimId: text('claim_id')
      .notNull()
      .references(() => claims.id),
    authorId: text('author_id')
      .notNull()
      .references(() => users.id),
    body: text('body').notNull(),
    createdAt: text('created_at').notNull(),
  },
  (t) => [index('comments_claim_idx').on(t.claimId, t.createdAt)],
);

/** Next claim number per year. */
export const claimCounters = sqliteTable('claim_counters', {
  year: integer('year').primaryKey(),
  next: integer('next').notNull(),
});

export type Claim = typeof claims.$inferSelect;
export type NewClaim = typeof claims.$inferInsert;
export type ClaimLaborLine = typeof claimLaborLines.$inferSelect;
export type ClaimTravel = typeof claimTravel.$inferSelect;
export type ClaimPartLine = typeof claimPartLines.$inferSelect;
export type ClaimReading = typeof claimReadings.$inferSelect;
export type Attachment = typeof attachments.$inferSelect;
export type ClaimEvent = typeof claimEvents.$inferSelect;
export type Comment = typeof comments.$inferSelect;
