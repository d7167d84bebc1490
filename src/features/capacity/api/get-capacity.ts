import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CapacityView } from '../../../../shared/schemas/capacity';
import { api } from '../../../lib/api-client';

export const getCapacity = (studioId: number, signal?: AbortSignal) => api<CapacityView>(`/api/studios/${studioId}/capacity`, { signal });

export const capacityKey = ['capacity'] as const;

export function capacityQueryOptions(studioId: number) {
  return queryOptions({ queryKey: [...capacityKey, studioId] as const, queryFn: ({ signal }) => getCapacity(studioId, signal) });
}

export const useCapacity = (studioId: number) => useQuery(capacityQueryOptions(studioId));
