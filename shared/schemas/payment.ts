import { z } from 'zod';
import { rangeOrder } from './messages';
import { multiLine, oneLine } from './text';
import { businessDay } from '../calculations/business-day';
import { addDays } from '../calculations/dates';

/**
 * Contracts of payment runs, part returns and the paid-claims export. Money is integer cents;
 * calendar dates are YYYY-MM-DD; timestamps are UTC ISO strings.
 */

const isoDate = z.iso.date('Use a date as YYYY-MM-DD, like 2026-03-31.');
const id = z.string().trim().min(1, 'Required.').max(64, 'Not a valid id.');
/** One line of plain text: NFC, trimmed, no control, text-direction or invisible characters (./text.ts). */
const line = (label: string, max: number) => oneLine({ max, label: `The ${label}`, required: `Enter the ${label}.` });

// ---- part returns ------------------------------------------------------------------------

/** A required return is overdue when it is not settled this many days after the claim's approval. */
export const PART_RETURN_OVERDUE_DAYS = 30;

export const partReturnStatuses = ['not_required', 'awaiting', 'shipped', 'received', 'waived'] as const;
export type PartReturnStatus = (typeof partReturnStatuses)[number];
export const receivedConditions = ['failure_confirmed', 'no_fault_found', 'not_returned'] as const;
export type ReceivedCondition = (typeof receivedConditions)[number];

export const partReturnStatusLabels: Record<PartReturnStatus, string> = {
  not_required: 'No return needed',
  awaiting: 'Awaiting shipment',
  shipped: 'Shipped',
  received: 'Received',
  waived: 'Waived',
};
export const receivedConditionLabels: Record<ReceivedCondition, string> = {
  failure_confirmed: 'Failure confirmed',
  no_fault_found: 'No fault found',
  not_returned: 'Part not in the shipment',
};

export const shipmentSchema = z.strictObject({
  carrier: line('carrier', 60),
  trackingNumber: line('tracking number', 60),
});
export type ShipmentInput = z.infer<typeof shipmentSchema>;

export const receiptSchema = z.strictObject({
  condition: z.enum(receivedConditions, 'Choose the condition the part arrived in.'),
});
export type ReceiptInput = z.infer<typeof receiptSchema>;

export const waiverSchema = z.strictObject({
  reason: multiLine({ max: 500, min: 3, label: 'The reason', required: 'Give a reason for waiving the return.' }),
});
export type WaiverInput = z.infer<typeof waiverSchema>;

export type PartReturnAction = 'ship' | 'receive' | 'waive';

export interface PartReturnLine {
  id: string;
  position: number;
  partNumber: string;
  description: string;
  quantity: number;
  returnRequired: boolean;
  status: PartReturnStatus;
  carrier: string | null;
  trackingNumber: string | null;
  shippedAt: string | null;
  receivedAt: string | null;
  receivedCondition: ReceivedCondition | null;
  waiveReason: string | null;
  /** Settled: received in a condition other than "not in the shipment", or waived (or no return needed). */
  settled: boolean;
  /** Not settled, and the claim was approved more than PART_RETURN_OVERDUE_DAYS days ago. */
  overdue: boolean;
  /** What this user may do on this line now. */
  allowedActions: PartReturnAction[];
}

export interface PartReturnsResponse {
  claimId: string;
  claimState: string;
  version: number;
  decidedAt: string | null;
  /** Approved, and every required return settled. */
  returnsSettled: boolean;
  /** The day a still-open required return becomes overdue (approval date + window), when approved. */
  dueDate: string | null;
  overdueDays: number;
  lines: PartReturnLine[];
}

// ---- payment runs ------------------------------------------------------------------------

export const paymentRunStates = ['open', 'paid', 'void'] as const;
export type PaymentRunState = (typeof paymentRunStates)[number];
export const paymentRunStateLabels: Record<PaymentRunState, string> = { open: 'Open', paid: 'Paid', void: 'Voided' };

export const createPaymentRunSchema = z.strictObject({
  agencyId: id,
  claimIds: z
    .array(id, 'Choose the claims to pay.')
    .min(1, 'Choose at least one claim.')
    .max(500, 'At most 500 claims in one run.')
    .refine((ids) => new Set(ids).size === ids.length, 'A claim is listed twice.'),
});
export type CreatePaymentRunInput = z.infer<typeof createPaymentRunSchema>;

export const markPaidSchema = z.strictObject({
  paymentDate: isoDate,
  reference: line('bank or check reference', 80),
});
export type MarkPaidInput = z.infer<typeof markPaidSchema>;

/**
 * A payment date may lie at most this many days after today (the paying organisation's
 * business day): one day, so a transfer sent late in the evening may carry the next day's
 * value date, and an agency in a zone ahead of the manufacturer's is not refused its own today.
 */
