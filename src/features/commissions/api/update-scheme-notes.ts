import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CommissionDetail } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';
import { commissionQueryOptions } from './get-commission';

export function updateSchemeNotes(studioId: number, commissionId: number, schemeNotes: string): Promise<CommissionDetail> {
  return api<CommissionDetail>(`/api/studios/${studioId}/commissions/${commissionId}/scheme-notes`, { method: 'PATCH', body: { schemeNotes } });
}

export function useUpdateSchemeNotes(studioId: number, commissionId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (schemeNotes: string) => updateSchemeNotes(studioId, commissionId, schemeNotes),
    onSuccess: (c) => queryClient.setQueryData(commissionQueryOptions(studioId, commissionId).queryKey, c),
  });
}
