import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paint, PaintListQuery } from '../../../../shared/schemas/paints';
import { api } from '../../../lib/api-client';

export function getPaints(studioId: number, filter: PaintListQuery, signal?: AbortSignal): Promise<Paint[]> {
  return api<Paint[]>(`/api/studios/${studioId}/paints`, { query: { q: filter.q, type: filter.type, stock: filter.stock }, signal });
}

export function paintsQueryOptions(studioId: number, filter: PaintListQuery = {}) {
  return queryOptions({
    queryKey: ['paints', 'list', { studioId, ...filter }] as const,
    queryFn: ({ signal }) => getPaints(studioId, filter, signal),
    placeholderData: keepPreviousData,
  });
}

/** Every paint list and detail, for invalidation after a change to the rack. */
export const paintsKey = ['paints'] as const;

export function usePaints(studioId: number, filter: PaintListQuery = {}) {
  return useQuery(paintsQueryOptions(studioId, filter));
}
