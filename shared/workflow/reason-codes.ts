/**
 * Why a reviewer sends a claim back or turns it down, or approves a line above what the agency
 * entered. Fieldproof's own short list, in plain English. A return asks the agency to fix
 * something and resubmit; a denial is final; a raise lifts a line above the agency's entry.
 */
export type ReasonMove = 'return' | 'deny' | 'raise';

export interface ReasonCodeInfo {
  label: string;
  hint: string;
  moves: readonly ReasonMove[];
}

export const REASON_CODES = {
  missing_evidence: {
    label: 'Evidence missing or unreadable',
    hint: 'A required photo or document is missing, blurred or shows something else.',
    moves: ['return'],
  },
  incomplete_information: {
    label: 'Information incomplete',
    hint: 'Complaint, cause or correction, dates or the unit need more detail.',
    moves: ['return'],
  },
  readings_missing: {
    label: 'Readings missing or out of tolerance',
    hint: 'Before or after readings are missing, or the after-repair reading is outside the specification.',
    moves: ['return'],
  },
  labor_over_guide: {
    label: 'Labor over the time guide',
    hint: 'Hours claimed exceed the allowance without an explanation the reviewer can accept.',
    moves: ['return'],
  },
  wrong_repair_code: {
    label: 'Repair code does not match the work',
    hint: 'The repair codes chosen do not describe the correction written.',
    moves: ['return'],
  },
  parts_not_supported: {
    label: 'Parts not supported by the diagnosis',
    hint: 'A replaced part does not follow from the cause described.',
    moves: ['return', 'deny'],
  },
  outside_coverage: {
    label: 'Outside coverage',
    hint: 'The unit was not covered for these parts or this labor on the failure date.',
    moves: ['deny'],
  },
  filed_late: {
    label: 'Filed after the filing window',
    hint: 'The claim arrived after the window counted from the repair date.',
    moves: ['deny'],
  },
  not_a_warranty_failure: {
    label: 'Not a warranty failure',
    hint: 'Misuse, damage, installation, cleaning or normal wear rather than a defect.',
    moves: ['deny'],
  },
  duplicate_claim: {
    label: 'Duplicate of another claim',
    hint: 'The same visit or repair was already claimed.',
    moves: ['deny'],
  },
  entered_below_allowance: {
    label: 'Entered below the allowance',
    hint: 'The agency entered less time or fewer parts than the repair needed and the allowance pays.',
    moves: ['raise'],
  },
  work_shown_in_evidence: {
    label: 'More work shown in the evidence',
    hint: 'Photos, readings or the invoice show work the agency left off the line.',
    moves: ['raise'],
  },
  corrected_at_agency_request: {
    label: 'Corrected at the agency’s request',
    hint: 'The agency asked in a comment for the entry to be corrected upwards.',
    moves: ['raise'],
  },
  other: {
    label: 'Other (see comment)',
    hint: 'Explain in the comment.',
    moves: ['return', 'deny'],
  },
} as const satisfies Record<string, ReasonCodeInfo>;

export type ReasonCode = keyof typeof REASON_CODES;
export const reasonCodes = Object.keys(REASON_CODES) as ReasonCode[];

export function isReasonCode(code: unknown): code is ReasonCode {
  return typeof code === 'string' && Object.prototype.hasOwnProperty.call(REASON_CODES, code);
}

/** The codes a reviewer may pick for one move, in list order. */
export function reasonCodesFor(move: ReasonMove): ReasonCode[] {
  return reasonCodes.filter((c) => (REASON_CODES[c].moves as readonly ReasonMove[]).includes(move));
}

export function isReasonFor(move: ReasonMove, code: unknown): code is ReasonCode {
  return isReasonCode(code) && (REASON_CODES[code].moves as readonly ReasonMove[]).includes(move);
}

export function reasonLabel(code: string | null | undefined): string {
  if (!code) return '';
  return isReasonCode(code) ? REASON_CODES[code].label : code;
}
