import { useState } from 'react';
import { Link, useSearchParams } from 'react-router';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { Alert } from '@/components/ui/alert';
import { Spinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { errorMessage } from '@/lib/api-client';
import { useInvitationPreview } from '@/features/agency/api/preview-invitation';
import { AcceptInvitationForm } from '@/features/agency/components/accept-invitation-form';

/** Signed out: from the invitation e-mail's link to a new account. */
export function AcceptInvitationRoute() {
  const [params] = useSearchParams();
  const token = params.get('token')?.trim() ?? '';
  const preview = useInvitationPreview(token);
  const [acceptedAs, setAcceptedAs] = useState<string | null>(null);

  return (
    <AuthLayout title="Accept your invitation">
      {!token && (
        <Alert tone="error" title="This link is incomplete">
          Open the link from the invitation e-mail again, or ask your administrator to resend it.
        </Alert>
      )}
      {token && acceptedAs && (
        <div className="space-y-4">
          <Alert tone="success" title="Your account is ready">
            Sign in with {acceptedAs} and the password you just chose.
          </Alert>
          <Link to={paths.signIn} className="block text-center text-ink-700 underline underline-offset-2">
            Go to sign-in
          </Link>
        </div>
      )}
      {token && !acceptedAs && preview.isPending && <Spinner label="Checking the invitation…" />}
      {token && !acceptedAs && preview.isError && (
        <Alert tone="error" title="This invitation cannot be used">
          {errorMessage(preview.error)}
        </Alert>
      )}
      {token && !acceptedAs && preview.data && <AcceptInvitationForm token={token} preview={preview.data} onAccepted={setAcceptedAs} />}
    </AuthLayout>
  );
}
