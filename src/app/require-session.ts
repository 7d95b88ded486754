import { redirect } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import type { MeResponse } from '@shared/schemas/user';
import { signInPath } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { authQueries } from '@/features/auth/api/get-me';

function toSignIn(request: Request): Response {
  const url = new URL(request.url);
  return redirect(signInPath(url.pathname + url.search));
}

/**
 * For loaders of signed-in screens. React Router runs a page's loaders side by side, so
 * each one waits for the (shared, deduplicated) session check before asking for data,
 * and a signed-out visit goes to sign-in without a single data request.
 */
export async function requireSession(queryClient: QueryClient, request: Request): Promise<MeResponse> {
  const me = await queryClient.ensureQueryData(authQueries.me());
  if (!me) throw toSignIn(request);
  return me;
}

/**
 * Loads a screen's data. A 401 means the session ended meanwhile: it is forgotten and the
 * user goes to sign-in (and back here afterwards). Other errors stay in the query, for the
 * screen to show beside its controls, unless `rethrow` says the screen cannot render without it.
 */
export async function loadOrSignIn(queryClient: QueryClient, request: Request, load: () => Promise<unknown>, { rethrow = false } = {}): Promise<void> {
  try {
    await load();
  } catch (e) {
    if (isApiError(e, 401)) {
      queryClient.setQueryData(authQueries.me().queryKey, null);
      throw toSignIn(request);
    }
    if (rethrow) throw e;
  }
}
