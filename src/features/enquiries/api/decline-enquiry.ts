import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DeclineEnquiryInput, Enquiry } from '../../../../shared/schemas/enquiries';
import { api } from '../../../lib/api-client';
import { enquiryQueryOptions } from './get-enquiry';
import { enquiryListsKey } from './get-enquiries';

export function declineEnquiry(studioId: number, enquiryId: number, body: DeclineEnquiryInput): Promise<Enquiry> {
  return api<Enquiry>(`/api/studios/${studioId}/enquiries/${enquiryId}/decline`, { method: 'POST', body });
}

export function useDeclineEnquiry(studioId: number, enquiryId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: DeclineEnquiryInput) => declineEnquiry(studioId, enquiryId, body),
    onSuccess: (e) => {
      queryClient.setQueryData(enquiryQueryOptions(studioId, enquiryId).queryKey, e);
      return queryClient.invalidateQueries({ queryKey: enquiryListsKey });
    },
  });
}
