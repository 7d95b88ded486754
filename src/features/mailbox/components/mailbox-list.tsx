import { useState } from 'react';
import { Badge } from '@/components/ui/badge';
import { EmptyState } from '@/components/ui/empty-state';
import { cx } from '@/lib/cx';
import { formatDateTime } from '@/lib/format';
import type { MailboxMessage } from '../api/get-mailbox';

/** Links in a message body made clickable (the text part only; HTML is never rendered). */
function Linkified({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s<>"]+)/g);
  return (
    <>
      {parts.map((p, i) =>
        /^https?:\/\//.test(p) ? (
          <a key={i} href={p} className="break-all text-ink-700 underline underline-offset-2">
            {p}
          </a>
        ) : (
          <span key={i}>{p}</span>
        ),
      )}
    </>
  );
}

export function MailboxList({ messages }: { messages: MailboxMessage[] }) {
  const [openId, setOpenId] = useState<MailboxMessage['id'] | null>(messages[0]?.id ?? null);
  if (messages.length === 0) {
    return <EmptyState title="No messages yet">Sign-in links, password resets, invitations and claim notices land here.</EmptyState>;
  }
  return (
    <ul className="divide-y divide-ink-100">
      {messages.map((m) => {
        const open = m.id === openId;
        const panelId = `mail-${m.id}`;
        return (
          <li key={m.id}>
            <button
              type="button"
              aria-expanded={open}
              aria-controls={panelId}
              onClick={() => setOpenId(open ? null : m.id)}
              className={cx('flex w-full flex-wrap items-baseline justify-between gap-x-4 gap-y-1 px-4 py-3 text-left hover:bg-paper', open && 'bg-paper')}
            >
              <span className="min-w-0">
                <span className="block font-medium text-ink-900">{m.subject || '(no subject)'}</span>
                <span className="block truncate text-sm text-ink-600">To {m.to.join(', ')}</span>
              </span>
              <span className="text-xs text-ink-600">{formatDateTime(m.receivedAt)}</span>
            </button>
            <div id={panelId} hidden={!open} className="space-y-2 px-4 pb-4">
              <p className="text-xs text-ink-600">From {m.from || 'unknown sender'}</p>
              <pre className="whitespace-pre-wrap break-words rounded-md bg-paper p-3 font-sans text-sm text-ink-900">
                <Linkified text={m.text} />
              </pre>
              {m.attachments.length > 0 && (
                <ul className="flex flex-wrap gap-2" aria-label="Attachments">
                  {m.attachments.map((a, i) => (
                    <li key={i}>
                      <Badge tone="ink">
                        {a.filename} · {a.contentType}
                      </Badge>
                    </li>
                  ))}
                </ul>
              )}
            </div>
          </li>
        );
      })}
    </ul>
  );
}
