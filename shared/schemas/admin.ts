import { z } from 'zod';
import { rangeOrder } from './messages';
import { roles, type Role } from '../permissions/ability';
import { emailSchema, newPasswordSchema } from './user';
import { attachmentRoles, type AttachmentRole } from './claim';
import { oneLine, optionalOneLine } from './text';

/**
 * Contracts for administration: agency users, invitations, certifications, the agency profile,
 * the catalogue, agencies and their contract terms. Money is integer cents; percentages are
 * basis points (1 % = 100 bps); dates are YYYY-MM-DD.
 */

const isoDate = z.iso.date('Use a date as YYYY-MM-DD, like 2026-03-31.');
/** One line of text, NFC, trimmed, without control, text-direction or invisible characters (shared/schemas/text.ts). */
const required = (max: number, message: string, label: string, min = 1) => oneLine({ max, min, label, required: message });
/** A text field that may be left blank: '' is stored as null. */
const optionalText = (max: number, label: string) => optionalOneLine({ max, label });
const optionalOneLineReason = optionalOneLine({ max: 500, label: 'The reason' }).optional();
const id = (message = 'Choose one.') => z.string().min(1, message).max(64);
/** An e-mail that may be left blank: '' is stored as null. */
const optionalEmail = z
  .string()
  .trim()
  .toLowerCase()
  .max(254, 'Keep it under 254 characters.')
  .nullable()
  .transform((v) => (v === '' ? null : v))
  .pipe(z.email('Enter a valid e-mail address.').nullable());

export const INVITATION_TTL_DAYS = 7;
export const CERTIFICATION_WARNING_DAYS = 30;

// ---------------------------------------------------------------------------- users and invitations

export const personNameSchema = required(120, 'Enter a name.', 'Name', 2);

export const inviteBodySchema = z.strictObject({
  email: emailSchema,
  role: z.enum(roles, 'Choose a role.'),
});
export type InviteBody = z.infer<typeof inviteBodySchema>;

export const invitationTokenSchema = z.string().min(10, 'This invitation link is not valid.').max(200, 'This invitation link is not valid.');

export const acceptInvitationSchema = z.strictObject({
  token: invitationTokenSchema,
  name: personNameSchema,
  password: newPasswordSchema,
});
export type AcceptInvitationBody = z.infer<typeof acceptInvitationSchema>;

export const previewInvitationSchema = z.strictObject({ token: invitationTokenSchema });

export const updateUserSchema = z
  .strictObject({
    role: z.enum(roles, 'Choose a role.').optional(),
    active: z.boolean().optional(),
  })
  .refine((v) => v.role !== undefined || v.active !== undefined, { message: 'Change the role or the status.', path: ['role'] });
export type UpdateUserBody = z.infer<typeof updateUserSchema>;

export type CertificationState = 'valid' | 'expiring' | 'expired' | 'not_yet_valid';
export type CertificationSummary = 'none' | 'valid' | 'expiring' | 'expired';

export interface UserCertificationBrief {
  familyId: string;
  familyCode: string;
  familyName: string;
  validTo: string;
  state: CertificationState;
  /** Days from today to the end of validity (negative once expired). */
  daysLeft: number;
}

export interface UserListItem {
  id: string;
  name: string;
  email: string;
  role: Role;
  active: boolean;
  lastSignInAt: string | null;
  createdAt: string;
  certification: { summary: CertificationSummary; families: UserCertificationBrief[] };
}

export interface InvitationListItem {
  id: string;
  email: string;
  role: Role;
  organisationId: string;
  organisationName: string;
  invitedBy: string | null;
  invitedByName: string | null;
  createdAt: string;
  expiresAt: string;
  status: 'pending' | 'expired' | 'accepted' | 'revoked';
}

export interface InvitationPreview {
  email: string;
  role: Role;
  organisationName: string;
  expiresAt: string;
}

// ---------------------------------------------------------------------------- certifications

const certificationFields = {
  userId: id('Choose a technician.'),
  familyId: id('Choose a product family.'),
  certificateNumber: required(60, 'Enter the certificate number.', 'The certificate number'),
  validFrom: isoDate,
  validTo: isoDate,
  /** A PDF already uploaded through the evidence upload path; null when none. */
  attachmentId: z.string().min(1).max(64).nullable().optional(),
};

const validToAfterFrom = (v: { validFrom?: string; validTo?: string }) => !v.validFrom || !v.validTo || v.validTo >= v.validFrom;
const validToMessage = rangeOrder('validFrom', 'validTo', 'start of validity', 'end of validity');

