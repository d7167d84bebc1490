import { useState, type ReactNode } from 'react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { ToastProvider } from '../components/ui/toast';
import { isApiError } from '../lib/api-client';
import { createQueryClient } from '../lib/query-client';
import { meQueryOptions } from '../features/auth/api/get-me';

/**
 * A 401 anywhere but the auth calls means the session ended under us (expired, or signed out in
 * another tab): ask again who is signed in, and the guard sends the person to sign in.
 */
function makeClient(): QueryClient {
  const client: QueryClient = createQueryClient({
    onError: (err, key) => {
      if (!isApiError(err, 401) || key?.[0] === 'auth') return;
      void client.invalidateQueries({ queryKey: meQueryOptions().queryKey });
    },
  });
  return client;
}

export function Providers({ children }: { children: ReactNode }) {
  const [queryClient] = useState(makeClient);
  return (
    <QueryClientProvider client={queryClient}>
      <ToastProvider>{children}</ToastProvider>
    </QueryClientProvider>
  );
}
