import type { QueryClient } from '@tanstack/react-query';
import { isApiError } from '@/lib/api-client';
import { securityQueries } from '@/features/auth/api/get-security';
import { AccountSecurity } from '@/features/auth/components/account-security';

export const accountSecurityLoader = (queryClient: QueryClient) => async () => {
  try {
    await queryClient.ensureQueryData(securityQueries.status());
  } catch (e) {
    if (isApiError(e, 401)) throw e;
  }
  return null;
};

export function AccountSecurityRoute() {
  return (
    <div className="mx-auto max-w-3xl space-y-5">
      <title>Sign-in and security · Fieldproof</title>
      <div>
        <h1 className="text-2xl font-semibold text-ink-900">Sign-in and security</h1>
        <p className="text-sm text-ink-600">A second factor keeps your account safe when someone learns your password.</p>
      </div>
      <AccountSecurity />
    </div>
  );
}
