import type { UnitTerms } from './unit';
import { z } from 'zod';
import type { ValuationInput } from '../calculations/valuation';
import { FLAG_CODES } from '../calculations/flags';
import { implausibleReading, parseDecimalInput } from '../calculations/number-input';
import { multiLine, oneLine } from './text';

export const claimStates = ['draft', 'submitted', 'in_review', 'returned', 'approved', 'denied', 'paid', 'withdrawn'] as const;
export type ClaimState = (typeof claimStates)[number];

export const claimStateLabels: Record<ClaimState, string> = {
  draft: 'Draft',
  submitted: 'Submitted',
  in_review: 'In review',
  returned: 'Returned',
  approved: 'Approved',
  denied: 'Denied',
  paid: 'Paid',
  withdrawn: 'Withdrawn',
};

export const attachmentRoles = ['serial_plate', 'failed_part', 'replacement_part', 'unit_overall', 'invoice', 'readings_sheet', 'other'] as const;
export type AttachmentRole = (typeof attachmentRoles)[number];
export const attachmentRoleLabels: Record<AttachmentRole, string> = {
  serial_plate: 'Serial plate',
  failed_part: 'Failed part',
  replacement_part: 'Replacement part installed',
  unit_overall: 'Unit overall',
  invoice: 'Invoice',
  readings_sheet: 'Readings sheet',
  other: 'Other',
};

const isoDate = z.iso.date('Use a date as YYYY-MM-DD, like 2026-03-31.');
/** Human-entered text: NFC, trimmed, no control, text-direction or invisible characters (./text.ts). */
const line = (max: number, label: string) => oneLine({ max, min: 0, label });
const prose = (max: number, label: string) => multiLine({ max, min: 0, label });

/**
 * A number as JSON; a string (what a form would send if it did not parse) is refused with the
 * strict parser's message ("1,5", "35O", "1e6", "12..5" all say what is wrong).
 */
const typedNumber = (message: string) =>
  z.number({
    error: (iss) => {
      if (typeof iss.input !== 'string') return message;
      const p = parseDecimalInput(iss.input);
      return p.ok ? message : p.message;
    },
  });

export const laborLineInputSchema = z.strictObject({
  repairCodeId: z.string().min(1, 'Choose a repair code.'),
  hoursWorked: typedNumber('Enter hours as a number.').min(0.1, 'At least 0.1 hour.').max(24, 'At most 24 hours on one line.'),
  overtime: z.boolean().default(false),
  note: line(500, 'The note').default(''),
});

export const travelInputSchema = z.strictObject({
  roundTripMiles: typedNumber('Enter miles as a number.').min(0, 'Miles cannot be negative.').max(2000, 'At most 2,000 miles.'),
  travelHours: typedNumber('Enter hours as a number.').min(0, 'Hours cannot be negative.').max(48, 'At most 48 hours.'),
});

export const partLineInputSchema = z.strictObject({
  partId: z.string().min(1, 'Choose a part.'),
  quantity: typedNumber('Enter the quantity as a whole number.').int('Whole parts only.').min(1, 'At least 1.').max(99, 'At most 99.'),
});

export const readingInputSchema = z
  .strictObject({
    key: z.string().min(1).max(60),
    phase: z.enum(['before', 'after']),
    value: typedNumber('Enter the reading as a number.').finite(),
    unit: z.enum(['F', 'C', 'in', 'mm', 'A', 'V']),
  })
  .superRefine((r, ctx) => {
    const problem = implausibleReading(r.value, r.unit);
    if (problem) ctx.addIssue({ code: 'custom', path: ['value'], message: problem });
  });

/** The fields an agency user may write on a draft or returned claim; nothing else is accepted. */
export const claimDraftSchema = z.strictObject({
  serial: line(60, 'The serial number').optional(),
  complaint: prose(4000, 'The complaint').optional(),
  cause: prose(4000, 'The cause').optional(),
  correction: prose(4000, 'The correction').optional(),
  failureDate: isoDate.nullable().optional(),
  repairDate: isoDate.nullable().optional(),
  preAuthorization: line(60, 'The pre-authorisation number').nullable().optional(),
  laborLines: z.array(laborLineInputSchema).max(20).optional(),
  travel: travelInputSchema.nullable().optional(),
  partLines: z.array(partLineInputSchema).max(40).optional(),
  readings: z.array(readingInputSchema).max(60).optional(),
});
export type ClaimDraftInput = z.infer<typeof claimDraftSchema>;

export const createClaimSchema = claimDraftSchema.extend({ serial: oneLine({ max: 60, label: 'The serial number', required: 'Enter the serial number.' }) });

/** Claim PATCH carries the version the user saw, so a stale edit answers 409. */
export const updateClaimSchema = claimDraftSchema.extend({ version: z.number().int().min(1) });

/** "submitted,in_review" -> ['submitted', 'in_review'] */
const stateList = z
  .string()
  .max(200)
  .transform((s, ctx) => {
    const list = [...new Set(s.split(',').map((x) => x.trim()).filter(Boolean))];
    const unknown = list.filter((x) => !(claimStates as readonly string[]).includes(x));
    if (list.length === 0 || unknown.length > 0) {
      ctx.addIssue({ code: 'custom', message: `Use claim states separated by commas: ${claimStates.join(', ')}.` });
      return z.NEVER;
    }
    return list as ClaimState[];
  });
