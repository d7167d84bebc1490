import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { isApiError } from './api-client';

// A 4xx will not change by asking again; a dropped connection or a 5xx might.
function shouldRetry(failureCount: number, error: unknown): boolean {
  if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
}

/** `onError` sees every failed query and mutation; the query's key is passed when there is one. */
export function createQueryClient(opts: { onError?: (err: unknown, queryKey?: readonly unknown[]) => void } = {}): QueryClient {
  return new QueryClient({
    queryCache: new QueryCache({ onError: (err, query) => opts.onError?.(err, query.queryKey) }),
    mutationCache: new MutationCache({ onError: (err) => opts.onError?.(err) }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        retry: shouldRetry,
        refetchOnWindowFocus: false,
      },
      mutations: {
        retry: false,
      },
    },
  });
}
