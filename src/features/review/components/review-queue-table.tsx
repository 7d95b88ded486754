import { Link } from 'react-router';
import type { ClaimListItem } from '@shared/schemas/claim';
import { flagLabel } from '@shared/calculations/flags';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { paths } from '@/config/paths';
import { ageInDays, formatCents, formatDate } from '@/lib/format';
import { useOrganisationTimeZone } from '@/lib/business-day';

function age(c: ClaimListItem, now: Date, timeZone: string): string {
  const d = ageInDays(c.submittedAt, now, timeZone);
  return d === null ? '—' : d === 0 ? 'today' : `${d} day${d === 1 ? '' : 's'}`;
}

type Row = ClaimListItem;

/**
 * The queue, oldest submission first: each claim's age, agency, unit, amount and flags, and who
 * has it. A waiting claim can be taken from here.
 */
export function ReviewQueueTable({
  items,
  now = new Date(),
  myName,
  canStart,
  startingId,
  onStart,
}: {
  items: Row[];
  now?: Date;
  /** The signed-in reviewer's name, to say "with you". */
  myName?: string;
  canStart: (c: Row) => boolean;
  startingId: string | null;
  onStart: (c: Row) => void;
}) {
  const timeZone = useOrganisationTimeZone();
  return (
    <ol className="divide-y divide-ink-100" aria-label="Claims in the queue, oldest first">
      {items.map((c) => {
        const mine = !!myName && c.reviewerName === myName;
        return (
          <li key={c.id} className="grid grid-cols-[4.5rem_minmax(0,1fr)_auto] gap-x-3 gap-y-2 px-4 py-3 sm:grid-cols-[6rem_minmax(0,2fr)_minmax(0,1.2fr)_8rem_11rem] sm:items-center">
            <p className="order-1 text-sm">
              <span className="block text-lg font-semibold tabular-nums text-ink-900 sm:text-2xl">{age(c, now, timeZone)}</span>
              <span className="text-xs text-ink-600">since {formatDate(c.submittedAt?.slice(0, 10))}</span>
            </p>
            <div className="order-2 min-w-0 text-sm">
              <Link to={paths.claim(c.id)} className="font-mono font-semibold text-ink-800 underline-offset-2 hover:underline">
                {c.number}
              </Link>
              <p className="truncate text-ink-800">{c.agencyName}</p>
              <p className="truncate text-ink-600">{[c.modelNumber, c.serial].filter(Boolean).join(' · ') || 'No unit'}</p>
            </div>
            <p className="order-3 text-right text-sm tabular-nums sm:order-4">
              <span className="font-semibold">{formatCents(c.claimedTotalCents, c.currency)}</span>
              <span className="block text-xs text-ink-600">allowed</span>
            </p>
            <ul className="order-4 col-span-3 flex flex-wrap gap-1 sm:order-3 sm:col-span-1" aria-label="Flags">
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
            <div className="order-5 col-span-3 flex flex-wrap items-center gap-2 text-sm sm:col-span-1 sm:justify-end sm:text-right">
              {c.state === 'in_review' ? (
                <>
                  <Badge tone="violet">In review</Badge>
                  {mine ? (
                    <Link to={paths.claim(c.id)} className="font-medium text-ink-800 underline underline-offset-2">
                      with you: continue
                    </Link>
                  ) : (
                    <span className="text-ink-700">{c.reviewerName ? `with ${c.reviewerName}` : 'taken'}</span>
                  )}
                </>
              ) : canStart(c) ? (
                <Button size="sm" onClick={() => onStart(c)} pending={startingId === c.id} disabled={startingId !== null} aria-label={`Start review of ${c.number}`}>
                  Start review
                </Button>
              ) : (
                <Badge tone="blue">Waiting</Badge>
              )}
            </div>
          </li>
        );
      })}
    </ol>
  );
}
