import { Link } from 'react-router';
import type { ClaimListItem } from '@shared/schemas/claim';
import { flagLabel } from '@shared/calculations/flags';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { paths } from '@/config/paths';
import { ageInDays, formatCents, formatDate } from '@/lib/format';

function age(c: ClaimListItem, now: Date): string {
  const d = ageInDays(c.submittedAt, now);
  return d === null ? '—' : d === 0 ? 'today' : `${d} day${d === 1 ? '' : 's'}`;
}

type Row = ClaimListItem & { reviewerName?: string | null };

/**
 * The queue, oldest submission first: each claim's age, agency, unit, amount and flags, and who
 * has it. A waiting claim can be taken from here.
 */
export function ReviewQueueTable({ items, now = new Date(), canStart, startingId, onStart }: { items: Row[]; now?: Date; canStart: (c: Row) => boolean; startingId: string | null; onStart: (c: Row) => void }) {
  return (
    <ol className="divide-y divide-ink-100" aria-label="Claims in the queue, oldest first">
      {items.map((c) => (
        <li key={c.id} className="grid gap-2 px-4 py-3 sm:grid-cols-[6rem_minmax(0,2fr)_minmax(0,1.2fr)_8rem_11rem] sm:items-center">
          <p className="text-sm">
            <span className="block text-2xl font-semibold tabular-nums text-ink-900">{age(c, now)}</span>
            <span className="text-xs text-ink-600">since {formatDate(c.submittedAt?.slice(0, 10))}</span>
          </p>
          <div className="min-w-0 text-sm">
            <Link to={paths.claim(c.id)} className="font-mono font-semibold text-ink-800 underline-offset-2 hover:underline">
              {c.number}
            </Link>
            <p className="truncate text-ink-800">{c.agencyName}</p>
            <p className="truncate text-ink-600">{[c.modelNumber, c.serial].filter(Boolean).join(' · ') || 'No unit'}</p>
          </div>
          <ul className="flex flex-wrap gap-1" aria-label="Flags">
            {c.flags.length === 0 ? (
              <li className="text-sm text-ink-500">No flags</li>
            ) : (
              c.flags.map((f) => (
                <li key={f}>
                  <Badge tone="brass">{flagLabel(f)}</Badge>
                </li>
              ))
            )}
          </ul>
          <p className="text-sm tabular-nums sm:text-right">
            <span className="font-semibold">{formatCents(c.claimedTotalCents, c.currency)}</span>
            <span className="block text-xs text-ink-600">claimed</span>
          </p>
          <div className="text-sm sm:text-right">
            {c.state === 'in_review' ? (
              <p>
                <Badge tone="violet">In review</Badge>
                <span className="mt-1 block text-ink-700">{c.reviewerName ? `with ${c.reviewerName}` : 'taken'}</span>
              </p>
            ) : canStart(c) ? (
              <Button size="sm" onClick={() => onStart(c)} pending={startingId === c.id} disabled={startingId !== null} aria-label={`Start review of ${c.number}`}>
                Start review
              </Button>
            ) : (
              <Badge tone="blue">Waiting</Badge>
            )}
          </div>
        </li>
      ))}
    </ol>
  );
}
