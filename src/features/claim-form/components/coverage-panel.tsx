import type { CoverageResult } from '@shared/calculations/coverage';
import { Badge } from '@/components/ui/badge';
import { formatDate } from '@/lib/format';

const basisText: Record<CoverageResult['startBasis'], string> = {
  install: 'counted from the install date',
  ship_plus_grace: 'counted from the ship date plus the grace period (no install date recorded)',
  ship: 'counted from the ship date',
};

/** Parts and labor coverage on one date, each with its last covered day and the reason. */
export function CoveragePanel({ coverage, on }: { coverage: CoverageResult; on: string }) {
  return (
    <section aria-label={`Coverage on ${formatDate(on)}`} className="space-y-2">
      <p className="text-sm text-ink-700">
        Coverage on <span className="font-medium">{formatDate(on)}</span>, {basisText[coverage.startBasis]} ({formatDate(coverage.startDate)}).
      </p>
      <div className="grid gap-2 sm:grid-cols-2">
        {(['parts', 'labor'] as const).map((k) => {
          const d = coverage[k];
          return (
            <div key={k} className={d.covered ? 'rounded-md border border-emerald-200 bg-emerald-50/50 p-3 text-sm' : 'rounded-md border border-red-200 bg-red-50/60 p-3 text-sm'}>
              <p className="flex flex-wrap items-center gap-2 font-medium text-ink-900">
                {k === 'parts' ? 'Parts' : 'Labor'}
                <Badge tone={d.covered ? 'green' : 'red'}>{d.covered ? 'Covered' : 'Not covered'}</Badge>
              </p>
              <p className="mt-1 text-ink-800">
                {d.covered ? 'Covered until' : 'Coverage ended'} <span className="font-medium">{formatDate(d.until)}</span> · {d.months} months
              </p>
              <p className="text-ink-700">{d.reason}</p>
            </div>
          );
        })}
      </div>
      {coverage.components.length > 0 && (
        <ul className="space-y-1 text-sm text-ink-700">
          {coverage.components.map((c) => (
            <li key={c.partId}>
              <span className="font-medium">{c.label}</span>: parts-only term of {c.months} months, {c.covered ? `covered until ${formatDate(c.until)}` : `ended ${formatDate(c.until)}`}.
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
