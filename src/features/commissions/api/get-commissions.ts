import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { CommissionSummary } from '../../../../shared/schemas/commissions';
import type { Page } from '../../../../shared/schemas/common';
import { api } from '../../../lib/api-client';

export type CommissionsFilter = { status?: string; q?: string; clientId?: number; limit?: number; offset?: number };

export function getCommissions(studioId: number, filter: CommissionsFilter, signal?: AbortSignal): Promise<Page<CommissionSummary>> {
  return api<Page<CommissionSummary>>(`/api/studios/${studioId}/commissions`, { query: { ...filter }, signal });
}

export function commissionsQueryOptions(studioId: number, filter: CommissionsFilter = {}) {
  return queryOptions({
    queryKey: ['commissions', 'list', { studioId, ...filter }] as const,
    queryFn: ({ signal }) => getCommissions(studioId, filter, signal),
    placeholderData: keepPreviousData,
  });
}

/** The prefix every commissions list shares, for invalidation after a change. */
export const commissionListsKey = ['commissions', 'list'] as const;

export function useCommissions(studioId: number, filter: CommissionsFilter) {
  return useQuery(commissionsQueryOptions(studioId, filter));
}
