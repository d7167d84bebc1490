import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Studio } from '../../../../shared/schemas/studios';
import { api } from '../../../lib/api-client';

export function getStudio(studioId: number, signal?: AbortSignal): Promise<Studio> {
  return api<Studio>(`/api/studios/${studioId}`, { signal });
}

export function studioQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['studios', 'detail', studioId] as const,
    queryFn: ({ signal }) => getStudio(studioId, signal),
  });
}

export function useStudio(studioId: number) {
  return useQuery(studioQueryOptions(studioId));
}
