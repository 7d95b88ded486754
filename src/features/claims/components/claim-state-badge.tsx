import { claimStateLabels, type ClaimState } from '@shared/schemas/claim';
import { Badge, type BadgeTone } from '@/components/ui/badge';

const tones: Record<ClaimState, BadgeTone> = {
  draft: 'neutral',
  submitted: 'blue',
  in_review: 'violet',
  returned: 'orange',
  approved: 'green',
  denied: 'red',
  paid: 'ink',
  withdrawn: 'slate',
};

/** A small shape per state as well as a colour, so the state never rests on colour alone. */
const marks: Record<ClaimState, string> = {
  draft: 'M3 9h6',
  submitted: 'M3 6l3 3 3-3',
  in_review: 'M6 3v3l2 2',
  returned: 'M8 6H4m2-2L4 6l2 2',
  approved: 'M3 6.5l2 2 4-5',
  denied: 'M3.5 3.5l5 5m0-5l-5 5',
  paid: 'M3 4h6M3 6h6M3 8h6',
  withdrawn: 'M3 6h6',
};

export function ClaimStateBadge({ state }: { state: ClaimState }) {
  const label = claimStateLabels[state] ?? state;
  return (
    <Badge
      tone={tones[state] ?? 'neutral'}
      icon={
        <svg aria-hidden="true" viewBox="0 0 12 12" className="size-3" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round">
          <path d={marks[state] ?? 'M3 6h6'} />
        </svg>
      }
    >
      {label}
    </Badge>
  );
}
