import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ModelsIn } from '../../../../shared/schemas/shipments';
import { api } from '../../../lib/api-client';

export function getModelsIn(studioId: number, commissionId: number, signal?: AbortSignal): Promise<ModelsIn> {
  return api<ModelsIn>(`/api/studios/${studioId}/commissions/${commissionId}/models-in`, { signal });
}

export function modelsInQueryOptions(studioId: number, commissionId: number) {
  return queryOptions({
    queryKey: ['models-in', 'detail', { studioId, commissionId }] as const,
    queryFn: ({ signal }) => getModelsIn(studioId, commissionId, signal),
  });
}

export function useModelsIn(studioId: number, commissionId: number) {
  return useQuery(modelsInQueryOptions(studioId, commissionId));
}
