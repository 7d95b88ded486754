import { redirect, useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { AuthLayout } from '@/components/layouts/auth-layout';
import { Alert } from '@/components/ui/alert';
import { safeRedirect } from '@/config/paths';
import { authQueries } from '@/features/auth/api/get-me';
import { SignInForm } from '@/features/auth/components/sign-in-form';

/** Already signed in: straight on to where the user was going. */
export const signInLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const me = await queryClient.ensureQueryData(authQueries.me()).catch(() => null);
    if (me) throw redirect(safeRedirect(new URL(request.url).searchParams.get('redirectTo')));
    return null;
  };

export function SignInRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const redirectTo = params.get('redirectTo');
  return (
    <AuthLayout title="Sign in" intro="Use the e-mail address your organisation registered for you.">
      {redirectTo && (
        <Alert tone="info" className="mb-4">
          Sign in to continue where you were.
        </Alert>
      )}
      <SignInForm onSuccess={() => navigate(safeRedirect(redirectTo), { replace: true })} />
      <p className="mt-6 border-t border-ink-100 pt-4 text-sm text-ink-600">Demo accounts are printed by npm start</p>
    </AuthLayout>
  );
}
