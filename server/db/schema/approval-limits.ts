import { sqliteTable, text, integer, index } from 'drizzle-orm/sqlite-core';
import { organisations } from './organisations';
import { users } from './users';

/**
 * The manufacturer's approval limit per reviewer, in cents of the claim's currency: a claim
 * whose approved total is above the approving reviewer's limit needs a second reviewer to
 * confirm. A reviewer without a row has no limit.
 */
export const approvalLimits = sqliteTable(
  'approval_limits',
  {
    userId: text('user_id')
      .primaryKey()
      .references(() => users.id),
    organisationId: text('organisation_id')
      .notNull()
      .references(() => organisations.id),
    limitCents: integer('limit_cents').notNull(),
    updatedAt: text('updated_at').notNull(),
    updatedBy: text('updated_by').references(() => users.id),
  },
  (t) => [index('approval_limits_org_idx').on(t.organisationId)],
);
