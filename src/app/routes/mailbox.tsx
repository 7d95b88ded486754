import { Link } from 'react-router';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { BrandMark } from '@/components/layouts/brand-mark';
import { paths } from '@/config/paths';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useMailbox } from '@/features/mailbox/api/get-mailbox';
import { MailboxList } from '@/features/mailbox/components/mailbox-list';

/** The development mailbox: readable signed out, so a reset link can be followed. */
export function MailboxRoute() {
  const mailbox = useMailbox();
  return (
    <div className="min-h-dvh">
      <title>Mailbox · Fieldproof</title>
      <header className="bg-ink-800 text-white">
        <div className="mx-auto flex max-w-4xl items-center gap-2 px-4 py-3">
          <Link to={paths.home} className="flex items-center gap-2">
            <BrandMark className="size-7" />
            <span className="text-lg font-bold tracking-tight">Fieldproof</span>
          </Link>
        </div>
      </header>
      <main id="main" className="mx-auto max-w-4xl space-y-4 px-4 py-6">
        <h1 className="text-2xl font-semibold text-ink-900">Mailbox</h1>
        <Alert tone="info">Local mail sink: messages are not delivered anywhere. They are kept here, in memory, until the server restarts.</Alert>
        <Card aria-label="Messages" aria-busy={mailbox.isPending || undefined}>
          {mailbox.isPending && (
            <div className="p-4">
              <Spinner label="Loading messages…" />
            </div>
          )}
          {mailbox.isError && (
            <div className="p-4">
              <Alert tone={isApiError(mailbox.error, 404) ? 'info' : 'error'}>
                {isApiError(mailbox.error, 404) ? 'This server sends real e-mail, so there is no local mailbox to show.' : errorMessage(mailbox.error)}
              </Alert>
            </div>
          )}
          {mailbox.data && <MailboxList messages={mailbox.data} />}
        </Card>
        <p className="text-sm">
          <Link to={paths.home} className="text-ink-700 underline underline-offset-2">
            Back to Fieldproof
          </Link>
        </p>
      </main>
    </div>
  );
}
