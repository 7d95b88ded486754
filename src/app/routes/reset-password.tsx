import { Link, useSearchParams } from 'react-router';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { Alert } from '@/components/ui/alert';
import { paths } from '@/config/paths';
import { ResetPasswordForm } from '@/features/auth/components/reset-password-form';

export function ResetPasswordRoute() {
  const [params] = useSearchParams();
  const token = params.get('token')?.trim() ?? '';
  return (
    <AuthLayout title="Choose a new password">
      {token ? (
        <ResetPasswordForm token={token} />
      ) : (
        <Alert tone="error" title="This link is incomplete">
          Open the link from the e-mail again, or{' '}
          <Link to={paths.forgotPassword} className="underline underline-offset-2">
            ask for a new one
          </Link>
          .
        </Alert>
      )}
    </AuthLayout>
  );
}
