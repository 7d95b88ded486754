import { useId, useState, type FormEvent } from 'react';
import {
  partReturnStatusLabels,
  receivedConditionLabels,
  receivedConditions,
  PART_RETURN_OVERDUE_DAYS,
  type PartReturnLine,
  type ReceivedCondition,
} from '@shared/schemas/payment';
import { Alert } from '@/components/ui/alert';
import { Badge, type BadgeTone } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field } from '@/components/ui/field';
import { Input, Select, Textarea } from '@/components/ui/input';
import { Spinner } from '@/components/ui/spinner';
import { errorMessage, isApiError } from '@/lib/api-client';
import { formatDate, formatDateTime, plural } from '@/lib/format';
import { usePartReturns, useRecordPartReturnStep } from '../api/part-returns';

const statusTone: Record<string, BadgeTone> = { awaiting: 'orange', shipped: 'blue', received: 'green', waived: 'slate', not_required: 'neutral' };

function LineStatus({ line }: { line: PartReturnLine }) {
  const emptyBox = line.status === 'received' && line.receivedCondition === 'not_returned';
  return (
    <div className="flex flex-wrap items-center gap-2">
      <Badge tone={emptyBox ? 'red' : (statusTone[line.status] ?? 'neutral')}>{emptyBox ? 'Part missing from shipment' : partReturnStatusLabels[line.status]}</Badge>
      {line.overdue && <Badge tone="red">Overdue</Badge>}
    </div>
  );
}

function FieldErrors({ error }: { error: unknown }) {
  if (!error) return null;
  const fields = isApiError(error, 400) && error.fields ? Object.values(error.fields) : [];
  return <Alert tone="error">{fields.length > 0 ? fields.join(' ') : errorMessage(error)}</Alert>;
}

function ShipForm({ claimId, line }: { claimId: string; line: PartReturnLine }) {
  const step = useRecordPartReturnStep(claimId);
  const [carrier, setCarrier] = useState(line.carrier ?? '');
  const [tracking, setTracking] = useState(line.trackingNumber ?? '');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    step.mutate({ action: 'ship', lineId: line.id, body: { carrier, trackingNumber: tracking } });
  };
  return (
    <form onSubmit={submit} className="grid gap-3 sm:grid-cols-[1fr_1fr_auto] sm:items-end" aria-label={`Shipment of ${line.partNumber}`}>
      <Field label="Carrier">{(p) => <Input {...p} value={carrier} onChange={(e) => setCarrier(e.target.value)} maxLength={60} autoComplete="off" />}</Field>
      <Field label="Tracking number">{(p) => <Input {...p} value={tracking} onChange={(e) => setTracking(e.target.value)} maxLength={60} autoComplete="off" />}</Field>
      <Button type="submit" pending={step.isPending}>
        {line.status === 'shipped' ? 'Update shipment' : 'Record shipment'}
      </Button>
      <div className="sm:col-span-3">
        <FieldErrors error={step.error} />
      </div>
    </form>
  );
}

function ReceiveForm({ claimId, line }: { claimId: string; line: PartReturnLine }) {
  const step = useRecordPartReturnStep(claimId);
  const [condition, setCondition] = useState<ReceivedCondition>('failure_confirmed');
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        step.mutate({ action: 'receive', lineId: line.id, body: { condition } });
      }}
      className="grid gap-3 sm:grid-cols-[1fr_auto] sm:items-end"
      aria-label={`Receipt of ${line.partNumber}`}
    >
      <Field label="Condition on arrival">
        {(p) => (
          <Select {...p} value={condition} onChange={(e) => setCondition(e.target.value as ReceivedCondition)}>
            {receivedConditions.map((c) => (
              <option key={c} value={c}>
                {receivedConditionLabels[c]}
              </option>
            ))}
          </Select>
        )}
      </Field>
      <Button type="submit" pending={step.isPending}>
        Record received
      </Button>
      <div className="sm:col-span-2">
        <FieldErrors error={step.error} />
      </div>
    </form>
  );
}

