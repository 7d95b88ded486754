import type { ReactNode } from 'react';
import type { ClaimDetail } from '@shared/schemas/claim';
import type { Valuation } from '@shared/calculations/valuation';
import { Badge } from '@/components/ui/badge';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { formatCents, formatHours } from '@/lib/format';

const returnStatusLabels: Record<string, string> = {
  not_required: 'Not required',
  awaiting: 'Awaiting return',
  shipped: 'Shipped',
  received: 'Received',
  waived: 'Waived',
};

function Money({ cents, currency }: { cents: number | null | undefined; currency: string }) {
  return <span className="tabular-nums">{formatCents(cents, currency)}</span>;
}

function Adjusted({ reason }: { reason: string | null }) {
  if (!reason) return null;
  return <p className="mt-1 text-xs text-brass-700">Adjusted: {reason}</p>;
}

function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="space-y-2">
      <h3 className="px-4 text-sm font-semibold text-ink-800">{title}</h3>
      {children}
    </div>
  );
}

/**
 * Labor, travel and parts as filed, with the amount the agency entered (from the
 * valuation, when it could be computed) and the amount approved by the reviewer.
 */
export function ClaimLines({ claim, valuation }: { claim: ClaimDetail; valuation?: Valuation | null }) {
  const cur = claim.currency;
  // Claimed = the line as the agency entered it (these add up to the claimed total);
  // what the rules allow is in the valuation below.
  const claimedById = new Map((valuation?.lines ?? []).map((l) => [l.id, l.requestedCents]));
  const travelClaimed = valuation ? valuation.lines.filter((l) => l.kind === 'travel_distance' || l.kind === 'travel_time').reduce((s, l) => s + l.requestedCents, 0) : null;
  const empty = claim.laborLines.length === 0 && !claim.travel && claim.partLines.length === 0;

  return (
    <Card aria-labelledby="claim-lines">
      <CardHeader
        id="claim-lines"
        title="Labor, travel and parts"
        description={empty ? undefined : valuation ? 'Entered is what the agency entered; approved is what the reviewer decided. Allowed (in the valuation below) is what the rules allow.' : 'Per-line entered amounts appear once the valuation is available.'}
      />
      <div className="space-y-5 py-3">
        {empty && <CardBody className="text-sm text-ink-600">No lines entered yet.</CardBody>}
        {claim.laborLines.length > 0 && (
          <Section title="Labor">
            <Table caption="Labor lines">
              <THead>
                <Tr>
                  <Th>Repair code</Th>
                  <Th className="text-right">Worked</Th>
                  <Th className="text-right">Allowance (h)</Th>
                  <Th className="text-right">Approved hours</Th>
                  <Th className="text-right">Entered</Th>
                  <Th className="text-right">Approved</Th>
                </Tr>
              </THead>
              <TBody>
                {claim.laborLines.map((l) => (
                  <Tr key={l.id}>
                    <Td>
                      <span className="font-medium">{l.repairCode}</span> {l.description}
                      {l.overtime && (
                        <Badge tone="brass" className="ml-2">
                          Overtime
                        </Badge>
                      )}
                      {l.note && <p className="mt-1 text-xs text-ink-600">{l.note}</p>}
                      <Adjusted reason={l.adjustmentReason} />
                    </Td>
                    <Td className="text-right tabular-nums">{formatHours(l.hoursWorked)}</Td>
                    <Td className="text-right tabular-nums">{formatHours(l.allowedHours)}</Td>
                    <Td className="text-right tabular-nums">{formatHours(l.approvedHours)}</Td>
                    <Td className="text-right">
                      <Money cents={claimedById.get(l.id)} currency={cur} />
                    </Td>
                    <Td className="text-right">
                      <Money cents={l.approvedAmountCents} currency={cur} />
                    </Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
          </Section>
        )}
        {claim.travel && (
          <Section title="Travel">
            <Table caption="Travel">
              <THead>
                <Tr>
                  <Th>Round trip</Th>
                  <Th className="text-right">Travel time</Th>
                  <Th className="text-right">Entered</Th>
                  <Th className="text-right">Approved</Th>
                </Tr>
              </THead>
              <TBody>
                <Tr>
                  <Td>
                    <span className="tabular-nums">{claim.travel.roundTripMiles.toLocaleString('en-US')} mi</span>
                    <Adjusted reason={claim.travel.adjustmentReason} />
                  </Td>
                  <Td className="text-right tabular-nums">{formatHours(claim.travel.travelHours)}</Td>
                  <Td className="text-right">
                    <Money cents={travelClaimed} currency={cur} />
                  </Td>
                  <Td className="text-right">
                    <Money cents={claim.travel.approvedAmountCents} currency={cur} />
                  </Td>
                </Tr>
              </TBody>
            </Table>
          </Section>
        )}
        {claim.partLines.length > 0 && (
          <Section title="Parts">
            <Table caption="Part lines">
              <THead>
                <Tr>
                  <Th>Part</Th>
                  <Th className="text-right">Qty</Th>
                  <Th className="text-right">List price</Th>
                  <Th>Return</Th>
                  <Th className="text-right">Entered</Th>
                  <Th className="text-right">Approved</Th>
                </Tr>
              </THead>
              <TBody>
                {claim.partLines.map((p) => (
                  <Tr key={p.id}>
                    <Td>
                      <span className="font-mono font-medium">{p.partNumber}</span> {p.description}
                      <Adjusted reason={p.adjustmentReason} />
                    </Td>
                    <Td className="text-right tabular-nums">
                      {p.quantity}
                      {p.approvedQuantity !== null && p.approvedQuantity !== p.quantity && <span className="block text-xs text-brass-700">approved {p.approvedQuantity}</span>}
                    </Td>
                    <Td className="text-right">
                      <Money cents={p.listPriceCents} currency={cur} />
                    </Td>
                    <Td>
                      {p.returnRequired ? (
                        <span>
                          {returnStatusLabels[p.returnStatus] ?? p.returnStatus}
                          {p.trackingNumber && <span className="block text-xs text-ink-600">{[p.carrier, p.trackingNumber].filter(Boolean).join(' ')}</span>}
                        </span>
                      ) : (
                        <span className="text-ink-500">Not required</span>
                      )}
                    </Td>
                    <Td className="text-right">
                      <Money cents={claimedById.get(p.id)} currency={cur} />
                    </Td>
                    <Td className="text-right">
                      <Money cents={p.approvedAmountCents} currency={cur} />
                    </Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
          </Section>
        )}
        <dl className="mx-4 flex flex-wrap justify-end gap-x-8 gap-y-1 border-t border-ink-100 pt-3 text-sm">
          <div className="flex gap-2">
            <dt className="text-ink-600">Allowed total</dt>
            <dd className="font-semibold tabular-nums">{formatCents(claim.claimedTotalCents, cur)}</dd>
          </div>
          <div className="flex gap-2">
            <dt className="text-ink-600">Approved total</dt>
            <dd className="font-semibold tabular-nums">{formatCents(claim.approvedTotalCents, cur)}</dd>
          </div>
        </dl>
      </div>
    </Card>
  );
}
