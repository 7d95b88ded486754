import type { Valuation } from '@shared/calculations/valuation';
import { Badge } from '@/components/ui/badge';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { formatCents, formatDate } from '@/lib/format';

const unitText: Record<string, string> = { h: 'h', mi: 'mi', each: '' };

/**
 * The computed value of the claim: coverage on the failure date, each line with the
 * rule that priced it and what bound it, the flags a reviewer sees, and the totals.
 */
export function ValuationBreakdown({ valuation }: { valuation: Valuation }) {
  const cur = valuation.currency;
  const { coverage, totals } = valuation;
  const rows = [
    { label: 'Labor', key: 'laborCents' as const },
    { label: 'Travel', key: 'travelCents' as const },
    { label: 'Parts', key: 'partsCents' as const },
    { label: 'Total', key: 'totalCents' as const },
  ];
  return (
    <Card aria-labelledby="claim-valuation">
      <CardHeader id="claim-valuation" title="Valuation" description="What the rules allow for each line, and why. Open a line for its working." />
      <CardBody className="space-y-5">
        <section aria-label="Coverage" className="grid gap-2 sm:grid-cols-2">
          {(['parts', 'labor'] as const).map((k) => {
            const d = coverage[k];
            return (
              <div key={k} className="rounded-md border border-ink-100 p-3 text-sm">
                <p className="flex items-center gap-2 font-medium">
                  {k === 'parts' ? 'Parts coverage' : 'Labor coverage'}
                  <Badge tone={d.covered ? 'green' : 'red'}>{d.covered ? 'Covered' : 'Not covered'}</Badge>
                </p>
                <p className="mt-1 text-ink-700">{d.reason}</p>
                <p className="text-xs text-ink-600">Last covered day {formatDate(d.until)}</p>
              </div>
            );
          })}
        </section>

        {valuation.flags.length > 0 && (
          <section aria-labelledby="valuation-flags">
            <h3 id="valuation-flags" className="text-sm font-semibold text-ink-800">
              Flags for the reviewer
            </h3>
            <ul className="mt-2 space-y-2">
              {valuation.flags.map((f) => (
                <li key={f.code + f.lineIds.join()} className="rounded-md border border-brass-200 bg-brass-50 px-3 py-2 text-sm">
                  <p className="font-medium text-brass-700">{f.label}</p>
                  <p className="text-ink-800">{f.reason}</p>
                </li>
              ))}
            </ul>
          </section>
        )}

        <section aria-labelledby="valuation-lines" className="space-y-2">
          <h3 id="valuation-lines" className="text-sm font-semibold text-ink-800">
            Lines
          </h3>
          {valuation.lines.length === 0 && <p className="text-sm text-ink-600">No lines to value.</p>}
          <ul className="space-y-2">
            {valuation.lines.map((l) => (
              <li key={l.id} className="rounded-md border border-ink-100">
                <details>
                  <summary className="flex cursor-pointer flex-wrap items-baseline justify-between gap-2 px-3 py-2 text-sm">
                    <span>
                      <span className="font-medium">{l.description}</span>
                      <span className="text-ink-600">
                        {' '}
                        · {l.quantity.toLocaleString('en-US')} {unitText[l.quantityUnit]}
                      </span>
                      {!l.covered && (
                        <Badge tone="red" className="ml-2">
                          Not covered
                        </Badge>
                      )}
                      {l.adjustment && (
                        <Badge tone="brass" className="ml-2">
                          Adjusted
                        </Badge>
                      )}
                    </span>
                    <span className="tabular-nums">
                      {l.requestedCents !== l.claimedCents && (
                        <span className="text-ink-600">
                          entered <s>{formatCents(l.requestedCents, cur)}</s> ·{' '}
                        </span>
                      )}
                      <span className="text-ink-600">allowed</span> {formatCents(l.claimedCents, cur)}
                      {l.adjustment && (
                        <>
                          {' '}
                          <span className="text-ink-600">· approved</span> {formatCents(l.approvedCents, cur)}
                        </>
                      )}
                    </span>
                  </summary>
                  <div className="space-y-2 border-t border-ink-100 px-3 py-2 text-sm">
                    <p className="text-ink-700">
                      <span className="font-medium">Rule:</span> {l.rule}
                    </p>
                    {l.binding.length > 0 && (
                      <p className="text-ink-700">
                        <span className="font-medium">Bound by:</span> {l.binding.join('; ')}
                      </p>
                    )}
                    {l.adjustment && (
                      <p className="text-brass-700">
                        <span className="font-medium">Reviewer’s reason:</span> {l.adjustment.reason}
                      </p>
                    )}
                    <ol className="list-decimal space-y-0.5 pl-5 text-ink-800">
                      {l.explanation.map((x, i) => (
                        <li key={i}>{x}</li>
                      ))}
                    </ol>
                  </div>
                </details>
              </li>
            ))}
          </ul>
        </section>

        {valuation.readings.length > 0 && (
          <section aria-labelledby="valuation-readings">
            <h3 id="valuation-readings" className="text-sm font-semibold text-ink-800">
              Readings against the specification
            </h3>
            <ul className="mt-2 space-y-1 text-sm">
              {valuation.readings.map((r, i) => (
                <li key={i} className="flex items-start gap-2">
                  <Badge tone={r.pass ? 'green' : r.failsAfterRepair ? 'red' : 'orange'}>{r.pass ? 'Pass' : 'Out of tolerance'}</Badge>
                  <span className="text-ink-800">{r.explanation}</span>
                </li>
              ))}
            </ul>
          </section>
        )}

        <Table caption="Totals entered, allowed and approved">
          <THead>
            <Tr>
              <Th>Amount</Th>
              <Th className="text-right">Entered</Th>
              <Th className="text-right">Allowed</Th>
              <Th className="text-right">Approved</Th>
            </Tr>
          </THead>
          <TBody>
            {rows.map((r) => (
              <Tr key={r.key} className={r.key === 'totalCents' ? 'font-semibold' : undefined}>
                <Th scope="row">{r.label}</Th>
                <Td className="text-right tabular-nums">{formatCents(totals.requested[r.key], cur)}</Td>
                <Td className="text-right tabular-nums">{formatCents(totals.claimed[r.key], cur)}</Td>
                <Td className="text-right tabular-nums">{formatCents(totals.approved[r.key], cur)}</Td>
              </Tr>
            ))}
          </TBody>
        </Table>
        <p className="text-xs text-ink-600">{valuation.rounding}</p>
      </CardBody>
    </Card>
  );
}
