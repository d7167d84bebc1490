import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StudioLists } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';

/** The studio's tiers and extras, for pickers and labels. */
export function getLists(studioId: number, signal?: AbortSignal): Promise<StudioLists> {
  return api<StudioLists>(`/api/studios/${studioId}/lists`, { signal });
}

export function listsQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['studio-setup', 'lists', studioId] as const,
    queryFn: ({ signal }) => getLists(studioId, signal),
    staleTime: 5 * 60_000,
  });
}

export function useLists(studioId: number) {
  return useQuery(listsQueryOptions(studioId));
}
