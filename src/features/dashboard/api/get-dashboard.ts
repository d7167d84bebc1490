import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Dashboard } from '../../../../shared/schemas/dashboard';
import { api } from '../../../lib/api-client';

export const getDashboard = (studioId: number, signal?: AbortSignal) => api<Dashboard>(`/api/studios/${studioId}/dashboard`, { signal });

export function dashboardQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['dashboard', studioId] as const,
    queryFn: ({ signal }) => getDashboard(studioId, signal),
    // The forecast moves as time is logged elsewhere; look again now and then.
    refetchInterval: 5 * 60_000,
  });
}

export const useDashboard = (studioId: number) => useQuery(dashboardQueryOptions(studioId));
