import { Navigate, Outlet, useLocation, useNavigate, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { AppShell } from '@/components/layouts/app-shell';
import { FullPageSpinner } from '@/components/ui/spinner';
import { paths, signInPath } from '@/config/paths';
import { useSession } from '@/features/auth/api/get-me';
import { requireSession } from '../require-session';
import { useSignOut } from '@/features/auth/api/sign-out';

/** Every signed-in screen sits under this route: no session, no screen. */
export const appLayoutLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireSession(queryClient, request);
    return null;
  };

export function AppLayoutRoute() {
  const me = useSession();
  const location = useLocation();
  const navigate = useNavigate();
  const signOut = useSignOut({ onSettled: () => navigate(paths.signIn, { replace: true }) });

  if (!me) {
    if (signOut.isPending) return <FullPageSpinner label="Signing out…" />;
    // The session ended while the page was open (idle limit, signed out elsewhere).
    return <Navigate to={signInPath(location.pathname + location.search)} replace />;
  }
  return (
    <AppShell user={me.user} organisation={me.organisation} onSignOut={() => signOut.mutate()} signingOut={signOut.isPending}>
      <Outlet />
    </AppShell>
  );
}
