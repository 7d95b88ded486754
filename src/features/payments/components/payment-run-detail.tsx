import { Link } from 'react-router';
import { claimStateLabels, type ClaimState } from '@shared/schemas/claim';
import type { PaymentRunDetail } from '@shared/schemas/payment';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { DescriptionList } from '@/components/ui/description-list';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { errorMessage } from '@/lib/api-client';
import { formatCents, formatDate, formatDateTime, plural } from '@/lib/format';
import { useVoidPaymentRun } from '../api/update-payment-run';
import { paymentPaths } from '../paths';
import { MarkPaidDialog } from './mark-paid-dialog';
import { RunStateBadge } from './run-state-badge';

function VoidButton({ run }: { run: PaymentRunDetail }) {
  const voiding = useVoidPaymentRun(run.id);
  return (
    <>
      <Button
        variant="secondary"
        pending={voiding.isPending}
        onClick={() => {
          if (window.confirm(`Void ${run.number}? Its claims go back to the ready list.`)) voiding.mutate();
        }}
      >
        Void run
      </Button>
      {voiding.isError && <Alert tone="error">{errorMessage(voiding.error)}</Alert>}
    </>
  );
}

export function PaymentRunView({ run }: { run: PaymentRunDetail }) {
  const cur = run.currency;
  const facts = [
    { label: 'Service agency', value: run.agencyName },
    { label: 'Claims', value: String(run.claims.length) },
    { label: 'Total', value: formatCents(run.totalCents, cur) },
    { label: 'Created', value: `${formatDateTime(run.createdAt)}${run.createdByName ? ` by ${run.createdByName}` : ''}` },
    ...(run.state === 'paid'
      ? [
          { label: 'Payment date', value: formatDate(run.paymentDate) },
          { label: 'Reference', value: run.reference ?? '—' },
          { label: 'Marked paid', value: `${formatDateTime(run.paidAt)}${run.paidByName ? ` by ${run.paidByName}` : ''}` },
        ]
      : []),
    ...(run.state === 'void' ? [{ label: 'Voided', value: formatDateTime(run.voidedAt) }] : []),
  ];
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <div className="flex items-center gap-3">
            <h1 className="font-mono text-2xl font-semibold text-ink-900">{run.number}</h1>
            <RunStateBadge state={run.state} />
          </div>
          <p className="mt-1 text-sm text-ink-700">
            {run.agencyName} · {plural(run.claims.length, 'claim')} · {formatCents(run.totalCents, cur)}
          </p>
        </div>
        {run.allowedActions.length > 0 && (
          <div className="flex flex-wrap gap-2">
            {run.allowedActions.includes('mark_paid') && <MarkPaidDialog run={run} />}
            {run.allowedActions.includes('void') && <VoidButton run={run} />}
          </div>
        )}
      </div>
      {run.state === 'paid' && (
        <Alert tone="success" title="Paid">
          Paid on {formatDate(run.paymentDate)}, reference {run.reference}. The remittance went to the agency’s admins.
        </Alert>
      )}
      {run.state === 'void' && <Alert tone="info">This run was voided; its claims were freed for another run.</Alert>}
      <Card aria-labelledby="run-facts">
        <CardHeader id="run-facts" title="Run" />
        <CardBody>
          <DescriptionList items={facts} />
        </CardBody>
      </Card>
      <Card aria-labelledby="run-claims">
        <CardHeader id="run-claims" title="Claims in this run" />
        <Table caption={`Claims in ${run.number}`}>
          <THead>
            <Tr>
              <Th>Claim</Th>
              <Th>State</Th>
              <Th>Technician</Th>
              <Th>Unit</Th>
              <Th>Repair date</Th>
              <Th className="text-right">Labor</Th>
              <Th className="text-right">Travel</Th>
              <Th className="text-right">Parts</Th>
              <Th className="text-right">Amount</Th>
            </Tr>
          </THead>
          <TBody>
            {run.claims.map((c) => (
              <Tr key={c.id}>
                <Td>
                  <Link to={paymentPaths.claim(c.id)} className="font-mono font-medium underline underline-offset-2">
                    {c.number}
                  </Link>
                </Td>
                <Td>
                  <Badge tone={c.state === 'paid' ? 'ink' : 'green'}>{claimStateLabels[c.state as ClaimState] ?? c.state}</Badge>
                </Td>
                <Td>{c.technicianName}</Td>
                <Td>
                  {c.modelNumber ?? '—'}
                  {c.unitSerial && <span className="block font-mono text-xs text-ink-600">{c.unitSerial}</span>}
                </Td>
                <Td>{formatDate(c.repairDate)}</Td>
                <Td className="text-right tabular-nums">{formatCents(c.approvedLaborCents, cur)}</Td>
                <Td className="text-right tabular-nums">{formatCents(c.approvedTravelCents, cur)}</Td>
                <Td className="text-right tabular-nums">{formatCents(c.approvedPartsCents, cur)}</Td>
                <Td className="text-right font-medium tabular-nums">{formatCents(c.amountCents, cur)}</Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      </Card>
    </div>
  );
}
