import { Link } from 'react-router';
import type { ClaimDetail } from '@shared/schemas/claim';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { paths } from '@/config/paths';
import { formatCents, formatDate, formatDateTime } from '@/lib/format';
import { ClaimStateBadge } from '@/features/claims/components/claim-state-badge';
import { useUnitClaims } from '@/features/claims/api/get-unit-claims';
import { useSubmissionChanges } from '@/features/claims/api/get-submission-changes';

/** The other claims on the same unit, of every agency the user may read (a repeat repair shows at once). */
export function UnitClaimsPanel({ claim }: { claim: ClaimDetail }) {
  const q = useUnitClaims(claim.id);
  const items = q.data?.items ?? [];
  const titleId = `unit-claims-${claim.id}`;
  return (
    <Card aria-labelledby={titleId}>
      <CardHeader id={titleId} title="Other claims on this unit" description={claim.serial ? `Serial ${claim.serial}` : undefined} />
      <CardBody>
        {q.isPending ? (
          <p className="text-sm text-ink-600">Loading…</p>
        ) : q.isError ? (
          <p className="text-sm text-red-800">The unit’s other claims could not be loaded.</p>
        ) : items.length === 0 ? (
          <p className="text-sm text-ink-600">No other claim on this unit.</p>
        ) : (
          <ul className="divide-y divide-ink-100 text-sm" aria-label="Other claims on this unit">
            {items.map((c) => (
              <li key={c.id} className="flex flex-wrap items-center justify-between gap-x-3 gap-y-1 py-2">
                <span className="min-w-0 break-words">
                  <Link to={paths.claim(c.id)} className="font-mono text-ink-800 underline underline-offset-2">
                    {c.number}
                  </Link>{' '}
                  <span className="text-ink-700">
                    {c.agencyName} · repaired {formatDate(c.repairDate)}
                  </span>
                </span>
                <span className="flex items-center gap-2">
                  <ClaimStateBadge state={c.state} />
                  <span className="tabular-nums text-ink-700">{formatCents(c.approvedTotalCents ?? c.claimedTotalCents, c.currency)}</span>
                </span>
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}

/** For a resubmitted claim: each field that differs from the previous submission, before and after. */
export function SubmissionChangesPanel({ claim }: { claim: ClaimDetail }) {
  const resubmitted = claim.resubmissionCount > 0;
  const q = useSubmissionChanges(claim.id, resubmitted);
  if (!resubmitted) return null;
  const titleId = `changes-${claim.id}`;
  const d = q.data;
  return (
    <Card aria-labelledby={titleId}>
      <CardHeader
        id={titleId}
        title="Changed since the last submission"
        description={d?.previousAt && d.latestAt ? `Submitted ${formatDateTime(d.previousAt)}, again ${formatDateTime(d.latestAt)}.` : undefined}
      />
      <CardBody className="px-0 py-0">
        {q.isPending ? (
          <p className="px-4 py-3 text-sm text-ink-600">Loading…</p>
        ) : q.isError ? (
          <p className="px-4 py-3 text-sm text-red-800">The changes could not be loaded.</p>
        ) : d?.unrecorded ? (
          <p className="px-4 py-3 text-sm text-ink-600">The earlier submission was made before submissions were recorded; compare with the activity below.</p>
        ) : !d || d.changes.length === 0 ? (
          <p className="px-4 py-3 text-sm text-ink-600">Nothing changed in the lines, readings, story or evidence.</p>
        ) : (
          <Table caption="Fields changed since the last submission">
            <THead>
              <Tr>
                <Th>Field</Th>
                <Th>Before</Th>
                <Th>After</Th>
              </Tr>
            </THead>
            <TBody>
              {d.changes.map((ch) => (
                <Tr key={ch.field}>
                  <Th scope="row" className="font-medium break-words">
                    {ch.field}
                  </Th>
                  <Td className="break-words text-ink-700">{ch.before ?? <span className="text-ink-600">(none)</span>}</Td>
                  <Td className="break-words">{ch.after ?? <span className="text-ink-600">(removed)</span>}</Td>
                </Tr>
              ))}
            </TBody>
          </Table>
        )}
      </CardBody>
    </Card>
  );
}
