import type { ReactNode } from 'react';
import { vi } from 'vitest';
import { configure, render } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { createMemoryRouter, RouterProvider, type RouteObject } from 'react-router';
import type { MeResponse } from '@shared/schemas/user';
import { defineAbilityFor, type Role } from '@shared/permissions/ability';
import { SessionAbilityProvider } from '@/lib/ability';
import { OrganisationTimeZoneProvider } from '@/lib/business-day';
import { queryDefaults } from '@/lib/query-client';

// jsdom on a busy machine is slow: give async queries room before they fail.
configure({ asyncUtilTimeout: 5000 });
vi.setConfig({ testTimeout: 20_000 });

export function testQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: { ...queryDefaults, queries: { ...queryDefaults.queries, retry: false, gcTime: Infinity } },
  });
}

const orgs = {
  agency: { id: 'org-agency-a', name: 'Test Agency A', kind: 'agency' as const, timeZone: 'America/Chicago' },
  manufacturer: { id: 'org-maker', name: 'Test Maker', kind: 'manufacturer' as const, timeZone: 'America/Chicago' },
};

/** A session for one role, with the rules the shared CASL definitions give that role. */
export function meFor(role: Role): MeResponse {
  const org = role === 'technician' || role === 'agency_admin' ? orgs.agency : orgs.manufacturer;
  const user = { id: `user-${role}`, email: `${role}@example.test`, name: `Test ${role}`, role, organisationId: org.id };
  const ability = defineAbilityFor({ ...user, organisationKind: org.kind });
  return { user, organisation: org, rules: ability.rules };
}

/** Renders routes in a memory router with a fresh query cache and the role's ability. */
export function renderRoutes(routes: RouteObject[], { path = '/', me = null as MeResponse | null, queryClient = testQueryClient() } = {}) {
  if (me) queryClient.setQueryData(['auth', 'me'], me);
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  const view = render(
    <QueryClientProvider client={queryClient}>
      <SessionAbilityProvider rules={me?.rules}>
        <OrganisationTimeZoneProvider timeZone={me?.organisation.timeZone}>
          <RouterProvider router={router} />
        </OrganisationTimeZoneProvider>
      </SessionAbilityProvider>
    </QueryClientProvider>,
  );
  return { ...view, router, queryClient };
}

export function renderWithRouter(ui: ReactNode, options: { path?: string; me?: MeResponse | null; queryClient?: QueryClient } = {}) {
  return renderRoutes([{ path: '*', element: ui }], options);
}
