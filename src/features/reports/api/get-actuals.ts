import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ActualsReport } from '../../../../shared/schemas/reports';
import { api } from '../../../lib/api-client';

export const getActuals = (studioId: number, signal?: AbortSignal) => api<ActualsReport>(`/api/studios/${studioId}/reports/actuals`, { signal });

export const reportsKey = ['reports'] as const;

export function actualsQueryOptions(studioId: number) {
  return queryOptions({ queryKey: [...reportsKey, 'actuals', studioId] as const, queryFn: ({ signal }) => getActuals(studioId, signal) });
}

export const useActuals = (studioId: number) => useQuery(actualsQueryOptions(studioId));
