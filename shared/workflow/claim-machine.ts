/**
 * The claim workflow as one xstate 5 machine. The server is the authority: it resolves the
 * stored state with the claim's facts as context, asks the machine whether an event may happen
 * and applies the move itself in one transaction. Guards are pure; the machine has no actions.
 *
 *   draft --submit--> submitted --start review--> in review --approve--> approved --pay--> paid
 *   draft/returned --withdraw--> withdrawn; in review --return--> returned --submit--> submitted
 *   in review --deny--> denied
 */
import { setup, transition, getNextTransitions, type SnapshotFrom } from 'xstate';
import { claimStates, type ClaimState } from '../schemas/claim';
import type { ClaimAction } from '../permissions/ability';
import { isReasonFor } from './reason-codes';
import type { SubmitValidation } from './submit-validation';

export type ClaimEventType = 'SUBMIT' | 'START_REVIEW' | 'RETURN' | 'DENY' | 'APPROVE' | 'PAY' | 'WITHDRAW';

export type ClaimEvent =
  | { type: 'SUBMIT' }
  | { type: 'START_REVIEW' }
  | { type: 'RETURN'; reason?: string | null; comment?: string | null }
  | { type: 'DENY'; reason?: string | null; comment?: string | null }
  | { type: 'APPROVE' }
  | { type: 'PAY'; fromPaymentRun?: boolean }
  | { type: 'WITHDRAW' };

/**
 * What the guards look at besides the event's own payload.
 * - validation: the result of validateForSubmit for the claim as stored now.
 * - undecidedLines: paths of lines that have no decided amount. A line is decided when the
 *   valuation computed an amount for it (accepted as is) or a reviewer adjusted it with both a
 *   value and a reason; it is undecided when its amount cannot be computed (e.g. no contract
 *   terms in force on the repair date) or an adjustment is half made.
 */
export interface ClaimFacts {
  validation: SubmitValidation;
  undecidedLines: string[];
}

export const emptyFacts: ClaimFacts = { validation: { ok: false, problems: [] }, undecidedLines: [] };

export const eventToAction: Record<ClaimEventType, ClaimAction> = {
  SUBMIT: 'submit',
  START_REVIEW: 'start_review',
  RETURN: 'return',
  DENY: 'deny',
  APPROVE: 'approve',
  PAY: 'pay',
  WITHDRAW: 'withdraw',
};
export const actionToEvent: Record<ClaimAction, ClaimEventType> = {
  submit: 'SUBMIT',
  start_review: 'START_REVIEW',
  return: 'RETURN',
  deny: 'DENY',
  approve: 'APPROVE',
  pay: 'PAY',
  withdraw: 'WITHDRAW',
};
export const claimActions = Object.keys(actionToEvent) as ClaimAction[];
export const claimEventTypes = Object.keys(eventToAction) as ClaimEventType[];

export const claimActionLabels: Record<ClaimAction, string> = {
  submit: 'Submit',
  start_review: 'Start review',
  return: 'Return to agency',
  deny: 'Deny',
  approve: 'Approve',
  pay: 'Pay',
  withdraw: 'Withdraw',
};

function hasText(s: unknown): boolean {
  return typeof s === 'string' && s.trim() !== '';
}

export const claimMachine = setup({
  types: {
    context: {} as ClaimFacts,
    events: {} as ClaimEvent,
    input: {} as ClaimFacts | undefined,
  },
  guards: {
    passesValidation: ({ context }) => context.validation.ok === true,
    hasReturnReason: ({ event }) => event.type === 'RETURN' && isReasonFor('return', event.reason) && hasText(event.comment),
    hasDenyReason: ({ event }) => event.type === 'DENY' && isReasonFor('deny', event.reason) && hasText(event.comment),
    everyLineDecided: ({ context }) => context.undecidedLines.length === 0,
    fromPaymentRun: ({ event }) => event.type === 'PAY' && event.fromPaymentRun === true,
  },
}).createMachine({
  id: 'claim',
  initial: 'draft',
  context: ({ input }) => input ?? emptyFacts,
  states: {
    draft: {
      on: {
        SUBMIT: { target: 'submitted', guard: 'passesValidation' },
        WITHDRAW: { target: 'withdrawn' },
      },
    },
    submitted: {
      on: { START_REVIEW: { target: 'in_review' } },
    },
    in_review: {
      on: {
        RETURN: { target: 'returned', guard: 'hasReturnReason' },
        DENY: { target: 'denied', guard: 'hasDenyReason' },
        APPROVE: { target: 'approved', guard: 'everyLineDecided' },
      },
    },
    returned: {
      on: {
        SUBMIT: { target: 'submitted', guard: 'passesValidation' },
        WITHDRAW: { target: 'withdrawn' },
      },
    },
    approved: {
      on: { PAY: { target: 'paid', guard: 'fromPaymentRun' } },
    },
    denied: { type: 'final' },
    paid: { type: 'final' },
    withdrawn: { type: 'final' },
  },
});

export type ClaimSnapshot = SnapshotFrom<typeof claimMachine>;

/** The stored state with the claim's facts, as a machine snapshot (no actor is started). */
export function resolveClaim(state: ClaimState, facts: ClaimFacts = emptyFacts): ClaimSnapshot {
  return claimMachine.resolveState({ value: state, context: facts });
}

/** Events the state has a transition for, whatever their guards say. */
export function eventsFromState(state: ClaimState): ClaimEventType[] {
  const snap = resolveClaim(state);
  const types = new Set(getNextTransitions(snap).map((t) => t.eventType as ClaimEventType));
  return claimEventTypes.filter((e) => types.has(e));
}

/** The states from which the event has a transition (whatever its guards say). */
export function statesAllowing(type: ClaimEventType): ClaimState[] {
  return claimStates.filter((s) => eventsFromState(s).includes(type));
}

/**
 * Payloads used to ask whether an event is possible before the user has filled them in: a
 * return or denial is possible when the user will give a reason and comment. Payment is only
 * possible through a payment run, so it is never offered as a claim-page action.
 */
function probe(type: ClaimEventType, opts: { fromPaymentRun?: boolean }): ClaimEvent {
  switch (type) {
    case 'RETURN':
      return { type, reason: 'other', comment: 'probe' };
    case 'DENY':
      return { type, reason: 'other', comment: 'probe' };
    case 'PAY':
      return { type, fromPaymentRun: opts.fromPaymentRun === true };
    default:
      return { type } as ClaimEvent;
  }
}

/** The events the machine allows now, given the claim's facts (as CASL action names). */
export function allowedEvents(state: ClaimState, facts: ClaimFacts, opts: { fromPaymentRun?: boolean } = {}): ClaimAction[] {
  const snap = resolveClaim(state, facts);
  return eventsFromState(state)
    .filter((type) => snap.can(probe(type, opts)))
    .map((type) => eventToAction[type]);
}

/** The state the event leads to, or null when the machine refuses it (pure `transition`). */
export function nextState(state: ClaimState, event: ClaimEvent, facts: ClaimFacts = emptyFacts): ClaimState | null {
  if (!eventsFromState(state).includes(event.type)) return null;
  const snap = resolveClaim(state, facts);
  const [next] = transition(claimMachine, snap, event);
  const value = next.value as ClaimState;
  return value === state ? null : value;
}

/** Where a claim may be edited by its agency. */
export const editableStates: readonly ClaimState[] = ['draft', 'returned'];
export const isEditable = (state: ClaimState): boolean => editableStates.includes(state);
