import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Client } from '../../../../shared/schemas/clients';
import type { Page } from '../../../../shared/schemas/common';
import { api } from '../../../lib/api-client';

export type ClientsFilter = { q?: string; limit?: number; offset?: number; erased?: 'shown' | 'hidden' };

export function getClients(studioId: number, filter: ClientsFilter, signal?: AbortSignal): Promise<Page<Client>> {
  return api<Page<Client>>(`/api/studios/${studioId}/clients`, { query: { q: filter.q, limit: filter.limit, offset: filter.offset, erased: filter.erased }, signal });
}

export function clientsQueryOptions(studioId: number, filter: ClientsFilter = {}) {
  return queryOptions({
    queryKey: ['clients', 'list', { studioId, ...filter }] as const,
    queryFn: ({ signal }) => getClients(studioId, filter, signal),
    // Keep the old rows on screen while the next search answers.
    placeholderData: keepPreviousData,
  });
}

/** The prefix every clients list shares, for invalidation after a change. */
export const clientListsKey = ['clients', 'list'] as const;

export function useClients(studioId: number, filter: ClientsFilter) {
  return useQuery(clientsQueryOptions(studioId, filter));
}
