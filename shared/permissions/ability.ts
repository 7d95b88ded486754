import { AbilityBuilder, createMongoAbility, type MongoAbility, type RawRuleOf } from '@casl/ability';

export const roles = ['technician', 'agency_admin', 'reviewer', 'accountant', 'manufacturer_admin'] as const;
export type Role = (typeof roles)[number];
export const agencyRoles: readonly Role[] = ['technician', 'agency_admin'];
export const manufacturerRoles: readonly Role[] = ['reviewer', 'accountant', 'manufacturer_admin'];

export const roleLabels: Record<Role, string> = {
  technician: 'Technician',
  agency_admin: 'Agency admin',
  reviewer: 'Warranty reviewer',
  accountant: 'Accountant',
  manufacturer_admin: 'Manufacturer admin',
};

/** The workflow events double as CASL actions, so "may this user do this move" is one check. */
export type ClaimAction = 'submit' | 'start_review' | 'return' | 'deny' | 'approve' | 'pay' | 'withdraw';
export type Action = 'manage' | 'read' | 'create' | 'update' | 'delete' | 'comment' | 'adjust' | 'upload' | 'export' | 'invite' | ClaimAction;
export type Subject =
  | 'all'
  | 'Claim'
  | 'Attachment'
  | 'User'
  | 'Invitation'
  | 'Certification'
  | 'PaymentRun'
  | 'PaidClaimsExport'
  | 'Catalog'
  | 'Unit'
  | 'Agency'
  | 'ContractTerms'
  | 'Mailbox';

export type AppAbility = MongoAbility<[Action, Subject | object]>;
export type AppRule = RawRuleOf<AppAbility>;

export interface SessionUser {
  id: string;
  organisationId: string;
  organisationKind: 'manufacturer' | 'agency';
  role: Role;
  name: string;
  email: string;
}

const editable = { $in: ['draft', 'returned'] };
/** What the manufacturer's reviewers see: every claim once it has been filed. */
export const reviewerVisibleStates = ['submitted', 'in_review', 'returned', 'approved', 'denied', 'paid'] as const;
export const accountantVisibleStates = ['approved', 'paid'] as const;

/** Deny by default: each role gets only what it is listed for. */
export function defineAbilityFor(user: SessionUser): AppAbility {
  const { can, build } = new AbilityBuilder<AppAbility>(createMongoAbility);
  const org = user.organisationId;

  switch (user.role) {
    case 'technician': {
      const own = { agencyId: org, technicianId: user.id };
      can('create', 'Claim', { agencyId: org });
      can('read', 'Claim', own);
      can(['update', 'submit', 'withdraw', 'upload'], 'Claim', { ...own, state: editable });
      can('comment', 'Claim', { ...own, state: { $ne: 'withdrawn' } });
      // The claim's own read check (own claims) applies too, so this also covers evidence an agency admin added.
      can('read', 'Attachment', { organisationId: org });
      can('read', ['Catalog', 'Unit']);
      can('read', 'User', { organisationId: org, id: user.id });
      can('read', 'Certification', { organisationId: org, userId: user.id });
      break;
    }
    case 'agency_admin': {
      can(['create', 'read'], 'Claim', { agencyId: org });
      can(['update', 'submit', 'withdraw', 'upload'], 'Claim', { agencyId: org, state: editable });
      can('comment', 'Claim', { agencyId: org, state: { $ne: 'withdrawn' } });
      can('update', 'Claim', { agencyId: org, state: 'approved' }); // part-return tracking
      can('read', 'Attachment', { organisationId: org });
      can('read', ['Catalog', 'Unit']);
      can(['read', 'create', 'update'], 'User', { organisationId: org });
      can(['read', 'create', 'update', 'delete'], 'Invitation', { organisationId: org });
      can('invite', 'User', { organisationId: org });
      can(['read', 'create', 'update', 'delete'], 'Certification', { organisationId: org });
      can('read', 'PaymentRun', { agencyId: org });
      can('export', 'PaidClaimsExport', { agencyId: org });
      can(['read', 'update'], 'Agency', { id: org });
      break;
    }
    case 'reviewer': {
      can('read', 'Claim', { state: { $in: [...reviewerVisibleStates] } });
      can('start_review', 'Claim', { state: 'submitted' });
      can(['return', 'deny', 'approve', 'adjust'], 'Claim', { state: 'in_review' });
      can('comment', 'Claim', { state: { $in: ['submitted', 'in_review', 'returned', 'approved', 'denied'] } });
      can('update', 'Claim', { state: 'approved' }); // record a part received, waive a return
      can('read', 'Attachment');
      can('read', ['Catalog', 'Unit']);
      can('read', 'Agency');
      break;
    }
    case 'accountant': {
      can('read', 'Claim', { state: { $in: [...accountantVisibleStates] } });
      can('pay', 'Claim', { state: 'approved' });
      can(['read', 'create', 'update'], 'PaymentRun');
      can('export', 'PaidClaimsExport');
      can('read', 'Catalog');
      can('read', 'Agency');
      break;
    }
    case 'manufacturer_admin': {
      can('manage', ['Catalog', 'Agency', 'ContractTerms']);
      can('read', 'Unit');
      can(['read', 'create', 'update'], 'User', { organisationId: org });
      can('invite', 'User');
      // Invitations to the manufacturer itself, and the first admin of each agency it creates.
      can(['read', 'create', 'update', 'delete'], 'Invitation', { organisationId: org });
      can(['read', 'create', 'update', 'delete'], 'Invitation', { role: 'agency_admin' });
      break;
    }
  }
  return build();
}

/** Rebuilds the ability on the client from the packed rules that /api/auth/me returns. */
export function abilityFromRules(rules: AppRule[]): AppAbility {
  return createMongoAbility<AppAbility>(rules);
}
