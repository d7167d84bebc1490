import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Approval, RequestApprovalInput } from '../../../../shared/schemas/approvals';
import { api } from '../../../lib/api-client';
import { approvalsQueryOptions } from './get-approvals';

export function requestApproval(studioId: number, commissionId: number, input: RequestApprovalInput): Promise<Approval> {
  return api<Approval>(`/api/studios/${studioId}/commissions/${commissionId}/approvals`, { method: 'POST', body: input });
}

export function useRequestApproval(studioId: number, commissionId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: RequestApprovalInput) => requestApproval(studioId, commissionId, input),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: approvalsQueryOptions(studioId, commissionId).queryKey }),
        queryClient.invalidateQueries({ queryKey: ['commissions', 'activity'] }),
      ]),
  });
}
