import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { AcceptEnquiryResult, acceptEnquiryInput } from '../../../../shared/schemas/enquiries';
import { api } from '../../../lib/api-client';
import { enquiryQueryOptions } from './get-enquiry';
import { enquiryListsKey } from './get-enquiries';

export type AcceptEnquiryBody = z.input<typeof acceptEnquiryInput>;

export function acceptEnquiry(studioId: number, enquiryId: number, body: AcceptEnquiryBody): Promise<AcceptEnquiryResult> {
  return api<AcceptEnquiryResult>(`/api/studios/${studioId}/enquiries/${enquiryId}/accept`, { method: 'POST', body });
}

export function useAcceptEnquiry(studioId: number, enquiryId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: AcceptEnquiryBody) => acceptEnquiry(studioId, enquiryId, body),
    onSuccess: (r) => {
      queryClient.setQueryData(enquiryQueryOptions(studioId, enquiryId).queryKey, r.enquiry);
      // A new client and a new commission exist now.
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: enquiryListsKey }),
        queryClient.invalidateQueries({ queryKey: ['clients'] }),
        queryClient.invalidateQueries({ queryKey: ['commissions'] }),
      ]);
    },
  });
}
