import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Paint, PaintFilter } from '../../../../shared/schemas/paints';
import { allPages } from '../../../lib/all-pages';

export function getPaints(studioId: number, filter: PaintFilter, signal?: AbortSignal): Promise<Paint[]> {
  return allPages<Paint>(`/api/studios/${studioId}/paints`, { query: { q: filter.q, type: filter.type, stock: filter.stock }, signal });
}

export function paintsQueryOptions(studioId: number, filter: PaintFilter = {}) {
  return queryOptions({
    queryKey: ['paints', 'list', { studioId, ...filter }] as const,
    queryFn: ({ signal }) => getPaints(studioId, filter, signal),
    placeholderData: keepPreviousData,
  });
}

/** Every paint list and detail, for invalidation after a change to the rack. */
export const paintsKey = ['paints'] as const;

export function usePaints(studioId: number, filter: PaintFilter = {}) {
  return useQuery(paintsQueryOptions(studioId, filter));
}
