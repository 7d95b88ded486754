import { useState } from 'react';
import { roleLabels } from '@shared/permissions/ability';
import type { InvitationListItem } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { useResendInvitation } from '../api/resend-invitation';
import { useRevokeInvitation } from '../api/revoke-invitation';

/** Invitations not yet accepted: resend (new link, old one dead) or revoke. */
export function InvitationsList({ items }: { items: InvitationListItem[] }) {
  const resend = useResendInvitation();
  const revoke = useRevokeInvitation();
  const [note, setNote] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  if (items.length === 0) return <p className="px-4 py-3 text-sm text-ink-600">No invitations are waiting for an answer.</p>;
  const busy = (id: string) => (resend.isPending && resend.variables === id) || (revoke.isPending && revoke.variables === id);
  return (
    <div>
      {note && (
        <Alert tone={note.tone} className="mx-4 mt-3">
          {note.text}
        </Alert>
      )}
      <ul className="divide-y divide-ink-100" aria-label="Pending invitations">
        {items.map((inv) => (
          <li key={inv.id} className="flex flex-wrap items-center gap-3 px-4 py-3">
            <div className="min-w-0 flex-1">
              <p className="font-medium text-ink-900">{inv.email}</p>
              <p className="text-sm text-ink-600">
                {roleLabels[inv.role]} · invited {formatDateTime(inv.createdAt)}
                {inv.invitedByName ? ` by ${inv.invitedByName}` : ''} · {inv.status === 'expired' ? 'expired' : 'link valid until'} {formatDateTime(inv.expiresAt)}
              </p>
            </div>
            {inv.status === 'expired' ? <Badge tone="red">Expired</Badge> : <Badge tone="blue">Pending</Badge>}
            <Button
              size="sm"
              variant="secondary"
              disabled={busy(inv.id)}
              onClick={() =>
                resend.mutate(inv.id, {
                  onSuccess: () => setNote({ tone: 'success', text: `A new link went to ${inv.email}. The earlier link no longer works.` }),
                  onError: (e) => setNote({ tone: 'error', text: errorMessage(e) }),
                })
              }
            >
              Resend
            </Button>
            <Button
              size="sm"
              variant="ghost"
              disabled={busy(inv.id)}
              onClick={() =>
                revoke.mutate(inv.id, {
                  onSuccess: () => setNote({ tone: 'success', text: `The invitation to ${inv.email} was revoked.` }),
                  onError: (e) => setNote({ tone: 'error', text: errorMessage(e) }),
                })
              }
            >
              Revoke
            </Button>
          </li>
        ))}
      </ul>
    </div>
  );
}