function WaiveForm({ claimId, line }: { claimId: string; line: PartReturnLine }) {
  const step = useRecordPartReturnStep(claimId);
  const [reason, setReason] = useState('');
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        step.mutate({ action: 'waive', lineId: line.id, body: { reason } });
      }}
      className="grid gap-3 sm:grid-cols-[1fr_auto] sm:items-end"
      aria-label={`Waiver of ${line.partNumber}`}
    >
      <Field label="Reason for waiving the return">{(p) => <Textarea {...p} value={reason} onChange={(e) => setReason(e.target.value)} maxLength={500} className="min-h-16" />}</Field>
      <Button type="submit" variant="secondary" pending={step.isPending}>
        Waive return
      </Button>
      <div className="sm:col-span-2">
        <FieldErrors error={step.error} />
      </div>
    </form>
  );
}

function LineCard({ claimId, line }: { claimId: string; line: PartReturnLine }) {
  return (
    <li className="space-y-3 px-4 py-3">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <p>
          <span className="font-mono font-medium">{line.partNumber}</span> {line.description} <span className="text-ink-600">× {line.quantity}</span>
        </p>
        <LineStatus line={line} />
      </div>
      <dl className="grid gap-x-4 gap-y-1 text-sm sm:grid-cols-2">
        {line.trackingNumber && (
          <div>
            <dt className="inline text-ink-600">Shipped: </dt>
            <dd className="inline">
              {line.carrier}, tracking <span className="font-mono">{line.trackingNumber}</span> ({formatDateTime(line.shippedAt)})
            </dd>
          </div>
        )}
        {line.receivedAt && line.receivedCondition && (
          <div>
            <dt className="inline text-ink-600">Received: </dt>
            <dd className="inline">
              {receivedConditionLabels[line.receivedCondition]} ({formatDateTime(line.receivedAt)})
            </dd>
          </div>
        )}
        {line.waiveReason && (
          <div className="sm:col-span-2">
            <dt className="inline text-ink-600">Waived: </dt>
            <dd className="inline">{line.waiveReason}</dd>
          </div>
        )}
      </dl>
      {line.allowedActions.includes('ship') && <ShipForm claimId={claimId} line={line} />}
      {line.allowedActions.includes('receive') && <ReceiveForm claimId={claimId} line={line} />}
      {line.allowedActions.includes('waive') && <WaiveForm claimId={claimId} line={line} />}
    </li>
  );
}

/**
 * Part returns of an approved claim: the agency records carrier and tracking per part; the
 * manufacturer's reviewer records each part received with its condition, or waives the return.
 * The claim is ready to pay once every required return is settled.
 */
export function PartReturnsPanel({ claimId, enabled }: { claimId: string; enabled: boolean }) {
  const headingId = useId();
  const returns = usePartReturns(claimId, enabled);
  if (!enabled) return null;
  const data = returns.data;
  const required = data?.lines.filter((l) => l.returnRequired) ?? [];
  if (data && required.length === 0) return null;
  return (
    <Card aria-labelledby={headingId}>
      <CardHeader
        id={headingId}
        title="Part returns"
        description={
          data?.claimState === 'approved'
            ? data.returnsSettled
              ? 'Every required part is settled: the claim can be paid.'
              : `The claim is paid once these parts are received or waived${data.dueDate ? `; due by ${formatDate(data.dueDate)} (${PART_RETURN_OVERDUE_DAYS} days after approval)` : ''}.`
            : 'Failed parts the manufacturer asked to have sent back.'
        }
      />
      {returns.isPending && (
        <CardBody>
          <Spinner label="Loading part returns…" />
        </CardBody>
      )}
      {returns.isError && (
        <CardBody>
          <Alert tone="error">{errorMessage(returns.error)}</Alert>
        </CardBody>
      )}
      {data && data.overdueDays > 0 && !data.returnsSettled && (
        <CardBody>
          <Alert tone="warning">Overdue by {plural(data.overdueDays, 'day')}.</Alert>
        </CardBody>
      )}
      {data && (
        <ul className="divide-y divide-ink-100">
          {required.map((l) => (
            <LineCard key={l.id} claimId={claimId} line={l} />
          ))}
        </ul>
      )}
    </Card>
  );
}
