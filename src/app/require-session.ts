import { redirect } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import type { MeResponse } from '@shared/schemas/user';
import { signInPath } from '@/config/paths';
import { authQueries } from '@/features/auth/api/get-me';

/**
 * For loaders of signed-in screens. React Router runs a page's loaders side by side, so
 * each one waits for the (shared, deduplicated) session check before asking for data,
 * and a signed-out visit goes to sign-in without a single data request.
 */
export async function requireSession(queryClient: QueryClient, request: Request): Promise<MeResponse> {
  const me = await queryClient.ensureQueryData(authQueries.me());
  if (!me) {
    const url = new URL(request.url);
    throw redirect(signInPath(url.pathname + url.search));
  }
  return me;
}
