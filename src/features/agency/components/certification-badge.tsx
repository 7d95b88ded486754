import type { CertificationState, CertificationSummary } from '@shared/schemas/admin';
import { Badge, type BadgeTone } from '@/components/ui/badge';

const tone: Record<CertificationState | CertificationSummary, BadgeTone> = {
  valid: 'green',
  expiring: 'brass',
  expired: 'red',
  not_yet_valid: 'slate',
  none: 'neutral',
};

const words: Record<CertificationState | CertificationSummary, string> = {
  valid: 'Valid',
  expiring: 'Expires soon',
  expired: 'Expired',
  not_yet_valid: 'Not yet valid',
  none: 'None on file',
};

/** Certification state as a badge; "expires soon" starts 30 days before the end date. */
export function CertificationBadge({ state, label }: { state: CertificationState | CertificationSummary; label?: string }) {
  return <Badge tone={tone[state]}>{label ? `${label}: ${words[state]}` : words[state]}</Badge>;
}

export const certificationStateLabel = (state: CertificationState | CertificationSummary): string => words[state];
