import { paymentRunStateLabels, type PaymentRunState } from '@shared/schemas/payment';
import { Badge, type BadgeTone } from '@/components/ui/badge';

const tones: Record<PaymentRunState, BadgeTone> = { open: 'brass', paid: 'green', void: 'slate' };
const marks: Record<PaymentRunState, string> = { open: 'M6 3v3l2 2', paid: 'M3 6.5l2 2 4-5', void: 'M3.5 3.5l5 5m0-5l-5 5' };

export function RunStateBadge({ state }: { state: PaymentRunState }) {
  return (
    <Badge
      tone={tones[state]}
      icon={
        <svg aria-hidden="true" viewBox="0 0 12 12" className="size-3" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round">
          <path d={marks[state]} />
        </svg>
      }
    >
      {paymentRunStateLabels[state]}
    </Badge>
  );
}
