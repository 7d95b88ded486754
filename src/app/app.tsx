import { useState } from 'react';
import { RouterProvider } from 'react-router';
import { createQueryClient } from '@/lib/query-client';
import { authQueries } from '@/features/auth/api/get-me';
import { AppProvider } from './provider';
import { createAppRouter } from './router';

function createApp() {
  const queryClient = createQueryClient({
    // A query answered 401: forget everything of the session; the shell then sends the user to sign-in.
    onUnauthenticated: () =>
      queueMicrotask(() => {
        queryClient.clear();
        queryClient.setQueryData(authQueries.me().queryKey, null);
      }),
  });
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
