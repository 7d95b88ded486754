import { describe, expect, it } from 'vitest';
import { subject } from '@casl/ability';
import { defineAbilityFor, type SessionUser, type ClaimAction } from '../permissions/ability';
import { claimStates, type ClaimState } from '../schemas/claim';
import { allowedEvents, actionToEvent, claimActions, nextState, eventsFromState, type ClaimEvent, type ClaimFacts } from './claim-machine';
import { reasonCodesFor, isReasonFor } from './reason-codes';

const agencyA = 'org-agency-a';
const agencyB = 'org-agency-b';
const maker = 'org-maker';

const user = (id: string, role: SessionUser['role'], organisationId: string): SessionUser => ({
  id,
  role,
  organisationId,
  organisationKind: organisationId === maker ? 'manufacturer' : 'agency',
  name: id,
  email: `${id}@example.test`,
});

/** Every principal, seen from one claim of agency A filed by technician "tech-a1". */
const principals = {
  ownTechnician: user('tech-a1', 'technician', agencyA),
  otherTechnician: user('tech-a2', 'technician', agencyA),
  ownAgencyAdmin: user('admin-a', 'agency_admin', agencyA),
  otherAgencyTechnician: user('tech-b1', 'technician', agencyB),
  otherAgencyAdmin: user('admin-b', 'agency_admin', agencyB),
  reviewer: user('rev', 'reviewer', maker),
  accountant: user('acct', 'accountant', maker),
  manufacturerAdmin: user('madmin', 'manufacturer_admin', maker),
} as const;
type Principal = keyof typeof principals;

const ok: ClaimFacts = { validation: { ok: true, problems: [] }, undecidedLines: [] };

/** Complete payloads, so the table asks only "state x move x who". */
function fullEvent(action: ClaimAction): ClaimEvent {
  switch (action) {
    case 'return':
      return { type: 'RETURN', reason: 'missing_evidence', comment: 'Serial plate photo is blurred.' };
    case 'deny':
      return { type: 'DENY', reason: 'outside_coverage', comment: 'Labor term ended before the failure.' };
    case 'pay':
      return { type: 'PAY', fromPaymentRun: true };
    default:
      return { type: actionToEvent[action] } as ClaimEvent;
  }
}

/**
 * Written out by hand from the workflow and the role table: the only (state, move, who)
 * combinations that may happen. Everything else must be refused.
 */
const allowed = new Set<string>([
  'draft:submit:ownTechnician',
  'draft:submit:ownAgencyAdmin',
  'draft:withdraw:ownTechnician',
  'draft:withdraw:ownAgencyAdmin',
  'returned:submit:ownTechnician',
  'returned:submit:ownAgencyAdmin',
  'returned:withdraw:ownTechnician',
  'returned:withdraw:ownAgencyAdmin',
  'submitted:start_review:reviewer',
  'in_review:return:reviewer',
  'in_review:deny:reviewer',
  'in_review:approve:reviewer',
  'approved:pay:accountant',
]);

const expectedNext: Partial<Record<`${ClaimState}:${ClaimAction}`, ClaimState>> = {
  'draft:submit': 'submitted',
  'draft:withdraw': 'withdrawn',
  'returned:submit': 'submitted',
  'returned:withdraw': 'withdrawn',
  'submitted:start_review': 'in_review',
  'in_review:return': 'returned',
  'in_review:deny': 'denied',
  'in_review:approve': 'approved',
  'approved:pay': 'paid',
};

describe('claim workflow: every state x move x role', () => {
  const rows: Array<[ClaimState, ClaimAction, Principal]> = [];
  for (const s of claimStates) for (const a of claimActions) for (const p of Object.keys(principals) as Principal[]) rows.push([s, a, p]);

  it('covers 8 states x 7 moves x 8 principals', () => {
    expect(rows.length).toBe(8 * 7 * 8);
  });

  it.each(rows)('%s --%s--> by %s', (state, action, who) => {
    const claim = { id: 'c1', agencyId: agencyA, technicianId: 'tech-a1', state };
    const ability = defineAbilityFor(principals[who]);
    const machineSays = nextState(state, fullEvent(action), ok);
    const roleSays = ability.can(action, subject('Claim', { ...claim }));
    const key = `${state}:${action}:${who}`;
    expect(machineSays !== null && roleSays).toBe(allowed.has(key));
    expect(machineSays).toBe(expectedNext[`${state}:${action}`] ?? null);
  });
});

