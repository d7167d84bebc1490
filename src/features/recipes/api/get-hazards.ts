import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Hazard } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';

/** The studio's caution texts, which recipe steps show for their hazards. */
export function getHazardTexts(studioId: number, signal?: AbortSignal): Promise<Hazard[]> {
  return api<Hazard[]>(`/api/studios/${studioId}/hazards`, { signal });
}

export function hazardTextsQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['recipes', 'hazard-texts', studioId] as const,
    queryFn: ({ signal }) => getHazardTexts(studioId, signal),
    staleTime: 5 * 60_000,
  });
}

export function useHazardTexts(studioId: number) {
  return useQuery(hazardTextsQueryOptions(studioId));
}