export const PAYMENT_DATE_FUTURE_DAYS = 1;

/**
 * The payment dates a run accepts, inclusive: from the business day the run was created to
 * today + PAYMENT_DATE_FUTURE_DAYS, both in the paying organisation's time zone.
 */
export function paymentDateBounds(runCreatedAt: string, now: Date, timeZone: string): { from: string; to: string } {
  return { from: businessDay(runCreatedAt, timeZone), to: addDays(businessDay(now, timeZone), PAYMENT_DATE_FUTURE_DAYS) };
}

/** The message naming both bounds, or null when the date lies within them. */
export function paymentDateProblem(paymentDate: string, bounds: { from: string; to: string }): string | null {
  return paymentDate < bounds.from || paymentDate > bounds.to ? `The payment date must be between ${bounds.from} and ${bounds.to}.` : null;
}

export const paymentRunListQuerySchema = z.strictObject({
  state: z.enum(paymentRunStates).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  cursor: z.string().max(200).optional(),
});
export type PaymentRunListQuery = z.infer<typeof paymentRunListQuerySchema>;

export interface ReadyClaim {
  id: string;
  number: string;
  technicianName: string;
  unitSerial: string | null;
  modelNumber: string | null;
  repairDate: string | null;
  decidedAt: string | null;
  approvedLaborCents: number;
  approvedTravelCents: number;
  approvedPartsCents: number;
  approvedTotalCents: number;
  currency: string;
  /** The signed-in accountant approved this claim and so may not pay it. */
  decidedByYou: boolean;
}

export interface ReadyAgencyGroup {
  agencyId: string;
  agencyName: string;
  currency: string;
  claimCount: number;
  totalCents: number;
  /** Approved claims of the agency still waiting for a required part return. */
  heldForReturns: number;
  claims: ReadyClaim[];
}

export interface ReadyToPayResponse {
  agencies: ReadyAgencyGroup[];
  claimCount: number;
}

export type PaymentRunAction = 'mark_paid' | 'void';

export interface PaymentRunSummary {
  id: string;
  number: string;
  agencyId: string;
  agencyName: string;
  state: PaymentRunState;
  totalCents: number;
  currency: string;
  claimCount: number;
  createdAt: string;
  createdByName: string | null;
  paymentDate: string | null;
  reference: string | null;
  paidAt: string | null;
  paidByName: string | null;
  voidedAt: string | null;
}

export interface PaymentRunClaim {
  id: string;
  number: string;
  state: string;
  technicianName: string;
  unitSerial: string | null;
  modelNumber: string | null;
  repairDate: string | null;
  approvedLaborCents: number;
  approvedTravelCents: number;
  approvedPartsCents: number;
  amountCents: number;
  paidAt: string | null;
}

export interface PaymentRunDetail extends PaymentRunSummary {
  claims: PaymentRunClaim[];
  allowedActions: PaymentRunAction[];
}

export interface PaymentRunPage {
  items: PaymentRunSummary[];
  nextCursor: string | null;
}

// ---- paid-claims export ------------------------------------------------------------------

export const paidClaimsExportQuerySchema = z
  .strictObject({
    from: isoDate.optional(),
    to: isoDate.optional(),
    agency: id.optional(),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, rangeOrder('from', 'to', 'start date', 'end date'));
export type PaidClaimsExportQuery = z.infer<typeof paidClaimsExportQuerySchema>;

/** The export's columns, in order: the header row's names and what each holds. */
export const paidClaimsExportColumns = [
  { key: 'claim_number', description: 'Claim number, e.g. FP-2026-000042' },
  { key: 'agency', description: 'Service agency name' },
  { key: 'technician', description: 'Technician who filed the claim' },
  { key: 'unit_serial', description: 'Serial number of the unit repaired' },
  { key: 'model', description: 'Model number of the unit' },
  { key: 'repair_date', description: 'Repair date, YYYY-MM-DD' },
  { key: 'payment_run', description: 'Payment run number, e.g. PR-2026-0007' },
  { key: 'payment_date', description: 'Date paid, YYYY-MM-DD (the run’s payment date)' },
  { key: 'payment_reference', description: 'Bank transfer or check reference of the run' },
  { key: 'approved_labor', description: 'Approved labor, decimal with 2 places' },
  { key: 'approved_travel', description: 'Approved travel, decimal with 2 places' },
  { key: 'approved_parts', description: 'Approved parts, decimal with 2 places' },
  { key: 'approved_total', description: 'Approved total paid for the claim, decimal with 2 places' },
  { key: 'currency', description: 'ISO 4217 currency code' },
] as const;
export type PaidClaimsExportColumn = (typeof paidClaimsExportColumns)[number]['key'];
