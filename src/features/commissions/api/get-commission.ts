import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CommissionDetail } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';

export function getCommission(studioId: number, commissionId: number, signal?: AbortSignal): Promise<CommissionDetail> {
  return api<CommissionDetail>(`/api/studios/${studioId}/commissions/${commissionId}`, { signal });
}

export function commissionQueryOptions(studioId: number, commissionId: number) {
  return queryOptions({
    queryKey: ['commissions', 'detail', { studioId, commissionId }] as const,
    queryFn: ({ signal }) => getCommission(studioId, commissionId, signal),
  });
}

/** Every commission detail (and what hangs off one: activity), for invalidation from other screens. */
export const commissionDetailsKey = ['commissions', 'detail'] as const;

export function useCommission(studioId: number, commissionId: number) {
  return useQuery(commissionQueryOptions(studioId, commissionId));
}
