import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Paint } from '../../../../shared/schemas/paints';
import { allPages } from '../../../lib/all-pages';

/** The whole rack, for choosing a step's paints. */
export function getPaintOptions(studioId: number, signal?: AbortSignal): Promise<Paint[]> {
  return allPages<Paint>(`/api/studios/${studioId}/paints`, { signal });
}

export function paintOptionsQueryOptions(studioId: number) {
  return queryOptions({
    // Under 'paints', so any change to the rack refreshes the choices too.
    queryKey: ['paints', 'options', { studioId }] as const,
    queryFn: ({ signal }) => getPaintOptions(studioId, signal),
  });
}

export function usePaintOptions(studioId: number) {
  return useQuery(paintOptionsQueryOptions(studioId));
}
