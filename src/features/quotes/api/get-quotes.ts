import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Page } from '../../../../shared/schemas/common';
import type { QuoteStatus, QuoteSummary } from '../../../../shared/schemas/quotes';
import { api } from '../../../lib/api-client';

export type QuotesFilter = { status?: QuoteStatus; commissionId?: number; limit?: number; offset?: number };

export function getQuotes(studioId: number, filter: QuotesFilter, signal?: AbortSignal): Promise<Page<QuoteSummary>> {
  return api<Page<QuoteSummary>>(`/api/studios/${studioId}/quotes`, { query: { ...filter }, signal });
}

export function quotesQueryOptions(studioId: number, filter: QuotesFilter = {}) {
  return queryOptions({
    queryKey: ['quotes', 'list', { studioId, ...filter }] as const,
    queryFn: ({ signal }) => getQuotes(studioId, filter, signal),
    placeholderData: keepPreviousData,
  });
}

/** Every quote query (lists and details) starts with this. */
export const quotesKey = ['quotes'] as const;

export function useQuotes(studioId: number, filter: QuotesFilter, opts: { enabled?: boolean } = {}) {
  return useQuery({ ...quotesQueryOptions(studioId, filter), ...opts });
}