export const createCertificationSchema = z.strictObject(certificationFields).refine(validToAfterFrom, validToMessage);
export type CreateCertificationBody = z.infer<typeof createCertificationSchema>;

export const updateCertificationSchema = z
  .strictObject({
    familyId: certificationFields.familyId.optional(),
    certificateNumber: certificationFields.certificateNumber.optional(),
    validFrom: isoDate.optional(),
    validTo: isoDate.optional(),
    attachmentId: certificationFields.attachmentId,
  })
  .refine(validToAfterFrom, validToMessage);
export type UpdateCertificationBody = z.infer<typeof updateCertificationSchema>;

/** Revoking a certificate needs a reason; it is kept on the certificate and in the audit trail. */
export const revokeCertificationSchema = z.strictObject({
  reason: oneLine({ max: 500, label: 'The reason', required: 'Enter why the certificate is revoked.' }),
});
export type RevokeCertificationBody = z.infer<typeof revokeCertificationSchema>;

export const certificationListQuerySchema = z.object({ userId: z.string().max(64).optional() });

export interface CertificationItem {
  id: string;
  userId: string;
  userName: string;
  familyId: string;
  familyCode: string;
  familyName: string;
  certificateNumber: string;
  validFrom: string;
  validTo: string;
  attachmentId: string | null;
  state: CertificationState;
  daysLeft: number;
  createdAt: string;
  /** Set once revoked: the certificate no longer counts anywhere. */
  revokedAt: string | null;
  revokedByName: string | null;
  revokeReason: string | null;
}

// ---------------------------------------------------------------------------- agency profile and addresses

/** The US time zones agencies are in; any IANA zone is accepted. */
export const commonTimeZones = [
  'America/New_York',
  'America/Chicago',
  'America/Denver',
  'America/Phoenix',
  'America/Los_Angeles',
  'America/Anchorage',
  'Pacific/Honolulu',
] as const;

export function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

export const timeZoneSchema = z.string().trim().min(1, 'Choose a time zone.').max(64).refine(isTimeZone, 'Choose a time zone such as America/Chicago.');

/** US ZIP (12345 or 12345-6789) or Canadian postal code (A1A 1A1). */
export const postalCodeSchema = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^(\d{5}(-\d{4})?|[A-Z]\d[A-Z] ?\d[A-Z]\d)$/, 'Enter a ZIP code like 67202 or a postal code like K1A 0B1.');

export const latitudeSchema = z.number('Enter the latitude as a number.').min(-90, 'Between -90 and 90.').max(90, 'Between -90 and 90.');
export const longitudeSchema = z.number('Enter the longitude as a number.').min(-180, 'Between -180 and 180.').max(180, 'Between -180 and 180.');

const profileFields = {
  name: required(120, 'Enter the agency name.', 'The agency name', 2),
  contactEmail: optionalEmail,
  addressLine: optionalText(200, 'The address'),
  city: optionalText(80, 'The city'),
  region: optionalText(40, 'The state or province'),
  postalCode: postalCodeSchema.nullable(),
  /** Left out or null: filled from the postal code. Given: kept as corrected by hand. */
  latitude: latitudeSchema.nullable(),
  longitude: longitudeSchema.nullable(),
  timeZone: timeZoneSchema,
};

const bothOrNeither = (v: { latitude?: number | null; longitude?: number | null }) =>
  (v.latitude === undefined || v.latitude === null) === (v.longitude === undefined || v.longitude === null);
const bothOrNeitherMessage = { message: 'Give both latitude and longitude, or neither.', path: ['longitude'] };

export const agencyProfileSchema = z.strictObject(profileFields).refine(bothOrNeither, bothOrNeitherMessage);
export const updateAgencyProfileSchema = z.strictObject(profileFields).partial().refine(bothOrNeither, bothOrNeitherMessage);
export type AgencyProfileBody = z.input<typeof agencyProfileSchema>;
export type UpdateAgencyProfileBody = z.infer<typeof updateAgencyProfileSchema>;

export interface AgencyProfile {
  id: string;
  name: string;
  contactEmail: string | null;
  addressLine: string | null;
  city: string | null;
  region: string | null;
  postalCode: string | null;
  country: string;
  latitude: number | null;
  longitude: number | null;
  timeZone: string;
  active: boolean;
  updatedAt: string;
}

export interface PostalCodeLookup {
  postalCode: string;
  city: string;
  region: string;
  country: string;
  latitude: number;
  longitude: number;
}

// ---------------------------------------------------------------------------- catalogue

