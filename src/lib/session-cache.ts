import type { QueryClient } from '@tanstack/react-query';
import type { MeResponse } from '@shared/schemas/user';

/** The cache key of the session (GET /api/auth/me); the header and the ability read it. */
export const sessionQueryKey = ['auth', 'me'] as const;

/**
 * After the signed-in user's own organisation was renamed: the session in the cache takes the
 * new name at once (the header shows it), then is fetched again to stay exact.
 */
export function renameOwnOrganisation(queryClient: QueryClient, organisationId: string, name: string): void {
  const me = queryClient.getQueryData<MeResponse | null>(sessionQueryKey);
  if (!me || me.organisation.id !== organisationId) return;
  const renamed: MeResponse = { ...me, organisation: { ...me.organisation, name } };
  queryClient.setQueryData([...sessionQueryKey], renamed);
  void queryClient.invalidateQueries({ queryKey: sessionQueryKey, refetchType: 'all' });
}
