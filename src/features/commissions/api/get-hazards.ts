import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Hazard } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';

/** The studio's caution texts (already ending with the safety-data-sheet sentence). */
export function getHazards(studioId: number, signal?: AbortSignal): Promise<Hazard[]> {
  return api<Hazard[]>(`/api/studios/${studioId}/hazards`, { signal });
}

export function hazardsQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['studio-setup', 'hazards', studioId] as const,
    queryFn: ({ signal }) => getHazards(studioId, signal),
    staleTime: 5 * 60_000,
  });
}

export function useHazards(studioId: number) {
  return useQuery(hazardsQueryOptions(studioId));
}