const catalogCode = (label: string) =>
  z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9-]{1,23}$/, `Use 2 to 24 letters, digits or dashes for the ${label}.`);

const months = (label: string) => z.number(`Enter ${label} as a whole number.`).int('Whole months only.').min(0, 'At least 0.').max(240, 'At most 240 months.');

export const createFamilySchema = z.strictObject({
  code: catalogCode('family code'),
  name: required(80, 'Enter the family name.', 'The family name'),
  fuel: z.enum(['gas', 'electric'], 'Choose gas or electric.'),
});
export const updateFamilySchema = z.strictObject({
  name: required(80, 'Enter the family name.', 'The family name').optional(),
  fuel: z.enum(['gas', 'electric'], 'Choose gas or electric.').optional(),
  active: z.boolean().optional(),
});
export type CreateFamilyBody = z.infer<typeof createFamilySchema>;
export type UpdateFamilyBody = z.infer<typeof updateFamilySchema>;

export const componentTermSchema = z.strictObject({
  partId: id('Choose a part.'),
  label: required(80, 'Name the component.', 'The component name'),
  partsMonths: months('the parts term'),
});

const warrantyTerms = {
  partsMonths: months('the parts term'),
  laborMonths: months('the labor term'),
  capMonthsFromShip: months('the cap from ship date'),
  installGraceDays: z.number('Enter days as a whole number.').int('Whole days only.').min(0, 'At least 0.').max(730, 'At most 730 days.'),
};

const capCoversTerms = (v: { partsMonths?: number; laborMonths?: number; capMonthsFromShip?: number }) =>
  v.capMonthsFromShip === undefined || ((v.partsMonths ?? 0) <= v.capMonthsFromShip && (v.laborMonths ?? 0) <= v.capMonthsFromShip);
const capMessage = { message: 'The cap from the ship date must be at least the parts and labor terms.', path: ['capMonthsFromShip'] };

export const createModelSchema = z
  .strictObject({
    familyId: id('Choose a product family.'),
    modelNumber: catalogCode('model number'),
    name: required(120, 'Enter the model name.', 'The model name'),
    ...warrantyTerms,
    componentTerms: z.array(componentTermSchema).max(20).default([]),
  })
  .refine(capCoversTerms, capMessage);
export const updateModelSchema = z
  .strictObject({
    familyId: id('Choose a product family.').optional(),
    name: required(120, 'Enter the model name.', 'The model name').optional(),
    partsMonths: warrantyTerms.partsMonths.optional(),
    laborMonths: warrantyTerms.laborMonths.optional(),
    capMonthsFromShip: warrantyTerms.capMonthsFromShip.optional(),
    installGraceDays: warrantyTerms.installGraceDays.optional(),
    active: z.boolean().optional(),
    /** Replaces the model's parts-only component terms as a whole. */
    componentTerms: z.array(componentTermSchema).max(20).optional(),
    /** The first ship (or registration) date the new warranty terms apply to; defaults to today. */
    termsEffectiveFrom: isoDate.optional(),
    /** Required when a change takes effect in the past. */
    reason: optionalOneLineReason,
  })
  .refine(capCoversTerms, capMessage);
export type CreateModelBody = z.input<typeof createModelSchema>;
export type UpdateModelBody = z.infer<typeof updateModelSchema>;

export const readingUnits = ['F', 'C', 'in', 'mm', 'A', 'V'] as const;
export const readingPhases = ['before', 'after', 'both'] as const;

const readingSpecFields = {
  key: z
    .string()
    .trim()
    .regex(/^[a-z][a-z0-9_]{1,39}$/, 'Use 2 to 40 lower-case letters, digits or underscores, starting with a letter.'),
  label: required(120, 'Name the reading.', 'The reading name'),
  unit: z.enum(readingUnits, 'Choose a unit.'),
  nominal: z.number('Enter the nominal value as a number.').finite(),
  tolerance: z.number('Enter the tolerance as a number.').positive('The tolerance must be more than 0.').finite(),
  phase: z.enum(readingPhases, 'Choose when it is read.'),
  requiredForCodes: z.array(catalogCode('repair code')).max(40).default([]),
};
export const createReadingSpecSchema = z.strictObject(readingSpecFields);
export const updateReadingSpecSchema = z.strictObject({
  label: readingSpecFields.label.optional(),
  unit: readingSpecFields.unit.optional(),
  nominal: readingSpecFields.nominal.optional(),
  tolerance: readingSpecFields.tolerance.optional(),
  phase: readingSpecFields.phase.optional(),
  requiredForCodes: z.array(catalogCode('repair code')).max(40).optional(),
});
export type CreateReadingSpecBody = z.input<typeof createReadingSpecSchema>;
export type UpdateReadingSpecBody = z.infer<typeof updateReadingSpecSchema>;

