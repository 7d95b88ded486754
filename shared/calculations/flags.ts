/**
 * Flag codes a reviewer sees on a claim, with plain-English labels for the UI.
 * Most are raised by the valuation; the photo flags are raised where attachments
 * are taken in, and are listed here so every flag has one label.
 */

export const FLAG_CODES = [
  'filed_late',
  'out_of_coverage',
  'repeat_repair',
  'technician_not_certified',
  'labor_over_allowance',
  'overtime_without_authorization',
  'travel_over_cap',
  'travel_distance_implausible',
  'readings_out_of_tolerance',
  'photo_reused',
  'photo_reused_other_agency',
  'photo_outside_service_window',
  'photo_far_from_site',
] as const;

export type FlagCode = (typeof FLAG_CODES)[number];

export interface FlagInfo {
  label: string;
  description: string;
  raisedBy: 'valuation' | 'attachments';
}

export const FLAG_INFO: Record<FlagCode, FlagInfo> = {
  filed_late: {
    label: 'Filed late',
    description: 'The claim was filed after the filing window counted from the repair date.',
    raisedBy: 'valuation',
  },
  out_of_coverage: {
    label: 'Not covered on the failure date',
    description: 'The unit’s parts or labor coverage had ended (or not begun) on the failure date; those lines are shown but valued at zero.',
    raisedBy: 'valuation',
  },
  repeat_repair: {
    label: 'Repeat repair',
    description: 'The same unit had a repair with the same repair code within 90 days before this one.',
    raisedBy: 'valuation',
  },
  technician_not_certified: {
    label: 'Technician not certified',
    description: 'The technician held no certification for the unit’s product family on the repair date.',
    raisedBy: 'valuation',
  },
  labor_over_allowance: {
    label: 'Labor over allowance',
    description: 'Hours worked exceed the hours the repair code allows; the allowance is paid unless a reviewer overrides it.',
    raisedBy: 'valuation',
  },
  overtime_without_authorization: {
    label: 'Overtime without pre-authorisation',
    description: 'Overtime was claimed without a pre-authorisation number; the line is paid at the normal rate.',
    raisedBy: 'valuation',
  },
  travel_over_cap: {
    label: 'Travel over the contract cap',
    description: 'The round-trip distance or the travel time exceeds the contract’s cap; the cap is paid.',
    raisedBy: 'valuation',
  },
  travel_distance_implausible: {
    label: 'Travel distance implausible',
    description: 'The entered round trip is shorter than twice the straight-line distance to the site, or far longer than roads usually run.',
    raisedBy: 'valuation',
  },
  readings_out_of_tolerance: {
    label: 'After-repair readings out of tolerance',
    description: 'A reading taken after the repair lies outside the model’s nominal value and tolerance.',
    raisedBy: 'valuation',
  },
  photo_reused: {
    label: 'Photo reused',
    description: 'A photo is the same as, or nearly identical to, a photo on another claim.',
    raisedBy: 'attachments',
  },
  photo_reused_other_agency: {
    label: 'Photo reused from another agency’s claim',
    description: 'A photo is the same as, or nearly identical to, a photo on a claim of another agency. Shown to the manufacturer only: an agency is never told what another agency holds.',
    raisedBy: 'attachments',
  },
  photo_outside_service_window: {
    label: 'Photo taken outside the service window',
    description: 'A photo’s recorded capture time falls outside the dates of the service visit.',
    raisedBy: 'attachments',
  },
  photo_far_from_site: {
    label: 'Photo taken far from the site',
    description: 'A photo’s recorded GPS position is far from the site’s coordinates.',
    raisedBy: 'attachments',
  },
};

export function isFlagCode(code: unknown): code is FlagCode {
  return typeof code === 'string' && (FLAG_CODES as readonly string[]).includes(code);
}

export function flagLabel(code: string): string {
  return isFlagCode(code) ? FLAG_INFO[code].label : code;
}
