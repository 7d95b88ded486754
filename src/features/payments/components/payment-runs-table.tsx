import { Link } from 'react-router';
import type { PaymentRunSummary } from '@shared/schemas/payment';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { formatCents, formatDate, formatDateTime } from '@/lib/format';
import { paymentPaths } from '../paths';
import { RunStateBadge } from './run-state-badge';

export function PaymentRunsTable({ runs, showAgency }: { runs: PaymentRunSummary[]; showAgency: boolean }) {
  return (
    <Table caption="Payment runs">
      <THead>
        <Tr>
          <Th>Run</Th>
          {showAgency && <Th>Service agency</Th>}
          <Th>State</Th>
          <Th className="text-right">Claims</Th>
          <Th className="text-right">Total</Th>
          <Th>Paid on</Th>
          <Th>Reference</Th>
          <Th>Created</Th>
        </Tr>
      </THead>
      <TBody>
        {runs.map((r) => (
          <Tr key={r.id}>
            <Td>
              <Link to={paymentPaths.run(r.id)} className="font-mono font-medium text-ink-800 underline underline-offset-2 hover:text-ink-900">
                {r.number}
              </Link>
            </Td>
            {showAgency && <Td>{r.agencyName}</Td>}
            <Td>
              <RunStateBadge state={r.state} />
            </Td>
            <Td className="text-right tabular-nums">{r.claimCount}</Td>
            <Td className="text-right tabular-nums">{formatCents(r.totalCents, r.currency)}</Td>
            <Td>{formatDate(r.paymentDate)}</Td>
            <Td className="break-all">{r.reference ?? '—'}</Td>
            <Td className="text-ink-600">{formatDateTime(r.createdAt)}</Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