const cents = (label: string) => z.number(`Enter ${label}.`).int('Whole cents only.').min(0, 'Cannot be negative.').max(100_000_000, 'That amount is too large.');

export const createPartSchema = z.strictObject({
  partNumber: catalogCode('part number'),
  description: required(200, 'Describe the part.', 'The part description'),
  familyId: id().nullable().default(null),
  listPriceCents: cents('the list price'),
  returnRequired: z.boolean().default(false),
});
export const updatePartSchema = z
  .strictObject({
    description: required(200, 'Describe the part.', 'The part description').optional(),
    familyId: id().nullable().optional(),
    returnRequired: z.boolean().optional(),
    active: z.boolean().optional(),
    listPriceCents: cents('the list price').optional(),
    /** The first repair date the new price applies to; defaults to today. */
    priceEffectiveFrom: isoDate.optional(),
    /** Required when the new price takes effect in the past. */
    reason: optionalOneLineReason,
  })
  .refine((v) => v.priceEffectiveFrom === undefined || v.listPriceCents !== undefined, {
    message: 'Give the new price that takes effect on this date.',
    path: ['listPriceCents'],
  });
export type CreatePartBody = z.input<typeof createPartSchema>;
export type UpdatePartBody = z.infer<typeof updatePartSchema>;

const hours = z.number('Enter hours as a number.').min(0.1, 'At least 0.1 hour.').max(24, 'At most 24 hours.').multipleOf(0.05, 'Use steps of 0.05 hour (3 minutes).');

export const createRepairCodeSchema = z.strictObject({
  code: catalogCode('repair code'),
  familyId: id('Choose a product family.'),
  description: required(200, 'Describe the repair.', 'The repair description'),
  allowedHours: hours,
  requiredEvidence: z.array(z.enum(attachmentRoles)).max(attachmentRoles.length).default([]),
});
export const updateRepairCodeSchema = z
  .strictObject({
    familyId: id('Choose a product family.').optional(),
    description: required(200, 'Describe the repair.', 'The repair description').optional(),
    requiredEvidence: z.array(z.enum(attachmentRoles)).max(attachmentRoles.length).optional(),
    active: z.boolean().optional(),
    allowedHours: hours.optional(),
    /** The first repair date the new allowance applies to; defaults to today. */
    allowanceEffectiveFrom: isoDate.optional(),
    /** Required when the new allowance takes effect in the past. */
    reason: optionalOneLineReason,
  })
  .refine((v) => v.allowanceEffectiveFrom === undefined || v.allowedHours !== undefined, {
    message: 'Give the new allowance that takes effect on this date.',
    path: ['allowedHours'],
  });
export type CreateRepairCodeBody = z.input<typeof createRepairCodeSchema>;
export type UpdateRepairCodeBody = z.infer<typeof updateRepairCodeSchema>;

export interface FamilyItem {
  id: string;
  code: string;
  name: string;
  fuel: 'gas' | 'electric';
  active: boolean;
  createdAt: string;
}

export interface ReadingSpecItem {
  id: string;
  modelId: string;
  key: string;
  label: string;
  unit: (typeof readingUnits)[number];
  nominal: number;
  tolerance: number;
  phase: (typeof readingPhases)[number];
  requiredForCodes: string[];
}

/** Filed claims a back-dated change touches: how many, and the first claim numbers. */
export interface AffectedClaims {
  effectiveFrom: string;
  count: number;
  numbers: string[];
}

export interface ModelItem {
  /** Only on the answer to a change that took effect in the past. */
  affectedClaims?: AffectedClaims;
  id: string;
  familyId: string;
  familyCode: string;
  modelNumber: string;
  name: string;
  partsMonths: number;
  laborMonths: number;
  capMonthsFromShip: number;
  installGraceDays: number;
  active: boolean;
  updatedAt: string;
  readingSpecs: ReadingSpecItem[];
  componentTerms: { id: string; partId: string; partNumber: string; label: string; partsMonths: number }[];
}

export interface PriceHistoryItem {
  effectiveFrom: string;
  listPriceCents: number;
  createdAt: string;
}

export interface PartItem {
  /** Only on the answer to a change that took effect in the past. */
  affectedClaims?: AffectedClaims;
  id: string;
  partNumber: string;
  description: string;
  familyId: string | null;
  familyCode: string | null;
  /** The price in force today. */
  listPriceCents: number;
  returnRequired: boolean;
  active: boolean;
  updatedAt: string;
  /** Changes dated after today. */
  scheduled: PriceHistoryItem[];
}

