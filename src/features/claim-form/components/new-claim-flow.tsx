import { useRef, useState } from 'react';
import type { ClaimDetail } from '@shared/schemas/claim';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Input } from '@/components/ui/input';
import { useBusinessToday } from '@/lib/business-day';
import { Spinner } from '@/components/ui/spinner';
import { errorMessage, isApiError } from '@/lib/api-client';
import { newIdempotencyKey } from '@/lib/idempotency-key';
import { useCreateClaim } from '../api/create-claim';
import { useUnitLookup } from '../api/lookup-unit';
import { useDebouncedValue } from '../hooks/use-debounced-value';
import { FormField } from './form-field';
import { UnitCard } from './unit-card';

const ISO = /^\d{4}-\d{2}-\d{2}$/;

/**
 * Step one of a claim: find the unit by the serial on its plate and see its coverage at once,
 * then open the draft on the server and continue in the editor.
 */
export function NewClaimFlow({ onCreated }: { onCreated: (claim: ClaimDetail) => void }) {
  const today = useBusinessToday();
  const [serial, setSerial] = useState('');
  const [failureDate, setFailureDate] = useState('');
  const typed = serial.trim();
  const settledSerial = useDebouncedValue(typed, 350);
  const on = ISO.test(failureDate) ? failureDate : null;
  const lookup = useUnitLookup(settledSerial, on);
  const create = useCreateClaim();
  const waiting = typed !== settledSerial || (lookup.isFetching && !lookup.data);
  const unknown = isApiError(lookup.error, 404);
  const found = lookup.data && !lookup.isError ? lookup.data : null;
  const serialError = isApiError(create.error, 400) ? create.error.fields?.serial : undefined;

  // one key per intended action: the same for every click on the same unit and date, new after success
  const intent = useRef<{ what: string; key: string } | null>(null);
  const start = () => {
    if (!found || create.isPending) return;
    const body = { serial: found.unit.serial, ...(on ? { failureDate: on } : {}) };
    const what = JSON.stringify(body);
    if (intent.current?.what !== what) intent.current = { what, key: newIdempotencyKey() };
    create.mutate(
      { body, idempotencyKey: intent.current.key },
      {
        onSuccess: (claim) => {
          intent.current = null;
          onCreated(claim);
        },
      },
    );
  };

  return (
    <div className="space-y-5">
      <Card aria-labelledby="find-unit">
        <CardHeader id="find-unit" title="Find the unit" description="Type the serial number from the unit’s data plate. The unit and its coverage show as you type." />
        <CardBody className="grid gap-4 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
          <FormField id="cf-serial" label="Serial number" error={serialError} hint={typed.length > 0 && typed.length < 3 ? 'Keep typing: at least 3 characters.' : undefined}>
            {(p) => (
              <Input
                {...p}
                value={serial}
                onChange={(e) => setSerial(e.target.value)}
                autoComplete="off"
                autoCapitalize="characters"
                spellCheck={false}
                autoFocus
                className="font-mono"
                maxLength={60}
              />
            )}
          </FormField>
          <FormField id="cf-lookup-date" label="Failure date" hint="Coverage is judged on this day; today when left empty.">
            {(p) => <Input {...p} type="date" value={failureDate} max={today} onChange={(e) => setFailureDate(e.target.value)} />}
          </FormField>
        </CardBody>
      </Card>

      <div aria-live="polite">
        {typed.length >= 3 && waiting && <Spinner label="Looking up the serial number…" />}
        {!waiting && unknown && (
          <Alert tone="warning" title="No unit with this serial number">
            <p>{errorMessage(lookup.error)}</p>
            <p className="mt-1">Serial numbers are on the data plate, usually inside the door or on the back panel. Check letters that look like digits: O and 0, I and 1, S and 5.</p>
          </Alert>
        )}
        {!waiting && lookup.isError && !unknown && <Alert tone="error">{errorMessage(lookup.error)}</Alert>}
      </div>

      {found && !waiting && !lookup.isError && (
        <Card aria-labelledby="found-unit">
          <CardHeader id="found-unit" title="Unit found" />
          <CardBody className="space-y-4">
            <UnitCard lookup={found} />
            {!found.coverage.parts.covered && !found.coverage.labor.covered && (
              <Alert tone="warning">Neither parts nor labor were covered on this date. You can still file; the lines are valued at zero and the reviewer sees the claim flagged.</Alert>
            )}
            {create.isError && !serialError && <Alert tone="error">{errorMessage(create.error)}</Alert>}
            <div className="flex flex-wrap gap-3">
              <Button onClick={start} pending={create.isPending}>
                Start the claim for this unit
              </Button>
            </div>
          </CardBody>
        </Card>
      )}
    </div>
  );
}
