import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ActivityEntry } from '../../../../shared/schemas/commissions';
import { allPages } from '../../../lib/all-pages';

export function getActivity(studioId: number, commissionId: number, signal?: AbortSignal): Promise<ActivityEntry[]> {
  // The newest 500 entries, as before the log was paged.
  return allPages<ActivityEntry>(`/api/studios/${studioId}/commissions/${commissionId}/activity`, { signal, max: 500 });
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
