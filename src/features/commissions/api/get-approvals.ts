import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Approval } from '../../../../shared/schemas/approvals';
import { allPages } from '../../../lib/all-pages';

export function getApprovals(studioId: number, commissionId: number, signal?: AbortSignal): Promise<Approval[]> {
  return allPages<Approval>(`/api/studios/${studioId}/commissions/${commissionId}/approvals`, { signal });
}

export function approvalsQueryOptions(studioId: number, commissionId: number) {
  return queryOptions({
    queryKey: ['commissions', 'approvals', { studioId, commissionId }] as const,
    queryFn: ({ signal }) => getApprovals(studioId, commissionId, signal),
  });
}

export function useApprovals(studioId: number, commissionId: number) {
  return useQuery(approvalsQueryOptions(studioId, commissionId));
}
