import { Navigate, isRouteErrorResponse, useLocation, useRouteError } from 'react-router';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { signInPath } from '@/config/paths';
import { errorMessage, isApiError } from '@/lib/api-client';
import { NotFoundRoute } from './not-found';

/** A screen failed to load: a 404 reads as not found, a 401 goes to sign-in, anything else says what happened. */
export function RouteError() {
  const error = useRouteError();
  const location = useLocation();
  if (isApiError(error, 401)) return <Navigate to={signInPath(location.pathname + location.search)} replace />;
  if (isApiError(error, 404) || (isRouteErrorResponse(error) && error.status === 404)) return <NotFoundRoute />;
  const message = isRouteErrorResponse(error) ? `${error.status} ${error.statusText}` : errorMessage(error);
  return (
    <div className="mx-auto max-w-lg space-y-4 py-10">
      <title>Something went wrong · Fieldproof</title>
      <h1 className="text-2xl font-semibold text-ink-900">This page could not be shown</h1>
      <Alert tone="error">{message}</Alert>
      <Button variant="secondary" onClick={() => window.location.reload()}>
        Reload the page
      </Button>
    </div>
  );
}

/** The last resort, outside the shell (for example when the app code itself failed to load). */
export function RootError() {
  return (
    <main id="main" className="px-4 py-8">
      <RouteError />
    </main>
  );
}
