import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import type { ClaimDetail } from '@shared/schemas/claim';
import type { ClaimAction } from '@shared/permissions/ability';
import { claimActionLabels } from '@shared/workflow/claim-machine';
import { isReasonFor, REASON_CODES, reasonCodesFor, type ReasonMove } from '@shared/workflow/reason-codes';
import { commentSchema } from '@shared/workflow/workflow-schemas';
import { Alert } from '@/components/ui/alert';
import { Button, type ButtonVariant } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Select, Textarea } from '@/components/ui/input';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useTransitionClaim } from '../api/transition-claim';
import { Modal } from '@/components/ui/modal';

/** The order the moves appear in; pay is never offered here (it happens in a payment run). */
const ORDER: ClaimAction[] = ['submit', 'start_review', 'approve', 'return', 'deny', 'withdraw'];
const variant: Partial<Record<ClaimAction, ButtonVariant>> = { return: 'secondary', deny: 'danger', withdraw: 'secondary' };

function reasonFormSchema(move: ReasonMove) {
  return z.object({
    reason: z.string().refine((r: string): boolean => isReasonFor(move, r), 'Choose a reason.'),
    comment: commentSchema.shape.body.refine((c) => c.trim() !== '', 'Write a comment the agency can act on.'),
  });
}
type ReasonForm = z.infer<ReturnType<typeof reasonFormSchema>>;

function ReasonDialog({
  move,
  claim,
  pending,
  error,
  onCancel,
  onConfirm,
}: {
  move: ReasonMove;
  claim: ClaimDetail;
  pending: boolean;
  error: unknown;
  onCancel: () => void;
  onConfirm: (v: ReasonForm) => Promise<unknown>;
}) {
  const form = useForm<ReasonForm>({ resolver: zodResolver(reasonFormSchema(move)), defaultValues: { reason: '', comment: '' } });
  const reason = form.watch('reason');
  const hint = reason && reason in REASON_CODES ? REASON_CODES[reason as keyof typeof REASON_CODES].hint : undefined;
  const serverFields = isApiError(error, 400) ? error.fields : undefined;
  return (
    <form
      noValidate
      aria-label={move === 'return' ? 'Return to the agency' : 'Deny the claim'}
      className="space-y-4"
      onSubmit={form.handleSubmit(async (v) => {
        try {
          await onConfirm(v);
        } catch (e) {
          if (isApiError(e, 400) && e.fields) for (const [k, m] of Object.entries(e.fields)) if (k === 'reason' || k === 'comment') form.setError(k, { type: 'server', message: m });
        }
      })}
    >
      <p className="text-sm text-ink-700">
        {move === 'return'
          ? `${claim.number} goes back to ${claim.agencyName} to fix and resubmit. They see your reason and comment beside the fields it concerns.`
          : `${claim.number} is denied. A denial is final; ${claim.agencyName} sees your reason and comment.`}
      </p>
      <Field label="Reason" error={form.formState.errors.reason?.message ?? serverFields?.reason} hint={hint}>
        {(p) => (
          <Select {...p} {...form.register('reason')}>
            <option value="">Choose a reason…</option>
            {reasonCodesFor(move).map((c) => (
              <option key={c} value={c}>
                {REASON_CODES[c].label}
              </option>
            ))}
          </Select>
        )}
      </Field>
      <Field label="Comment for the agency" error={form.formState.errors.comment?.message ?? serverFields?.comment}>
        {(p) => <Textarea {...p} rows={4} maxLength={4000} {...form.register('comment')} />}
      </Field>
      {error !== null && error !== undefined && !serverFields && <Alert tone="error">{errorMessage(error)}</Alert>}
      <div className="flex flex-wrap justify-end gap-2">
        <Button variant="ghost" onClick={onCancel}>
          Cancel
        </Button>
        <Button type="submit" variant={move === 'deny' ? 'danger' : 'primary'} pending={pending}>
          {move === 'return' ? 'Return to agency' : 'Deny the claim'}
        </Button>
      </div>
    </form>
  );
}

