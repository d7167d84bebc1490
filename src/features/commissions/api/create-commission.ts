import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { CommissionDetail, createCommissionInput } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';
import { commissionQueryOptions } from './get-commission';
import { commissionListsKey } from './get-commissions';

export type CreateCommissionBody = z.input<typeof createCommissionInput>;

export function createCommission(studioId: number, input: CreateCommissionBody): Promise<CommissionDetail> {
  return api<CommissionDetail>(`/api/studios/${studioId}/commissions`, { method: 'POST', body: input });
}

export function useCreateCommission(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateCommissionBody) => createCommission(studioId, input),
    onSuccess: (c) => {
      queryClient.setQueryData(commissionQueryOptions(studioId, c.id).queryKey, c);
      return queryClient.invalidateQueries({ queryKey: commissionListsKey });
    },
  });
}
