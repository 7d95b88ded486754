import { attachmentRoleLabels, type AttachmentRole } from '../schemas/claim';

/**
 * What a claim said when it was submitted, as labelled fields ("Cause", "Labor GR-160: hours
 * worked", "Reading oil_temp (after)"), so two submissions compare field by field. Stored with
 * each submit event; the reviewer of a resubmitted claim sees what changed since the last one.
 */
export type SubmissionSnapshot = Record<string, string>;

export interface SnapshotSource {
  complaint: string | null;
  cause: string | null;
  correction: string | null;
  failureDate: string | null;
  repairDate: string | null;
  preAuthorization: string | null;
  laborLines: readonly { repairCode: string; hoursWorked: number; overtime: boolean; note: string | null }[];
  travel: { roundTripMiles: number | null; travelHours: number | null } | null | undefined;
  partLines: readonly { partNumber: string; quantity: number }[];
  readings: readonly { key: string; phase: string; value: number; unit: string }[];
  attachments: readonly { role: string; originalName: string; retractedAt?: string | null }[];
}

export interface SnapshotChange {
  field: string;
  before: string | null;
  after: string | null;
}

function put(out: SubmissionSnapshot, field: string, value: string | number | null | undefined): void {
  if (value === null || value === undefined || value === '') return;
  // the same label twice (two lines with one code) gets a running number
  let key = field;
  for (let n = 2; key in out; n++) key = `${field} #${n}`;
  out[key] = String(value);
}

export function submissionSnapshot(c: SnapshotSource): SubmissionSnapshot {
  const out: SubmissionSnapshot = {};
  put(out, 'Complaint', c.complaint);
  put(out, 'Cause', c.cause);
  put(out, 'Correction', c.correction);
  put(out, 'Failure date', c.failureDate);
  put(out, 'Repair date', c.repairDate);
  put(out, 'Pre-authorization', c.preAuthorization);
  for (const l of c.laborLines) {
    put(out, `Labor ${l.repairCode}`, `${l.hoursWorked} h${l.overtime ? ', overtime' : ''}${l.note ? `, note: ${l.note}` : ''}`);
  }
  if (c.travel) {
    put(out, 'Travel distance', c.travel.roundTripMiles === null ? null : `${c.travel.roundTripMiles} mi round trip`);
    put(out, 'Travel time', c.travel.travelHours === null ? null : `${c.travel.travelHours} h`);
  }
  for (const p of c.partLines) put(out, `Part ${p.partNumber}`, `quantity ${p.quantity}`);
  for (const r of c.readings) put(out, `Reading ${r.key} (${r.phase})`, `${r.value} ${r.unit}`);
  for (const a of c.attachments) {
    if (a.retractedAt) continue;
    put(out, `Evidence: ${a.originalName}`, attachmentRoleLabels[a.role as AttachmentRole] ?? a.role);
  }
  return out;
}

/** Every field whose value differs between two submissions, in the order of the later one, then removed fields. */
export function diffSnapshots(before: SubmissionSnapshot, after: SubmissionSnapshot): SnapshotChange[] {
  const changes: SnapshotChange[] = [];
  for (const [field, value] of Object.entries(after)) {
    const was = before[field] ?? null;
    if (was !== value) changes.push({ field, before: was, after: value });
  }
  for (const [field, value] of Object.entries(before)) if (!(field in after)) changes.push({ field, before: value, after: null });
  return changes;
}