function ConfirmDialog({ text, confirm, tone, pending, error, onCancel, onConfirm }: { text: string; confirm: string; tone: ButtonVariant; pending: boolean; error: unknown; onCancel: () => void; onConfirm: () => void }) {
  return (
    <div className="space-y-4">
      <p className="text-sm text-ink-800">{text}</p>
      {error !== null && error !== undefined && <Alert tone="error">{errorMessage(error)}</Alert>}
      <div className="flex flex-wrap justify-end gap-2">
        <Button variant="ghost" onClick={onCancel}>
          Cancel
        </Button>
        <Button variant={tone} pending={pending} onClick={onConfirm}>
          {confirm}
        </Button>
      </div>
    </div>
  );
}

export interface ClaimActionsBarProps {
  claim: ClaimDetail;
  /** Show only these of the allowed moves (e.g. withdraw in the editor). */
  only?: readonly ClaimAction[];
  /** Words for the approve confirmation, e.g. the approved total. */
  approveSummary?: string;
  onMoved?: (claim: ClaimDetail, action: ClaimAction) => void;
}

/**
 * The moves this user may make on this claim now: exactly the claim's allowedActions (the
 * workflow and the user's abilities agree on them on the server). Each sends the version.
 */
export function ClaimActionsBar({ claim, only, approveSummary, onMoved }: ClaimActionsBarProps) {
  const move = useTransitionClaim(claim.id);
  const [open, setOpen] = useState<ClaimAction | null>(null);
  const [conflict, setConflict] = useState(false);
  const actions = ORDER.filter((a) => claim.allowedActions.includes(a) && (!only || only.includes(a)));

  const send = async (type: ClaimAction, extra: { reason?: string; comment?: string } = {}) => {
    setConflict(false);
    try {
      const next = await move.mutateAsync({ type, version: claim.version, ...extra });
      setOpen(null);
      onMoved?.(next, type);
    } catch (e) {
      if (isApiError(e, 409)) {
        setOpen(null);
        setConflict(true);
        return;
      }
      throw e;
    }
  };

  if (actions.length === 0 && !conflict) return null;
  const dialogError = move.isError && !isApiError(move.error, 409) ? move.error : null;

  return (
    <div className="space-y-2">
      {actions.length > 0 && (
        <div role="group" aria-label="Actions" className="flex flex-wrap gap-2">
          {actions.map((a) => (
            <Button
              key={a}
              variant={variant[a] ?? 'primary'}
              pending={move.isPending && move.variables?.type === a && open === null}
              disabled={move.isPending}
              onClick={() => {
                move.reset();
                if (a === 'submit' || a === 'start_review') void send(a).catch(() => undefined);
                else setOpen(a);
              }}
            >
              {claimActionLabels[a]}
            </Button>
          ))}
        </div>
      )}
      {conflict && (
        <Alert tone="warning" title="Someone else changed this claim">
          Your action was not applied. The claim now shows its latest version; check it and act again if it still applies.
        </Alert>
      )}
      {move.isError && open === null && !isApiError(move.error, 409) && <Alert tone="error">{errorMessage(move.error)}</Alert>}

      <Modal open={open === 'return' || open === 'deny'} onClose={() => setOpen(null)} title={open === 'deny' ? `Deny ${claim.number}` : `Return ${claim.number} to the agency`}>
        {(open === 'return' || open === 'deny') && (
          <ReasonDialog key={open} move={open} claim={claim} pending={move.isPending} error={dialogError} onCancel={() => setOpen(null)} onConfirm={(v) => send(open, v)} />
        )}
      </Modal>
      <Modal open={open === 'approve'} onClose={() => setOpen(null)} title={`Approve ${claim.number}`}>
        <ConfirmDialog
          text={`${approveSummary ? `${approveSummary} ` : ''}The approved amounts are frozen when you approve, and the claim goes to the next payment run.`}
          confirm="Approve"
          tone="primary"
          pending={move.isPending}
          error={dialogError}
          onCancel={() => setOpen(null)}
          onConfirm={() => void send('approve').catch(() => undefined)}
        />
      </Modal>
      <Modal open={open === 'withdraw'} onClose={() => setOpen(null)} title={`Withdraw ${claim.number}`}>
        <ConfirmDialog
          text={`Withdraw ${claim.number}? A withdrawn claim is closed for good: it cannot be edited or submitted again. File a new claim if the repair should still be claimed.`}
          confirm="Withdraw the claim"
          tone="danger"
          pending={move.isPending}
          error={dialogError}
          onCancel={() => setOpen(null)}
          onConfirm={() => void send('withdraw').catch(() => undefined)}
        />
      </Modal>
    </div>
  );
}
