/** Evidence on a claim (attachments, readings, flags) as the API returns it. Types only. */
import type { AttachmentRole } from './claim';

export interface AttachmentView {
  id: string;
  claimId: string;
  role: AttachmentRole;
  originalName: string;
  contentType: string;
  kind: 'photo' | 'document' | 'sheet';
  sizeBytes: number;
  sha256: string;
  width: number | null;
  height: number | null;
  /** EXIF capture time as written in the file, its offset, and the UTC instant when the offset is known. */
  takenAtRaw: string | null;
  takenAtOffset: string | null;
  takenAtUtc: string | null;
  gps: { latitude: number; longitude: number } | null;
  /** False when the gallery shows a placeholder (HEIC this server cannot decode, PDF, CSV). */
  hasThumbnail: boolean;
  url: string;
  thumbnailUrl: string;
  /** A re-encoded JPEG for the lightbox (never the uploaded bytes). */
  previewUrl: string;
  uploadedBy: string;
  uploadedByName: string | null;
  createdAt: string;
  /** Set when the agency retracted the file after filing; the file stays, with the agency's reason. */
  retractedAt?: string | null;
  retractionReason?: string | null;
}

export type EvidenceFlagCode = 'photo_reused' | 'photo_reused_other_agency' | 'photo_outside_service_window' | 'photo_far_from_site' | 'readings_out_of_tolerance';

export interface EvidenceFlagView {
  code: EvidenceFlagCode;
  message: string;
  attachmentId?: string;
  readingKey?: string;
  otherClaimNumber?: string;
}

export interface ClaimEvidence {
  attachments: AttachmentView[];
  flags: EvidenceFlagView[];
  limits: UploadLimitsView;
  usage: { files: number; bytes: number };
}

export interface UploadLimitsView {
  maxFileBytes: number;
  maxFilesPerRequest: number;
  maxFilesPerClaim: number;
  maxBytesPerClaim: number;
  accept: string[];
}

export interface ReadingSpecView {
  key: string;
  label: string;
  unit: string;
  unitLabel: string;
  nominal: number;
  tolerance: number;
  low: number;
  high: number;
  phase: 'before' | 'after' | 'both';
  requiredForCodes: string[];
  /** Required by a repair code on this claim. */
  required: boolean;
}

export interface JudgedReadingView {
  id: string | null;
  key: string;
  label: string;
  phase: 'before' | 'after';
  value: number;
  unit: string;
  kind: 'spec' | 'food' | 'unknown';
  convertedValue: number | null;
  deviation: number | null;
  pass: boolean | null;
  direction: 'low' | 'high' | 'within' | null;
  failsAfterRepair: boolean;
  explanation: string;
  spec: Omit<ReadingSpecView, 'required'> | null;
}

export interface ClaimReadingsReport {
  modelNumber: string | null;
  specs: ReadingSpecView[];
  readings: JudgedReadingView[];
  /** Keys for a product core temperature after the cook cycle (judged against the FDA Food Code, for information). */
  foodKeys: Array<{ key: string; label: string }>;
  fuel: 'gas' | 'electric' | null;
}

export interface CsvImportError {
  line: number;
  message: string;
}

export const evidenceFlagLabels: Record<EvidenceFlagCode, string> = {
  photo_reused: 'Photo reused',
  photo_reused_other_agency: 'Photo reused from another agency’s claim',
  photo_outside_service_window: 'Photo taken outside the service window',
  photo_far_from_site: 'Photo taken far from the site',
  readings_out_of_tolerance: 'After-repair readings out of tolerance',
};
