import { useId, useState } from 'react';
import { Link } from 'react-router';
import type { PaymentRunDetail, ReadyAgencyGroup } from '@shared/schemas/payment';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { errorMessage } from '@/lib/api-client';
import { formatCents, formatDate, plural } from '@/lib/format';
import { useCreatePaymentRun } from '../api/create-payment-run';
import { paymentPaths } from '../paths';

/**
 * One agency's approved claims that are ready to pay, with a checkbox each and the total of
 * the selection; "Create payment run" puts the selected claims into a new open run.
 */
export function ReadyAgencyCard({ group, onCreated }: { group: ReadyAgencyGroup; onCreated: (run: PaymentRunDetail) => void }) {
  const payable = group.claims.filter((c) => !c.decidedByYou);
  const [selected, setSelected] = useState<Set<string>>(() => new Set(payable.map((c) => c.id)));
  const create = useCreatePaymentRun();
  const headingId = useId();
  const chosen = group.claims.filter((c) => selected.has(c.id));
  const total = chosen.reduce((s, c) => s + c.approvedTotalCents, 0);
  const allChosen = payable.length > 0 && payable.every((c) => selected.has(c.id));

  const toggle = (id: string) =>
    setSelected((s) => {
      const next = new Set(s);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  const toggleAll = () => setSelected(allChosen ? new Set() : new Set(payable.map((c) => c.id)));

  return (
    <Card aria-labelledby={headingId}>
      <CardHeader
        id={headingId}
        title={group.agencyName}
        description={`${plural(group.claimCount, 'claim')} ready · ${formatCents(group.totalCents, group.currency)}${group.heldForReturns > 0 ? ` · ${plural(group.heldForReturns, 'more claim')} waiting for part returns` : ''}`}
      />
      {group.claims.length === 0 ? (
        <CardBody className="text-sm text-ink-600">Nothing to pay yet: every approved claim of this agency waits for a part return.</CardBody>
      ) : (
        <>
          <Table caption={`Claims of ${group.agencyName} ready to pay`}>
            <THead>
              <Tr>
                <Th className="w-10">
                  <input type="checkbox" aria-label={`Select every claim of ${group.agencyName}`} checked={allChosen} onChange={toggleAll} disabled={payable.length === 0} className="size-5" />
                </Th>
                <Th>Claim</Th>
                <Th>Technician</Th>
                <Th>Unit</Th>
                <Th>Repair date</Th>
                <Th className="text-right">Labor</Th>
                <Th className="text-right">Travel</Th>
                <Th className="text-right">Parts</Th>
                <Th className="text-right">Approved</Th>
              </Tr>
            </THead>
            <TBody>
              {group.claims.map((c) => (
                <Tr key={c.id}>
                  <Td>
                    <input
                      type="checkbox"
                      className="size-5"
                      aria-label={`Pay claim ${c.number}`}
                      checked={selected.has(c.id)}
                      disabled={c.decidedByYou}
                      onChange={() => toggle(c.id)}
                    />
                  </Td>
                  <Td>
                    <Link to={paymentPaths.claim(c.id)} className="font-mono font-medium underline underline-offset-2">
                      {c.number}
                    </Link>
                    {c.decidedByYou && <p className="text-xs text-brass-700">You approved this claim; someone else must pay it.</p>}
                  </Td>
                  <Td>{c.technicianName}</Td>
                  <Td>
                    {c.modelNumber ?? '—'}
                    {c.unitSerial && <span className="block font-mono text-xs text-ink-600">{c.unitSerial}</span>}
                  </Td>
                  <Td>{formatDate(c.repairDate)}</Td>
                  <Td className="text-right tabular-nums">{formatCents(c.approvedLaborCents, c.currency)}</Td>
                  <Td className="text-right tabular-nums">{formatCents(c.approvedTravelCents, c.currency)}</Td>
                  <Td className="text-right tabular-nums">{formatCents(c.approvedPartsCents, c.currency)}</Td>
                  <Td className="text-right font-medium tabular-nums">{formatCents(c.approvedTotalCents, c.currency)}</Td>
                </Tr>
              ))}
            </TBody>
          </Table>
          <CardBody className="flex flex-wrap items-center justify-between gap-3 border-t border-ink-100">
            <p className="text-sm" aria-live="polite">
              Selected: <span className="font-semibold">{plural(chosen.length, 'claim')}</span>, <span className="font-semibold tabular-nums">{formatCents(total, group.currency)}</span>
            </p>
            <Button
              pending={create.isPending}
              disabled={chosen.length === 0}
              onClick={() => create.mutate({ agencyId: group.agencyId, claimIds: chosen.map((c) => c.id) }, { onSuccess: onCreated })}
            >
              Create payment run
            </Button>
          </CardBody>
          {create.isError && (
            <CardBody>
              <Alert tone="error" title="The run was not created">
                {errorMessage(create.error)}
              </Alert>
            </CardBody>
          )}
        </>
      )}
    </Card>
  );
}
