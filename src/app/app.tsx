import { useState } from 'react';
import { RouterProvider } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { createQueryClient } from '@/lib/query-client';
import { authQueries } from '@/features/auth/api/get-me';
import { AppProvider } from './provider';
import { createAppRouter } from './router';

/** The app's query cache: a query answered 401 forgets the session, and the shell then sends the user to sign-in. */
export function createAppQueryClient(): QueryClient {
  const queryClient = createQueryClient({
    onUnauthenticated: () => {
      queryClient.setQueryData(authQueries.me().queryKey, null);
      // Everything else of the session goes too, once the failing query has finished reporting.
      queueMicrotask(() => queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== authQueries.all[0] }));
    },
  });
  return queryClient;
}

function createApp() {
  const queryClient = createAppQueryClient();
  const router = createAppRouter(queryClient);
  return { queryClient, router };
}

export function App() {
  const [{ queryClient, router }] = useState(createApp);
  return (
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>
  );
}
