import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ActivityEntry } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';

export function getActivity(studioId: number, commissionId: number, signal?: AbortSignal): Promise<ActivityEntry[]> {
  return api<ActivityEntry[]>(`/api/studios/${studioId}/commissions/${commissionId}/activity`, { signal });
}

export function activityQueryOptions(studioId: number, commissionId: number) {
  return queryOptions({
    queryKey: ['commissions', 'activity', { studioId, commissionId }] as const,
    queryFn: ({ signal }) => getActivity(studioId, commissionId, signal),
  });
}

export function useActivity(studioId: number, commissionId: number) {
  return useQuery(activityQueryOptions(studioId, commissionId));
}
