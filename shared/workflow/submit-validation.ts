/**
 * Whether a claim may be submitted (or resubmitted): pure, used by the form's check step and
 * by the server's submit guard. Each problem names the field path it concerns, in the same
 * dotted form as the API's field errors (e.g. "laborLines", "attachments.serial_plate").
 */
import { attachmentRoleLabels, type AttachmentRole } from '../schemas/claim';

export interface SubmitFacts {
  /** The unit found by serial; null when no serial or an unknown one was entered. */
  unitId: string | null;
  failureDate: string | null;
  repairDate: string | null;
  /** Today's date (YYYY-MM-DD) where the claim is checked. */
  today: string;
  complaint: string;
  cause: string;
  correction: string;
  laborLines: ReadonlyArray<{ repairCode: string; requiredEvidence: readonly string[] }>;
  partLines: ReadonlyArray<{ partId: string }>;
  /** Roles of the evidence attached to the claim. */
  attachments: ReadonlyArray<{ role: string }>;
  /** Readings the model's specs require for the claim's repair codes. */
  requiredReadings?: ReadonlyArray<{ key: string; label: string; phase: 'before' | 'after' }>;
  readings?: ReadonlyArray<{ key: string; phase: 'before' | 'after' }>;
  /** The unit's ship date; a claim dated before it is refused. */
  shipDate?: string | null;
  /** False when the agency has no contract terms in force on the repair date (undefined: not known here). */
  contractTermsInForce?: boolean;
  /** Why the rules could not value the claim although its facts are complete (e.g. no mileage rate in force). */
  valuationProblems?: ReadonlyArray<{ path: string; message: string }>;
}

export type SubmitProblemCode =
  | 'unit_missing'
  | 'date_missing'
  | 'date_invalid'
  | 'repair_before_failure'
  | 'date_in_future'
  | 'no_lines'
  | 'text_missing'
  | 'evidence_missing'
  | 'reading_missing'
  | 'before_ship_date'
  | 'no_contract_terms'
  | 'not_valued';

export interface SubmitProblem {
  path: string;
  code: SubmitProblemCode;
  message: string;
}

export interface SubmitValidation {
  ok: boolean;
  problems: SubmitProblem[];
}

const ISO_DATE = /^\d{4}-(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/;

function isRealDate(s: string): boolean {
  if (!ISO_DATE.test(s)) return false;
  const [y, m, d] = s.split('-').map(Number);
  const dt = new Date(Date.UTC(y, m - 1, d));
  return dt.getUTCFullYear() === y && dt.getUTCMonth() === m - 1 && dt.getUTCDate() === d;
}

function blank(s: string | null | undefined): boolean {
  return typeof s !== 'string' || s.trim() === '';
}

function roleLabel(role: string): string {
  return (attachmentRoleLabels as Record<string, string>)[role as AttachmentRole] ?? role.replace(/_/g, ' ');
}

export function validateForSubmit(facts: SubmitFacts): SubmitValidation {
  const problems: SubmitProblem[] = [];
  const add = (path: string, code: SubmitProblemCode, message: string) => problems.push({ path, code, message });

  if (!facts.unitId) add('serial', 'unit_missing', 'Find the unit by its serial number.');

  const dates: Array<['failureDate' | 'repairDate', string]> = [
    ['failureDate', 'failure date'],
    ['repairDate', 'repair date'],
  ];
  const good: Partial<Record<'failureDate' | 'repairDate', string>> = {};
  for (const [key, words] of dates) {
    const v = facts[key];
    if (blank(v)) add(key, 'date_missing', `Enter the ${words}.`);
    else if (!isRealDate(v as string)) add(key, 'date_invalid', `The ${words} is not a real date.`);
    else if ((v as string) > facts.today) add(key, 'date_in_future', `The ${words} cannot be in the future.`);
    else good[key] = v as string;
  }
  if (good.failureDate && good.repairDate && good.repairDate < good.failureDate) {
    add('repairDate', 'repair_before_failure', `The repair date (${good.repairDate}) cannot be before the failure date (${good.failureDate}).`);
  }
  if (facts.shipDate) {
    for (const [key, words] of dates) {
      const v = good[key];
      if (v && v < facts.shipDate) add(key, 'before_ship_date', `The ${words} ${v} is before the unit shipped on ${facts.shipDate}; check the date or the serial number.`);
    }
  }
  if (good.repairDate && facts.contractTermsInForce === false) {
    add('repairDate', 'no_contract_terms', `The agency has no contract terms in force on the repair date ${good.repairDate}, so the claim cannot be valued. Ask the manufacturer to record the terms for that date.`);
  }
  for (const p of facts.valuationProblems ?? []) add(p.path, 'not_valued', p.message);

  if (facts.laborLines.length === 0 && facts.partLines.length === 0) {
    add('laborLines', 'no_lines', 'Add at least one labor or part line.');
  }

  const texts: Array<['complaint' | 'cause' | 'correction', string]> = [
    ['complaint', 'Describe the complaint: what the customer reported.'],
    ['cause', 'Describe the cause you found.'],
    ['correction', 'Describe the correction you made.'],
  ];
  for (const [key, message] of texts) if (blank(facts[key])) add(key, 'text_missing', message);

  const present = new Set(facts.attachments.map((a) => a.role));
  const needed = new Map<string, string[]>();
  for (const line of facts.laborLines) {
    for (const role of line.requiredEvidence) {
      if (!needed.has(role)) needed.set(role, []);
      const codes = needed.get(role)!;
      if (!codes.includes(line.repairCode)) codes.push(line.repairCode);
    }
  }
  for (const [role, codes] of needed) {
    if (!present.has(role)) {
      add(`attachments.${role}`, 'evidence_missing', `Attach a ${roleLabel(role).toLowerCase()} photo or document (required by ${codes.join(', ')}).`);
    }
  }

  const have = new Set((facts.readings ?? []).map((r) => `${r.key}:${r.phase}`));
  for (const r of facts.requiredReadings ?? []) {
    if (!have.has(`${r.key}:${r.phase}`)) {
      add(`readings.${r.key}.${r.phase}`, 'reading_missing', `Enter the ${r.label.toLowerCase()} reading ${r.phase === 'before' ? 'before' : 'after'} the repair.`);
    }
  }

  return { ok: problems.length === 0, problems };
}

/** Problems as field errors `{ path: message }` (first message per path). */
export function problemsAsFields(problems: readonly SubmitProblem[]): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const p of problems) if (!fields[p.path]) fields[p.path] = p.message;
  return fields;
}
