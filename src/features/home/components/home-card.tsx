import { Link } from 'react-router';
import type { HomeCard as HomeCardData } from '@shared/schemas/home';
import type { ClaimListItem } from '@shared/schemas/claim';
import { paths } from '@/config/paths';
import { cx } from '@/lib/cx';
import { ageInDays, formatCents } from '@/lib/format';
import { useOrganisationTimeZone } from '@/lib/business-day';

const toneBar: Record<HomeCardData['tone'], string> = {
  action: 'border-t-brass-400',
  warning: 'border-t-orange-600',
  info: 'border-t-ink-400',
};

const amountWord: Record<HomeCardData['amount'], string> = { approved: 'Approved', allowed: 'Allowed' };

/** What a draft's filing window says on its agency's today. */
export function filingText(f: NonNullable<ClaimListItem['filing']>): string {
  if (f.late) return `Filing window passed on ${f.lastDay}`;
  if (f.daysLeft === 0) return 'Last day to file';
  return `${f.daysLeft} day${f.daysLeft === 1 ? '' : 's'} left to file`;
}

/** One queue: how many wait, what to do, and the oldest few, each one tap away. */
export function HomeCard({ card, now, showAgency = true }: { card: HomeCardData; now?: Date; showAgency?: boolean }) {
  const headingId = `home-card-${card.key}`;
  const timeZone = useOrganisationTimeZone();
  return (
    <section aria-labelledby={headingId} className={cx('flex flex-col rounded-lg border border-t-4 border-ink-100 bg-white shadow-sm', toneBar[card.tone])}>
      <header className="flex items-start justify-between gap-3 px-4 pt-4">
        <div>
          <h2 id={headingId} className="font-semibold text-ink-900">
            {card.label}
          </h2>
          <p className="text-sm text-ink-600">{card.hint}</p>
        </div>
        <p className="text-3xl font-bold tabular-nums text-ink-800">
          {card.count.toLocaleString('en-US')}
          {card.kind === 'queue' && <span className="sr-only"> waiting</span>}
        </p>
      </header>
      {card.items.length > 0 ? (
        <>
          <h3 className="sr-only">Oldest first</h3>
          <ul className="mt-3 flex-1 divide-y divide-ink-100 border-t border-ink-100">
            {card.items.map((c) => {
              const age = ageInDays(c.submittedAt ?? c.createdAt, now, timeZone);
              return (
                <li key={c.id}>
                  <Link to={paths.claim(c.id)} className="flex items-center justify-between gap-3 px-4 py-2.5 text-sm hover:bg-paper">
                    <span className="min-w-0">
                      <span className="block font-mono font-medium text-ink-800">{c.number}</span>
                      <span className="block truncate text-ink-600">{showAgency ? c.agencyName : [c.technicianName, c.modelNumber].filter(Boolean).join(' · ')}</span>
                    </span>
                    <span className="shrink-0 text-right">
                      <span className="block tabular-nums font-medium">
                        <span className="sr-only">{amountWord[card.amount]} </span>
                        {formatCents(card.amount === 'approved' ? (c.approvedTotalCents ?? c.claimedTotalCents) : c.claimedTotalCents, c.currency)}
                      </span>
                      {c.state === 'draft' && c.filing ? (
                        <span className={cx('block text-xs', c.filing.late ? 'font-medium text-orange-800' : 'text-ink-600')}>{filingText(c.filing)}</span>
                      ) : (
                        <span className="block text-xs text-ink-600">{age === null ? '' : age === 0 ? 'today' : `${age} day${age === 1 ? '' : 's'} old`}</span>
                      )}
                    </span>
                  </Link>
                </li>
              );
            })}
          </ul>
        </>
      ) : card.kind === 'queue' && card.count === 0 ? (
        <p className="flex-1 px-4 pb-2 pt-3 text-sm text-ink-600">Nothing waiting.</p>
      ) : card.kind === 'count' && card.count === 0 ? (
        <p className="flex-1 px-4 pb-2 pt-3 text-sm text-ink-600">None yet.</p>
      ) : (
        <div className="flex-1" />
      )}
      <footer className="border-t border-ink-100 px-4 py-2.5">
        <Link to={card.href} className="text-sm font-medium text-ink-700 underline-offset-2 hover:underline">
          {card.count > card.items.length ? `See all ${card.count.toLocaleString('en-US')}` : 'Open the list'}
          <span className="sr-only"> · {card.label}</span>
        </Link>
      </footer>
    </section>
  );
}
