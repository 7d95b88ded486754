import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { claimStateLabels, type ClaimDetail, type ClaimState } from '@shared/schemas/claim';
import { reasonLabel } from '@shared/workflow/reason-codes';
import { commentSchema, type CommentInput } from '@shared/workflow/workflow-schemas';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field } from '@/components/ui/field';
import { Textarea } from '@/components/ui/input';
import { applyServerErrors } from '@/lib/form-errors';
import { cx } from '@/lib/cx';
import { formatDateTime } from '@/lib/format';
import { useAddComment } from '../api/add-comment';

const eventLabels: Record<string, string> = {
  created: 'Opened the claim',
  submit: 'Submitted',
  start_review: 'Started the review',
  return: 'Returned to the agency',
  deny: 'Denied',
  approve: 'Approved',
  pay: 'Paid',
  withdraw: 'Withdrew',
  adjusted: 'Adjusted line amounts',
  adjust: 'Adjusted line amounts',
};

const stateText = (s: string | null) => (s ? (claimStateLabels[s as ClaimState] ?? s) : null);

type Entry =
  | { kind: 'event'; at: string; e: ClaimDetail['events'][number] }
  | { kind: 'comment'; at: string; c: ClaimDetail['comments'][number] };

/** Every transition and comment of the claim in one thread, oldest first: who, when and why. */
export function activityOf(claim: Pick<ClaimDetail, 'events' | 'comments'>): Entry[] {
  const entries: Entry[] = [...claim.events.map((e) => ({ kind: 'event' as const, at: e.at, e })), ...claim.comments.map((c) => ({ kind: 'comment' as const, at: c.createdAt, c }))];
  return entries.sort((a, b) => a.at.localeCompare(b.at) || (a.kind === b.kind ? 0 : a.kind === 'event' ? -1 : 1));
}

function CommentForm({ claimId }: { claimId: string }) {
  const add = useAddComment(claimId);
  const form = useForm<CommentInput>({ resolver: zodResolver(commentSchema), defaultValues: { body: '' } });
  return (
    <form
      noValidate
      aria-label="Add a comment"
      className="space-y-2 border-t border-ink-100 pt-4"
      onSubmit={form.handleSubmit((v) =>
        add.mutateAsync(v).then(
          () => form.reset({ body: '' }),
          (e) => {
            const msg = applyServerErrors(e, form.setError, ['body']);
            if (msg) form.setError('root', { message: msg });
          },
        ),
      )}
    >
      <Field label="Comment" hint="Seen by the service agency and the manufacturer’s reviewers." error={form.formState.errors.body?.message}>
        {(p) => <Textarea {...p} rows={3} maxLength={4000} {...form.register('body')} />}
      </Field>
      {form.formState.errors.root?.message && <Alert tone="error">{form.formState.errors.root.message}</Alert>}
      <Button type="submit" variant="secondary" size="sm" pending={add.isPending}>
        Post comment
      </Button>
    </form>
  );
}

/**
 * The claim's timeline with its comment thread woven in, and a box to add a comment when the
 * user may (the thread between the agency and the reviewer).
 */
export function ClaimActivity({ claim, canComment }: { claim: ClaimDetail; canComment: boolean }) {
  const entries = activityOf(claim);
  return (
    <Card aria-labelledby="claim-activity">
      <CardHeader id="claim-activity" title="Timeline and comments" />
      <CardBody className="space-y-4">
        {entries.length === 0 ? (
          <p className="text-sm text-ink-600">Nothing recorded yet.</p>
        ) : (
          <ol className="relative space-y-4 border-l-2 border-ink-100 pl-5" aria-label="Timeline">
            {entries.map((entry) => {
              if (entry.kind === 'comment') {
                const c = entry.c;
                return (
                  <li key={`c-${c.id}`} className="relative text-sm">
                    <span aria-hidden="true" className="absolute -left-[1.72rem] top-1 size-3 rounded-full border-2 border-white bg-brass-400" />
                    <p className="font-medium text-ink-900">
                      {c.authorName} <span className="font-normal text-ink-600">· {c.authorOrganisation} commented</span>
                    </p>
                    <p className="text-ink-600">
                      <time dateTime={c.createdAt}>{formatDateTime(c.createdAt)}</time>
                    </p>
                    <p className="mt-1 whitespace-pre-line rounded-md border border-ink-100 bg-white px-3 py-2 text-ink-900">{c.body}</p>
                  </li>
                );
              }
              const e = entry.e;
              const from = stateText(e.fromState);
              const to = stateText(e.toState);
              const important = e.type === 'return' || e.type === 'deny' || e.type === 'approve';
              return (
                <li key={`e-${e.id}`} className="relative text-sm">
                  <span aria-hidden="true" className={cx('absolute -left-[1.72rem] top-1 size-3 rounded-full border-2 border-white', important ? 'bg-ink-700' : 'bg-ink-400')} />
                  <p className="font-medium text-ink-900">
                    {eventLabels[e.type] ?? e.type.replace(/_/g, ' ')}
                    {from && to && from !== to && (
                      <span className="font-normal text-ink-600">
                        {' '}
                        · {from} <span aria-hidden="true">→</span>
                        <span className="sr-only">to</span> {to}
                      </span>
                    )}
                  </p>
                  <p className="text-ink-600">
                    {e.actorName ?? 'Fieldproof'} · <time dateTime={e.at}>{formatDateTime(e.at)}</time>
                  </p>
                  {e.reason && <p className="mt-1 font-medium text-ink-800">Reason: {reasonLabel(e.reason)}</p>}
                  {e.comment && <p className="mt-1 whitespace-pre-line rounded-md bg-paper px-3 py-2 text-ink-800">{e.comment}</p>}
                </li>
              );
            })}
          </ol>
        )}
        {canComment && <CommentForm claimId={claim.id} />}
      </CardBody>
    </Card>
  );
}
