import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { CommissionDetail, updateCommissionInput } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';
import { commissionQueryOptions } from './get-commission';
import { commissionListsKey } from './get-commissions';

export type UpdateCommissionBody = z.input<typeof updateCommissionInput>;

export function updateCommission(studioId: number, commissionId: number, input: UpdateCommissionBody): Promise<CommissionDetail> {
  return api<CommissionDetail>(`/api/studios/${studioId}/commissions/${commissionId}`, { method: 'PATCH', body: input });
}

export function useUpdateCommission(studioId: number, commissionId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateCommissionBody) => updateCommission(studioId, commissionId, input),
    onSuccess: (c) => {
      queryClient.setQueryData(commissionQueryOptions(studioId, commissionId).queryKey, c);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: commissionListsKey }),
        queryClient.invalidateQueries({ queryKey: ['commissions', 'activity'] }),
      ]);
    },
  });
}
