import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Enquiry } from '../../../../shared/schemas/enquiries';
import { api } from '../../../lib/api-client';

export function getEnquiry(studioId: number, enquiryId: number, signal?: AbortSignal): Promise<Enquiry> {
  return api<Enquiry>(`/api/studios/${studioId}/enquiries/${enquiryId}`, { signal });
}

export function enquiryQueryOptions(studioId: number, enquiryId: number) {
  return queryOptions({
    queryKey: ['enquiries', 'detail', { studioId, enquiryId }] as const,
    queryFn: ({ signal }) => getEnquiry(studioId, enquiryId, signal),
  });
}

export function useEnquiry(studioId: number, enquiryId: number) {
  return useQuery(enquiryQueryOptions(studioId, enquiryId));
}
