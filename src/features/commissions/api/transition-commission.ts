import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CommissionStatus } from '../../../../shared/commission-lifecycle';
import type { CommissionDetail } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';
import { commissionQueryOptions } from './get-commission';
import { commissionListsKey } from './get-commissions';

export type TransitionBody = { to: CommissionStatus; reason?: string };

/** A refused move answers 409 with a sentence naming the allowed ones; the screen shows it as it is. */
export function transitionCommission(studioId: number, commissionId: number, body: TransitionBody): Promise<CommissionDetail> {
  return api<CommissionDetail>(`/api/studios/${studioId}/commissions/${commissionId}/transitions`, { method: 'POST', body });
}

export function useTransitionCommission(studioId: number, commissionId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: TransitionBody) => transitionCommission(studioId, commissionId, body),
    onSuccess: (c) => {
      queryClient.setQueryData(commissionQueryOptions(studioId, commissionId).queryKey, c);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: commissionListsKey }),
        queryClient.invalidateQueries({ queryKey: ['commissions', 'activity'] }),
        queryClient.invalidateQueries({ queryKey: ['board'] }),
      ]);
    },
  });
}
