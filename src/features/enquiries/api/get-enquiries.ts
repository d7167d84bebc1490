import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Page } from '../../../../shared/schemas/common';
import type { EnquiryStatus, EnquirySummary } from '../../../../shared/schemas/enquiries';
import { api } from '../../../lib/api-client';

export type EnquiriesFilter = { status?: EnquiryStatus; q?: string; limit?: number; offset?: number };
export type EnquiriesPage = Page<EnquirySummary> & { newCount: number };

export function getEnquiries(studioId: number, filter: EnquiriesFilter, signal?: AbortSignal): Promise<EnquiriesPage> {
  return api<EnquiriesPage>(`/api/studios/${studioId}/enquiries`, { query: { status: filter.status, q: filter.q, limit: filter.limit, offset: filter.offset }, signal });
}

export function enquiriesQueryOptions(studioId: number, filter: EnquiriesFilter = {}) {
  return queryOptions({
    queryKey: ['enquiries', 'list', { studioId, ...filter }] as const,
    queryFn: ({ signal }) => getEnquiries(studioId, filter, signal),
    placeholderData: keepPreviousData,
  });
}

/** Every enquiries list, for invalidation after a decision. */
export const enquiryListsKey = ['enquiries', 'list'] as const;

export function useEnquiries(studioId: number, filter: EnquiriesFilter) {
  return useQuery(enquiriesQueryOptions(studioId, filter));
}
