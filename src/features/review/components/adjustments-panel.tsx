import { REASON_CODES, reasonCodesFor } from '@shared/workflow/reason-codes';
import { useState, type ReactNode } from 'react';
import type { Valuation } from '@shared/calculations/valuation';
import type { ClaimDetail } from '@shared/schemas/claim';
import { adjustmentsSchema, type AdjustmentsInput } from '@shared/workflow/workflow-schemas';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Input, Select } from '@/components/ui/input';
import { errorMessage, isApiError } from '@/lib/api-client';
import { formatCents, formatHours } from '@/lib/format';
import { useAdjustClaim } from '../api/adjust-claim';
import { toCents } from '../queue-filters';

type Kind = 'labor' | 'part' | 'travel';
type Mode = 'hours' | 'quantity' | 'amount';

interface LineView {
  key: string;
  kind: Kind;
  id: string;
  /** Plain words naming the line, for labels. */
  name: string;
  title: ReactNode;
  entered: string;
  /** What the rules allow (the valuation's claimed amount). */
  byRulesCents: number | null;
  approvedCents: number | null;
  adjustment: { text: string; reason: string } | null;
  modes: Mode[];
}

function linesOf(claim: ClaimDetail, valuation: Valuation | undefined): LineView[] {
  const cur = claim.currency;
  const v = new Map((valuation?.lines ?? []).map((l) => [l.id, l]));
  const out: LineView[] = claim.laborLines.map((l) => ({
    key: `labor-${l.id}`,
    kind: 'labor',
    id: l.id,
    name: `${l.repairCode} ${l.description}`,
    title: (
      <>
        <span className="font-medium">{l.repairCode}</span> {l.description}
      </>
    ),
    entered: `${formatHours(l.hoursWorked)} worked, ${formatHours(l.allowedHours)} allowed${l.overtime ? ', overtime' : ''}`,
    byRulesCents: v.get(l.id)?.claimedCents ?? null,
    approvedCents: v.get(l.id)?.approvedCents ?? null,
    adjustment: l.adjustmentReason ? { text: l.approvedHours !== null ? `${formatHours(l.approvedHours)} approved` : `${formatCents(l.approvedAmountCents, cur)} approved`, reason: l.adjustmentReason } : null,
    modes: ['hours'],
  }));
  if (claim.travel) {
    const t = claim.travel;
    const travelLines = (valuation?.lines ?? []).filter((l) => l.kind === 'travel_distance' || l.kind === 'travel_time');
    out.push({
      key: 'travel',
      kind: 'travel',
      id: 'travel',
      name: 'travel',
      title: <span className="font-medium">Travel</span>,
      entered: `${t.roundTripMiles.toLocaleString('en-US')} mi round trip, ${formatHours(t.travelHours)}`,
      byRulesCents: valuation ? travelLines.reduce((s, l) => s + l.claimedCents, 0) : null,
      approvedCents: valuation ? travelLines.reduce((s, l) => s + l.approvedCents, 0) : null,
      adjustment: t.adjustmentReason ? { text: `${formatCents(t.approvedAmountCents, cur)} approved`, reason: t.adjustmentReason } : null,
      modes: ['amount'],
    });
  }
  for (const p of claim.partLines) {
    out.push({
      key: `part-${p.id}`,
      kind: 'part',
      id: p.id,
      name: `${p.partNumber} ${p.description}`,
      title: (
        <>
          <span className="font-mono font-medium">{p.partNumber}</span> {p.description}
        </>
      ),
      entered: `quantity ${p.quantity} at list ${formatCents(p.listPriceCents, cur)}${p.returnRequired ? ', return required' : ''}`,
      byRulesCents: v.get(p.id)?.claimedCents ?? null,
      approvedCents: v.get(p.id)?.approvedCents ?? null,
      adjustment: p.adjustmentReason ? { text: p.approvedQuantity !== null ? `quantity ${p.approvedQuantity} approved` : `${formatCents(p.approvedAmountCents, cur)} approved`, reason: p.adjustmentReason } : null,
      modes: ['quantity', 'amount'],
    });
  }
  return out;
}

const modeLabel: Record<Mode, string> = { hours: 'Approved hours', quantity: 'Approved quantity', amount: 'Approved amount ($)' };

