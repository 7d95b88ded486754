import { useState } from 'react';
import type { ClaimDetail } from '@shared/schemas/claim';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Input } from '@/components/ui/input';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useTakeOverClaim } from '../api/take-over-claim';

/** A review held by another reviewer: take it over with a reason, which that reviewer is mailed. */
export function TakeOverPanel({ claim }: { claim: ClaimDetail }) {
  const take = useTakeOverClaim(claim.id);
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | undefined>();
  const submit = () => {
    if (reason.trim().length < 3) {
      setError('Say why you take the claim over; the other reviewer reads it.');
      return;
    }
    setError(undefined);
    take.mutate({ version: claim.version, reason: reason.trim() }, { onError: (e) => setError(isApiError(e, 400) ? (e.fields?.reason ?? e.message) : undefined) });
  };
  return (
    <Card aria-labelledby="take-over">
      <CardHeader id="take-over" title={`In review with ${claim.reviewerName ?? 'another reviewer'}`} description="To approve, return, deny or adjust this claim, take the review over. The other reviewer gets a mail with your reason." />
      <CardBody className="space-y-3">
        <div className="space-y-1">
          <label htmlFor="take-over-reason" className="block text-sm font-medium text-ink-800">
            Reason for taking over
          </label>
          <Input id="take-over-reason" value={reason} maxLength={500} onChange={(e) => setReason(e.target.value)} aria-invalid={error ? true : undefined} aria-describedby={error ? 'take-over-reason-error' : undefined} />
          {error && (
            <p id="take-over-reason-error" className="text-sm font-medium text-red-800">
              {error}
            </p>
          )}
        </div>
        {take.isError && !isApiError(take.error, 400) && <Alert tone="warning">{errorMessage(take.error)}</Alert>}
        <Button onClick={submit} pending={take.isPending}>
          Take over the review
        </Button>
      </CardBody>
    </Card>
  );
}
