import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AppMeta } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';

export function getMeta(signal?: AbortSignal): Promise<AppMeta> {
  return api<AppMeta>('/api/meta', { signal });
}

export function metaQueryOptions() {
  return queryOptions({
    queryKey: ['auth', 'meta'] as const,
    queryFn: ({ signal }) => getMeta(signal),
    staleTime: Infinity,
  });
}

export function useMeta() {
  return useQuery(metaQueryOptions());
}