/** The body that sets (or, with value null, clears) one line's adjustment. */
export function adjustmentBody(version: number, line: { kind: Kind; id: string }, mode: Mode, value: number | null, reason: string | null, reasonCode: string | null = null): AdjustmentsInput {
  const r = reason && reason.trim() !== '' ? reason.trim() : null;
  const code = value === null || !reasonCode ? null : reasonCode;
  if (line.kind === 'labor') {
    return { version, laborLines: [{ id: line.id, approvedHours: mode === 'hours' ? value : null, approvedAmountCents: mode === 'amount' ? value : null, reason: value === null ? null : r, reasonCode: code }] };
  }
  if (line.kind === 'part') {
    return {
      version,
      partLines: [{ id: line.id, approvedQuantity: mode === 'quantity' ? value : null, approvedAmountCents: mode === 'amount' ? value : null, reason: value === null ? null : r, reasonCode: code }],
    };
  }
  return { version, travel: { approvedAmountCents: value, reason: value === null ? null : r, reasonCode: code } };
}

function LineEditor({ line, claim, onDone }: { line: LineView; claim: ClaimDetail; onDone: () => void }) {
  const adjust = useAdjustClaim(claim.id);
  const [mode, setMode] = useState<Mode>(line.modes[0]);
  const [value, setValue] = useState('');
  const [reason, setReason] = useState('');
  const [reasonCode, setReasonCode] = useState('');
  const [errors, setErrors] = useState<{ value?: string; reason?: string; reasonCode?: string; form?: string }>({});
  const idBase = `adjust-${line.key}`;

  const apply = async () => {
    const e: typeof errors = {};
    let n: number | null = null;
    const t = value.trim();
    if (mode === 'amount') {
      const c = toCents(t);
      if (c === undefined) e.value = 'Enter an amount like 120 or 120.50.';
      else n = c;
    } else if (t === '' || !Number.isFinite(Number(t)) || Number(t) < 0) {
      e.value = mode === 'hours' ? 'Enter the hours you approve, like 1.5.' : 'Enter the quantity you approve.';
    } else n = Number(t);
    if (reason.trim() === '') e.reason = 'Give the agency the reason for the adjustment.';
    const body = n === null ? null : adjustmentBody(claim.version, line, mode, n, reason, reasonCode || null);
    if (body && !e.value) {
      const parsed = adjustmentsSchema.safeParse(body);
      if (!parsed.success) e.value = parsed.error.issues[0]?.message ?? 'This value is not accepted.';
    }
    setErrors(e);
    if (Object.keys(e).length > 0 || !body) return;
    try {
      await adjust.mutateAsync(body);
      onDone();
    } catch (err) {
      if (isApiError(err, 400) && err.fields) {
        const f = Object.entries(err.fields);
        setErrors({
          value: f.find(([k]) => !k.endsWith('reason') && !k.endsWith('reasonCode'))?.[1],
          reason: f.find(([k]) => k.endsWith('reason'))?.[1],
          reasonCode: f.find(([k]) => k.endsWith('reasonCode'))?.[1],
        });
      } else if (isApiError(err, 409)) {
        setErrors({ form: 'Someone else changed this claim. It has been reloaded; check the line and adjust again.' });
      } else setErrors({ form: errorMessage(err) });
    }
  };

  return (
    <div className="mt-3 space-y-3 rounded-md bg-paper p-3" role="group" aria-label={`Adjusting ${line.name}`}>
      <div className="grid gap-3 sm:grid-cols-[minmax(0,1fr)_minmax(0,2fr)]">
        <div className="space-y-1">
          {line.modes.length > 1 && (
            <Select aria-label="Adjust by" value={mode} onChange={(e) => setMode(e.target.value as Mode)} className="min-h-9 text-sm">
              <option value="quantity">Quantity</option>
              <option value="amount">Amount</option>
            </Select>
          )}
          <label htmlFor={`${idBase}-value`} className="block text-sm font-medium text-ink-800">
            {modeLabel[mode]}
          </label>
          <Input id={`${idBase}-value`} inputMode="decimal" value={value} onChange={(e) => setValue(e.target.value)} aria-invalid={errors.value ? true : undefined} aria-describedby={errors.value ? `${idBase}-value-error` : undefined} />
          {errors.value && (
            <p id={`${idBase}-value-error`} className="text-sm font-medium text-red-800">
              {errors.value}
            </p>
          )}
        </div>
        <div className="space-y-1">
          <label htmlFor={`${idBase}-reason`} className="block text-sm font-medium text-ink-800">
            Reason for the agency
          </label>
          <Input id={`${idBase}-reason`} value={reason} maxLength={500} onChange={(e) => setReason(e.target.value)} aria-invalid={errors.reason ? true : undefined} aria-describedby={errors.reason ? `${idBase}-reason-error` : undefined} />
          {errors.reason && (
            <p id={`${idBase}-reason-error`} className="text-sm font-medium text-red-800">
              {errors.reason}
            </p>
          )}
        </div>
      </div>
      <div className="space-y-1">
        <label htmlFor={`${idBase}-code`} className="block text-sm font-medium text-ink-800">
          Reason code (needed above what the agency entered)
        </label>
        <Select id={`${idBase}-code`} value={reasonCode} onChange={(e) => setReasonCode(e.target.value)} className="min-h-9 text-sm" aria-invalid={errors.reasonCode ? true : undefined} aria-describedby={errors.reasonCode ? `${idBase}-code-error` : undefined}>
          <option value="">Not above the entry</option>
          {reasonCodesFor('raise').map((c) => (
            <option key={c} value={c}>
              {REASON_CODES[c].label}
            </option>
          ))}
        </Select>
        {errors.reasonCode && (
          <p id={`${idBase}-code-error`} className="text-sm font-medium text-red-800">
            {errors.reasonCode}
          </p>
        )}
      </div>
      {errors.form && <Alert tone="warning">{errors.form}</Alert>}
      <div className="flex flex-wrap gap-2">
        <Button size="sm" onClick={() => void apply()} pending={adjust.isPending}>
          Apply adjustment
        </Button>
        <Button size="sm" variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </div>
  );
}