describe('claim machine guards', () => {
  it('refuses submit while validation fails, from draft and from returned', () => {
    const bad: ClaimFacts = { validation: { ok: false, problems: [{ path: 'serial', code: 'unit_missing', message: 'x' }] }, undecidedLines: [] };
    expect(nextState('draft', { type: 'SUBMIT' }, bad)).toBeNull();
    expect(nextState('returned', { type: 'SUBMIT' }, bad)).toBeNull();
    expect(allowedEvents('draft', bad)).toEqual(['withdraw']);
    expect(nextState('returned', { type: 'SUBMIT' }, ok)).toBe('submitted');
  });

  it('return and deny need a reason of their own list and a non-empty comment', () => {
    expect(nextState('in_review', { type: 'RETURN' }, ok)).toBeNull();
    expect(nextState('in_review', { type: 'RETURN', reason: 'missing_evidence' }, ok)).toBeNull();
    expect(nextState('in_review', { type: 'RETURN', reason: 'missing_evidence', comment: '   ' }, ok)).toBeNull();
    expect(nextState('in_review', { type: 'RETURN', reason: 'not-a-code', comment: 'why' }, ok)).toBeNull();
    // a denial-only reason cannot send a claim back, and the reverse
    expect(nextState('in_review', { type: 'RETURN', reason: 'outside_coverage', comment: 'why' }, ok)).toBeNull();
    expect(nextState('in_review', { type: 'DENY', reason: 'missing_evidence', comment: 'why' }, ok)).toBeNull();
    expect(nextState('in_review', { type: 'DENY', reason: 'duplicate_claim', comment: 'Same visit as another claim.' }, ok)).toBe('denied');
    expect(nextState('in_review', { type: 'RETURN', reason: 'other', comment: 'Please add the invoice.' }, ok)).toBe('returned');
  });

  it('every reason code belongs to at least one move and the lists differ', () => {
    const r = reasonCodesFor('return');
    const d = reasonCodesFor('deny');
    expect(r.length).toBeGreaterThan(2);
    expect(d.length).toBeGreaterThan(2);
    expect(r).not.toEqual(d);
    expect(isReasonFor('deny', 'filed_late')).toBe(true);
    expect(isReasonFor('return', 'filed_late')).toBe(false);
  });

  it('approve needs every line decided', () => {
    const undecided: ClaimFacts = { ...ok, undecidedLines: ['laborLines.0'] };
    expect(nextState('in_review', { type: 'APPROVE' }, undecided)).toBeNull();
    expect(allowedEvents('in_review', undecided)).toEqual(['return', 'deny']);
    expect(nextState('in_review', { type: 'APPROVE' }, ok)).toBe('approved');
  });

  it('pay happens only from a payment run and is never offered as a page action', () => {
    expect(nextState('approved', { type: 'PAY' }, ok)).toBeNull();
    expect(nextState('approved', { type: 'PAY', fromPaymentRun: false }, ok)).toBeNull();
    expect(nextState('approved', { type: 'PAY', fromPaymentRun: true }, ok)).toBe('paid');
    expect(allowedEvents('approved', ok)).toEqual([]);
    expect(allowedEvents('approved', ok, { fromPaymentRun: true })).toEqual(['pay']);
  });

  it('final states allow nothing', () => {
    for (const s of ['denied', 'paid', 'withdrawn'] as const) {
      expect(eventsFromState(s)).toEqual([]);
      expect(allowedEvents(s, ok, { fromPaymentRun: true })).toEqual([]);
    }
  });

  it('a replayed move is refused: the target state does not accept the same event again', () => {
    for (const [key, to] of Object.entries(expectedNext)) {
      const action = key.split(':')[1] as ClaimAction;
      expect(nextState(to as ClaimState, fullEvent(action), ok)).toBeNull();
    }
  });
});
