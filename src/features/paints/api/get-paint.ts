import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Paint } from '../../../../shared/schemas/paints';
import { api } from '../../../lib/api-client';

export function getPaint(studioId: number, paintId: number, signal?: AbortSignal): Promise<Paint> {
  return api<Paint>(`/api/studios/${studioId}/paints/${paintId}`, { signal });
}

export function paintQueryOptions(studioId: number, paintId: number) {
  return queryOptions({
    queryKey: ['paints', 'detail', { studioId, paintId }] as const,
    queryFn: ({ signal }) => getPaint(studioId, paintId, signal),
  });
}

export function usePaint(studioId: number, paintId: number, enabled = true) {
  return useQuery({ ...paintQueryOptions(studioId, paintId), enabled });
}