const cents = z.coerce.number('Give the amount in cents.').int('Give the amount in whole cents.').min(0).max(1_000_000_000);

export const claimListQuerySchema = z.object({
  state: z.enum(claimStates).optional(),
  /** Several states at once (the review queue: submitted and in review). */
  states: stateList.optional(),
  /** Claims carrying this flag. */
  flag: z.enum(FLAG_CODES, 'Unknown flag.').optional(),
  /** Claims of units of this model (model id). */
  model: z.string().max(64).optional(),
  /** Claimed total within [minCents, maxCents]. */
  minCents: cents.optional(),
  maxCents: cents.optional(),
  agency: z.string().max(64).optional(),
  q: z.string().trim().max(80).optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
  cursor: z.string().max(200).optional(),
  limit: z.coerce.number().int().min(1).max(100).default(50),
  sort: z.enum(['createdAt', 'submittedAt', 'repairDate', 'number', 'claimedTotalCents', 'state']).default('createdAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
});
export type ClaimListQuery = z.infer<typeof claimListQuerySchema>;

export interface ClaimListItem {
  id: string;
  number: string;
  state: ClaimState;
  agencyId: string;
  agencyName: string;
  technicianId: string;
  technicianName: string;
  serial: string | null;
  modelNumber: string | null;
  siteName: string | null;
  failureDate: string | null;
  repairDate: string | null;
  submittedAt: string | null;
  createdAt: string;
  claimedTotalCents: number;
  approvedTotalCents: number | null;
  currency: string;
  flags: string[];
  /** Who took the claim for review (start review), if anyone has. */
  reviewerName?: string | null;
  /**
   * On drafts listed on the home page: the filing window on the agency's today, from the
   * contract terms in force on the repair date; null when the repair date or terms are missing.
   */
  filing?: { lastDay: string; daysLeft: number; late: boolean } | null;
}

export interface ClaimDetail extends ClaimListItem {
  version: number;
  complaint: string;
  cause: string;
  correction: string;
  preAuthorization: string | null;
  resubmissionCount: number;
  firstSubmittedAt: string | null;
  decidedAt: string | null;
  paidAt: string | null;
  /** Who holds the review now: the reviewer who started it or last took it over. */
  reviewerName: string | null;
  /** The reviewer who approved or denied the claim, from the claim's events. */
  decidedByName?: string | null;
  /** An approval above the first reviewer's limit, waiting for a second reviewer to confirm it. */
  firstApproval?: null | { byName: string; byYou: boolean; at: string; approvedTotalCents: number };
  /** True when the claim is in review with the signed-in reviewer. */
  heldByYou?: boolean;
  /** True when the signed-in reviewer may take the review over from another reviewer. */
  canTakeOver?: boolean;
  unit: null | {
    id: string;
    serial: string;
    revision: string;
    shipDate: string;
    installDate: string | null;
    model: { id: string; modelNumber: string; name: string; familyId: string; familyName: string };
    /** The unit's warranty terms (in force on its ship or registration date). */
    terms: UnitTerms;
  };
  site: null | { id: string; name: string; addressLine: string; city: string; region: string; postalCode: string; latitude: number; longitude: number };
  laborLines: Array<{ id: string; position: number; repairCodeId: string; repairCode: string; description: string; allowedHours: number; hoursWorked: number; overtime: boolean; note: string; approvedHours: number | null; adjustmentReason: string | null; approvedAmountCents: number | null }>;
  travel: null | { roundTripMiles: number; travelHours: number; approvedAmountCents: number | null; adjustmentReason: string | null };
  partLines: Array<{ id: string; position: number; partId: string; partNumber: string; description: string; listPriceCents: number; returnRequired: boolean; quantity: number; approvedQuantity: number | null; approvedAmountCents: number | null; adjustmentReason: string | null; returnStatus: string; carrier: string | null; trackingNumber: string | null; receivedCondition: string | null }>;
  readings: Array<{ id: string; key: string; phase: 'before' | 'after'; value: number; unit: string }>;
  attachments: Array<{ id: string; role: AttachmentRole; originalName: string; contentType: string; sizeBytes: number; createdAt: string; hasThumbnail: boolean; retractedAt?: string | null; retractionReason?: string | null }>;
  events: Array<{ id: string; type: string; fromState: string | null; toState: string | null; reason: string | null; comment: string | null; at: string; actorName: string | null }>;
  comments: Array<{ id: string; body: string; createdAt: string; authorName: string; authorOrganisation: string }>;
  /** Moves the workflow allows from this state AND this user's abilities allow. */
  allowedActions: string[];
}

/** GET /api/claims/:id/valuation-input: what the live preview computes over, from the stored claim. */
export interface ClaimValuationBasis {
  claimId: string;
  version: number;
  /** Null while the claim cannot be valued (no unit, no dates, no contract terms on the repair date). */
  input: ValuationInput | null;
  problems: Array<{ path: string; message: string }>;
}
