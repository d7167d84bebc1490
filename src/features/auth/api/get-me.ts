import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MeResponse } from '../../../../shared/schemas/auth';
import { api, isApiError } from '../../../lib/api-client';

/** Who is signed in; null when nobody is (the API answers 401). */
export async function getMe(signal?: AbortSignal): Promise<MeResponse | null> {
  try {
    return await api<MeResponse>('/api/auth/me', { signal });
  } catch (err) {
    if (isApiError(err, 401)) return null;
    throw err;
  }
}

export function meQueryOptions() {
  return queryOptions({
    queryKey: ['auth', 'me'] as const,
    queryFn: ({ signal }) => getMe(signal),
    staleTime: 60_000,
  });
}

export function useMe() {
  return useQuery(meQueryOptions());
}
