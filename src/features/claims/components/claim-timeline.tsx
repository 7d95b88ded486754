import { claimStateLabels, type ClaimDetail, type ClaimState } from '@shared/schemas/claim';
import { reasonLabel } from '@shared/workflow/reason-codes';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { formatDateTime } from '@/lib/format';

const eventLabels: Record<string, string> = {
  created: 'Opened the claim',
  submit: 'Submitted',
  start_review: 'Started the review',
  return: 'Returned to the agency',
  deny: 'Denied',
  approve: 'Approved',
  pay: 'Paid',
  withdraw: 'Withdrew',
  adjust: 'Adjusted amounts',
  comment: 'Commented',
};

function stateLabel(s: string | null): string | null {
  return s ? (claimStateLabels[s as ClaimState] ?? s) : null;
}

function eventLabel(type: string): string {
  return eventLabels[type] ?? type.replace(/_/g, ' ').replace(/^./, (c) => c.toUpperCase());
}

/** The audit trail, oldest first: who did what, when, and why. */
export function ClaimTimeline({ claim }: { claim: ClaimDetail }) {
  const events = [...claim.events].sort((a, b) => a.at.localeCompare(b.at));
  return (
    <Card aria-labelledby="claim-timeline">
      <CardHeader id="claim-timeline" title="Timeline" />
      <CardBody>
        {events.length === 0 ? (
          <p className="text-sm text-ink-600">Nothing recorded yet.</p>
        ) : (
          <ol className="relative space-y-4 border-l-2 border-ink-100 pl-5">
            {events.map((e) => {
              const from = stateLabel(e.fromState);
              const to = stateLabel(e.toState);
              return (
                <li key={e.id} className="relative text-sm">
                  <span aria-hidden="true" className="absolute -left-[1.72rem] top-1 size-3 rounded-full border-2 border-white bg-ink-500" />
                  <p className="font-medium text-ink-900">
                    {eventLabel(e.type)}
                    {from && to && from !== to && (
                      <span className="font-normal text-ink-600">
                        {' '}
                        · {from} <span aria-hidden="true">→</span>
                        <span className="sr-only">to</span> {to}
                      </span>
                    )}
                    {!from && to && e.type !== 'created' && <span className="font-normal text-ink-600"> · now {to}</span>}
                  </p>
                  <p className="text-ink-600">
                    {e.actorName ?? 'Fieldproof'} · <time dateTime={e.at}>{formatDateTime(e.at)}</time>
                  </p>
                  {e.reason && <p className="mt-1 text-ink-800">Reason: {reasonLabel(e.reason)}</p>}
                  {e.comment && <p className="mt-1 whitespace-pre-line rounded bg-paper px-3 py-2 text-ink-800">{e.comment}</p>}
                </li>
              );
            })}
          </ol>
        )}
      </CardBody>
    </Card>
  );
}

export function ClaimComments({ claim }: { claim: ClaimDetail }) {
  return (
    <Card aria-labelledby="claim-comments">
      <CardHeader id="claim-comments" title="Comments" />
      <CardBody>
        {claim.comments.length === 0 ? (
          <p className="text-sm text-ink-600">No comments yet.</p>
        ) : (
          <ul className="space-y-3">
            {claim.comments.map((c) => (
              <li key={c.id} className="text-sm">
                <p className="text-ink-600">
                  <span className="font-medium text-ink-900">{c.authorName}</span> · {c.authorOrganisation} · <time dateTime={c.createdAt}>{formatDateTime(c.createdAt)}</time>
                </p>
                <p className="mt-1 whitespace-pre-line text-ink-900">{c.body}</p>
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}
