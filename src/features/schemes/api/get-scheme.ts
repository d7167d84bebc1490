import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Scheme } from '../../../../shared/schemas/recipes';
import { api } from '../../../lib/api-client';

export function getScheme(studioId: number, commissionId: number, signal?: AbortSignal): Promise<Scheme> {
  return api<Scheme>(`/api/studios/${studioId}/commissions/${commissionId}/scheme`, { signal });
}

export function schemeQueryOptions(studioId: number, commissionId: number) {
  return queryOptions({
    queryKey: ['schemes', 'detail', { studioId, commissionId }] as const,
    queryFn: ({ signal }) => getScheme(studioId, commissionId, signal),
  });
}

export function useScheme(studioId: number, commissionId: number) {
  return useQuery(schemeQueryOptions(studioId, commissionId));
}