export interface AllowanceHistoryItem {
  effectiveFrom: string;
  allowedHours: number;
  createdAt: string;
}

export interface RepairCodeItem {
  /** Only on the answer to a change that took effect in the past. */
  affectedClaims?: AffectedClaims;
  id: string;
  code: string;
  familyId: string;
  familyCode: string;
  description: string;
  /** The allowance in force today. */
  allowedHours: number;
  requiredEvidence: AttachmentRole[];
  active: boolean;
  updatedAt: string;
  scheduled: AllowanceHistoryItem[];
}

// ---------------------------------------------------------------------------- agencies and contract terms

export const createAgencySchema = z
  .strictObject({
    ...profileFields,
    latitude: profileFields.latitude.optional(),
    longitude: profileFields.longitude.optional(),
    /** The agency's first admin, invited by e-mail. */
    adminEmail: emailSchema,
  })
  .refine(bothOrNeither, bothOrNeitherMessage);
export const updateAgencySchema = z
  .strictObject({ ...profileFields, active: z.boolean() })
  .partial()
  .refine(bothOrNeither, bothOrNeitherMessage);
export type CreateAgencyBody = z.input<typeof createAgencySchema>;
export type UpdateAgencyBody = z.infer<typeof updateAgencySchema>;

export const inviteAgencyAdminSchema = z.strictObject({ email: emailSchema });

const bps = (label: string) => z.number(`Enter ${label}.`).int('Whole basis points only (1 % = 100).').min(0, 'Cannot be negative.').max(10_000, 'At most 100 %.');

const termsFields = {
  effectiveFrom: isoDate,
  /** Inclusive; null: open-ended. */
  effectiveTo: isoDate.nullable(),
  laborRateCents: cents('the labor rate per hour'),
  travelRateCents: cents('the travel rate per hour'),
  /** Cents per mile; null: the IRS business standard mileage rate of the repair date's year. */
  mileageRateCents: z.number('Enter cents per mile.').min(0, 'Cannot be negative.').max(1000, 'At most 1,000 cents per mile.').multipleOf(0.1, 'Use tenths of a cent at most.').nullable(),
  maxRoundTripMiles: z.number('Enter miles.').min(0, 'Cannot be negative.').max(2000, 'At most 2,000 miles.'),
  maxTravelHours: z.number('Enter hours.').min(0, 'Cannot be negative.').max(48, 'At most 48 hours.'),
  partsDiscountBps: bps('the parts discount'),
  partsHandlingBps: bps('the parts handling'),
  overtimeMultiplier: z.number('Enter the multiplier.').min(1, 'At least 1.').max(3, 'At most 3.'),
  filingWindowDays: z.number('Enter days.').int('Whole days only.').min(1, 'At least 1 day.').max(730, 'At most 730 days.'),
};
const toAfterFrom = (v: { effectiveFrom?: string; effectiveTo?: string | null }) => !v.effectiveFrom || !v.effectiveTo || v.effectiveTo >= v.effectiveFrom;
const toAfterFromMessage = rangeOrder('effectiveFrom', 'effectiveTo', 'start date', 'end date');

export const createTermsSchema = z
  .strictObject({
    ...termsFields,
    /** End the open-ended period in force before this one on the day before it starts. */
    closePrevious: z.boolean().default(false),
  })
  .refine(toAfterFrom, toAfterFromMessage);
export const updateTermsSchema = z.strictObject(termsFields).partial().refine(toAfterFrom, toAfterFromMessage);
export type CreateTermsBody = z.input<typeof createTermsSchema>;
export type UpdateTermsBody = z.infer<typeof updateTermsSchema>;

export interface ContractTermsItem {
  id: string;
  agencyId: string;
  effectiveFrom: string;
  effectiveTo: string | null;
  laborRateCents: number;
  travelRateCents: number;
  mileageRateCents: number | null;
  maxRoundTripMiles: number;
  maxTravelHours: number;
  partsDiscountBps: number;
  partsHandlingBps: number;
  overtimeMultiplier: number;
  filingWindowDays: number;
  createdAt: string;
}

export interface AgencyListItem extends AgencyProfile {
  userCount: number;
  activeAdminCount: number;
  pendingInvitations: InvitationListItem[];
  currentTerms: ContractTermsItem | null;
}

export interface AgencyDetail extends AgencyListItem {
  terms: ContractTermsItem[];
}
