import { useMemo, type ReactNode } from 'react';
import { AbilityProvider, Can, useAbility } from '@casl/react';
import { abilityFromRules, type AppAbility, type AppRule } from '@shared/permissions/ability';

const noRules: AppRule[] = [];

/** Provides the signed-in user's CASL ability (built from the packed rules of /api/auth/me). */
export function SessionAbilityProvider({ rules, children }: { rules: AppRule[] | null | undefined; children: ReactNode }) {
  const ability = useMemo(() => abilityFromRules(rules ?? noRules), [rules]);
  return <AbilityProvider value={ability}>{children}</AbilityProvider>;
}

export function useAppAbility(): AppAbility {
  return useAbility<AppAbility>();
}

/** `<Can I="read" a="PaymentRun">…</Can>` checked against the session's ability. */
export const AppCan = Can<AppAbility>;