/**
 * The review screen's line decisions: each labor line, the trip and each part with what was
 * entered and what the rules allow; the reviewer may adjust any of them, always with a reason.
 */
export function AdjustmentsPanel({ claim, valuation }: { claim: ClaimDetail; valuation: Valuation | undefined }) {
  const [editing, setEditing] = useState<string | null>(null);
  const clear = useAdjustClaim(claim.id);
  const lines = linesOf(claim, valuation);
  const cur = claim.currency;
  return (
    <Card aria-labelledby="review-adjustments">
      <CardHeader
        id="review-adjustments"
        title="Review the lines"
        description="Each line is approved at what the rules allow unless you adjust it. Every adjustment needs a reason; the agency sees it."
      />
      <CardBody className="space-y-3">
        {lines.length === 0 && <p className="text-sm text-ink-600">This claim has no lines.</p>}
        <ul className="divide-y divide-ink-100">
          {lines.map((l) => (
            <li key={l.key} className="py-3" aria-label={l.kind === 'travel' ? 'Travel' : undefined}>
              <div className="flex flex-wrap items-start justify-between gap-3">
                <div className="min-w-0 text-sm">
                  <p className="text-ink-900">{l.title}</p>
                  <p className="text-ink-600">{l.entered}</p>
                  {l.adjustment && (
                    <p className="mt-1 flex flex-wrap items-center gap-2 text-brass-700">
                      <Badge tone="brass">Adjusted</Badge> {l.adjustment.text}: {l.adjustment.reason}
                    </p>
                  )}
                </div>
                <div className="text-right text-sm tabular-nums">
                  <p>
                    <span className="text-ink-600">allowed</span> {formatCents(l.byRulesCents, cur)}
                  </p>
                  <p className="font-semibold">
                    <span className="font-normal text-ink-600">approving</span> {formatCents(l.approvedCents, cur)}
                  </p>
                </div>
              </div>
              {editing === l.key ? (
                <LineEditor line={l} claim={claim} onDone={() => setEditing(null)} />
              ) : (
                <div className="mt-2 flex flex-wrap gap-2">
                  <Button size="sm" variant="secondary" onClick={() => setEditing(l.key)} aria-label={`Adjust ${l.name}`}>
                    Adjust
                  </Button>
                  {l.adjustment && (
                    <Button size="sm" variant="ghost" pending={clear.isPending} onClick={() => clear.mutate(adjustmentBody(claim.version, l, l.modes[0], null, null))}>
                      Undo adjustment
                    </Button>
                  )}
                </div>
              )}
            </li>
          ))}
        </ul>
        {clear.isError && <Alert tone="error">{errorMessage(clear.error)}</Alert>}
        {valuation && (
          <p className="border-t border-ink-100 pt-3 text-right text-sm">
            Approving in all <span className="font-semibold tabular-nums">{formatCents(valuation.totals.approved.totalCents, cur)}</span>
          </p>
        )}
      </CardBody>
    </Card>
  );
}
