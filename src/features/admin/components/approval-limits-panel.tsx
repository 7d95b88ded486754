import { useState } from 'react';
import type { ApprovalLimitRow } from '@shared/schemas/approval-limits';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Input } from '@/components/ui/input';
import { errorMessage } from '@/lib/api-client';
import { formatCents } from '@/lib/format';
import { useApprovalLimits } from '../api/get-approval-limits';
import { useSetApprovalLimit } from '../api/set-approval-limit';

/** "1250" or "1250.50" as cents; empty is no limit; anything else undefined. */
export function limitToCents(text: string): number | null | undefined {
  const t = text.trim();
  if (t === '') return null;
  const m = /^(\d{1,8})(?:\.(\d{1,2}))?$/.exec(t);
  if (!m) return undefined;
  return Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
}

function LimitRow({ row }: { row: ApprovalLimitRow }) {
  const set = useSetApprovalLimit();
  const [text, setText] = useState(row.limitCents === null ? '' : (row.limitCents / 100).toFixed(2));
  const [error, setError] = useState<string | undefined>();
  const id = `limit-${row.userId}`;
  const save = () => {
    const cents = limitToCents(text);
    if (cents === undefined) {
      setError('Enter an amount like 2500 or 2500.00, or leave it empty for no limit.');
      return;
    }
    setError(undefined);
    set.mutate({ userId: row.userId, body: { limitCents: cents } }, { onError: (e) => setError(errorMessage(e)) });
  };
  return (
    <li className="flex flex-wrap items-end gap-3 py-3">
      <div className="min-w-0 flex-1 text-sm">
        <p className="font-medium text-ink-900">{row.name}</p>
        <p className="text-ink-600">{row.limitCents === null ? 'No limit' : `Limit ${formatCents(row.limitCents, 'USD')}`}</p>
      </div>
      <div className="space-y-1">
        <label htmlFor={id} className="block text-sm font-medium text-ink-800">
          Approval limit for {row.name} ($)
        </label>
        <Input id={id} inputMode="decimal" value={text} onChange={(e) => setText(e.target.value)} aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : undefined} className="w-40" />
        {error && (
          <p id={`${id}-error`} className="text-sm font-medium text-red-800">
            {error}
          </p>
        )}
      </div>
      <Button size="sm" variant="secondary" pending={set.isPending} onClick={save}>
        Save limit
      </Button>
    </li>
  );
}

/** Per reviewer, the approved total above which a second reviewer confirms the approval. */
export function ApprovalLimitsPanel() {
  const limits = useApprovalLimits();
  return (
    <Card aria-labelledby="approval-limits">
      <CardHeader id="approval-limits" title="Approval limits" description="A claim approved above the reviewer’s limit waits for a second reviewer to confirm. Empty means no limit." />
      <CardBody>
        {limits.isError && <Alert tone="error">{errorMessage(limits.error)}</Alert>}
        {limits.data && limits.data.length === 0 && <p className="text-sm text-ink-600">No reviewers yet.</p>}
        {limits.data && (
          <ul className="divide-y divide-ink-100">
            {limits.data.map((r) => (
              <LimitRow key={r.userId} row={r} />
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}
