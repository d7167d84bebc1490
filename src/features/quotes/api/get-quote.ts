import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Quote } from '../../../../shared/schemas/quotes';
import { api } from '../../../lib/api-client';

export function getQuote(studioId: number, quoteId: number, signal?: AbortSignal): Promise<Quote> {
  return api<Quote>(`/api/studios/${studioId}/quotes/${quoteId}`, { signal });
}

export function quoteQueryOptions(studioId: number, quoteId: number) {
  return queryOptions({
    queryKey: ['quotes', 'detail', { studioId, quoteId }] as const,
    queryFn: ({ signal }) => getQuote(studioId, quoteId, signal),
  });
}

export function useQuote(studioId: number, quoteId: number, opts: { enabled?: boolean } = {}) {
  return useQuery({ ...quoteQueryOptions(studioId, quoteId), ...opts });
}
