/**
 * The claim form's values, how they come from a stored claim, what the check step asks of
 * them (the shared submit validation), and where each problem sits on the page.
 */
import type { CatalogModel, CatalogRepairCode } from '@shared/schemas/catalog';
import type { ClaimDetail } from '@shared/schemas/claim';
import type { ReasonCode } from '@shared/workflow/reason-codes';
import type { SubmitFacts } from '@shared/workflow/submit-validation';

export type ReadingUnit = 'F' | 'C' | 'in' | 'mm' | 'A' | 'V';

/** Exactly the fields of the shared draft schema that the editor writes (the unit is chosen before). */
export interface ClaimFormValues {
  complaint: string;
  cause: string;
  correction: string;
  failureDate: string | null;
  repairDate: string | null;
  preAuthorization: string | null;
  laborLines: Array<{ repairCodeId: string; hoursWorked: number; overtime: boolean; note: string }>;
  travel: { roundTripMiles: number; travelHours: number } | null;
  partLines: Array<{ partId: string; quantity: number }>;
  readings: Array<{ key: string; phase: 'before' | 'after'; value: number; unit: ReadingUnit }>;
}

/** The top-level keys autosave compares and sends one by one. */
export const SAVE_KEYS = ['complaint', 'cause', 'correction', 'failureDate', 'repairDate', 'preAuthorization', 'laborLines', 'travel', 'partLines', 'readings'] as const;
export type SaveKey = (typeof SAVE_KEYS)[number];

const READING_UNITS: readonly string[] = ['F', 'C', 'in', 'mm', 'A', 'V'];

export function detailToValues(claim: ClaimDetail): ClaimFormValues {
  return {
    complaint: claim.complaint ?? '',
    cause: claim.cause ?? '',
    correction: claim.correction ?? '',
    failureDate: claim.failureDate,
    repairDate: claim.repairDate,
    preAuthorization: claim.preAuthorization,
    laborLines: claim.laborLines.map((l) => ({ repairCodeId: l.repairCodeId, hoursWorked: l.hoursWorked, overtime: l.overtime, note: l.note ?? '' })),
    travel: claim.travel ? { roundTripMiles: claim.travel.roundTripMiles, travelHours: claim.travel.travelHours } : null,
    partLines: claim.partLines.map((p) => ({ partId: p.partId, quantity: p.quantity })),
    readings: claim.readings
      .filter((r) => READING_UNITS.includes(r.unit))
      .map((r) => ({ key: r.key, phase: r.phase, value: r.value, unit: r.unit as ReadingUnit })),
  };
}

/** The DOM id of the element a field path points at, for the check step's links. */
export function fieldDomId(path: string): string {
  return `cf-${path.replace(/[^A-Za-z0-9_-]/g, '-')}`;
}

/** Moves focus to the field a problem names (or the nearest section), scrolling it into view. */
export function focusField(path: string): void {
  const candidates = [path, path.split('.').slice(0, 2).join('.'), path.split('.')[0]];
  for (const p of candidates) {
    const el = document.getElementById(fieldDomId(p));
    if (!el) continue;
    const target = el.matches('input, select, textarea, button') ? el : (el.querySelector<HTMLElement>('input, select, textarea, button') ?? el);
    target.scrollIntoView?.({ block: 'center', behavior: 'smooth' });
    target.focus({ preventScroll: true });
    return;
  }
}

export type FormSection = 'unit' | 'dates' | 'story' | 'labor' | 'travel' | 'parts' | 'readings' | 'evidence';

/** Where a reviewer's reason points on the form, so the note sits beside the fields it concerns. */
export const reasonSections: Record<ReasonCode, FormSection[]> = {
  missing_evidence: ['evidence'],
  incomplete_information: ['story', 'dates'],
  readings_missing: ['readings'],
  labor_over_guide: ['labor'],
  wrong_repair_code: ['labor'],
  parts_not_supported: ['parts'],
  outside_coverage: ['unit'],
  filed_late: ['dates'],
  not_a_warranty_failure: ['story'],
  duplicate_claim: ['unit'],
  entered_below_allowance: ['labor', 'parts'],
  work_shown_in_evidence: ['labor', 'parts'],
  corrected_at_agency_request: ['labor', 'parts'],
  other: [],
};

/** The section a field path belongs to. */
export function sectionOf(path: string): FormSection {
  const head = path.split('.')[0];
  switch (head) {
    case 'serial':
      return 'unit';
    case 'failureDate':
    case 'repairDate':
      return 'dates';
    case 'complaint':
    case 'cause':
    case 'correction':
      return 'story';
    case 'laborLines':
    case 'preAuthorization':
      return 'labor';
    case 'travel':
      return 'travel';
    case 'partLines':
      return 'parts';
    case 'readings':
      return 'readings';
    default:
      return 'evidence';
  }
}

export interface ReadingSlot {
  key: string;
  label: string;
  phase: 'before' | 'after';
  required: boolean;
}

type Spec = CatalogModel['readingSpecs'][number];

/** The phases a spec asks for. */
export function specPhases(spec: Pick<Spec, 'phase'>): Array<'before' | 'after'> {
  return spec.phase === 'both' ? ['before', 'after'] : [spec.phase];
}

/** The readings the model's specs require for the repair codes on the form. */
export function requiredReadings(specs: readonly Spec[], codes: ReadonlySet<string>): ReadingSlot[] {
  const out: ReadingSlot[] = [];
  for (const s of specs) {
    if (!s.requiredForCodes.some((c) => codes.has(c))) continue;
    for (const phase of specPhases(s)) out.push({ key: s.key, label: s.label, phase, required: true });
  }
  return out;
}

/** The facts of the shared submit validation, from the form as it stands. */
export function submitFactsOf(
  values: ClaimFormValues,
  claim: Pick<ClaimDetail, 'unit' | 'attachments'>,
  repairCodes: readonly CatalogRepairCode[],
  specs: readonly Spec[],
  today: string,
): SubmitFacts {
  const byId = new Map(repairCodes.map((c) => [c.id, c]));
  const lines = values.laborLines.map((l) => byId.get(l.repairCodeId));
  const codes = new Set(lines.filter((c): c is CatalogRepairCode => !!c).map((c) => c.code));
  return {
    unitId: claim.unit?.id ?? null,
    failureDate: values.failureDate,
    repairDate: values.repairDate,
    today,
    complaint: values.complaint,
    cause: values.cause,
    correction: values.correction,
    laborLines: lines.map((c) => ({ repairCode: c?.code ?? '', requiredEvidence: c?.requiredEvidence ?? [] })),
    partLines: values.partLines.map((p) => ({ partId: p.partId })),
    attachments: claim.attachments.map((a) => ({ role: a.role })),
    requiredReadings: requiredReadings(specs, codes).map(({ key, label, phase }) => ({ key, label, phase })),
    readings: values.readings.map((r) => ({ key: r.key, phase: r.phase })),
  };
}
