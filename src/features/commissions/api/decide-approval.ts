import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Approval } from '../../../../shared/schemas/approvals';
import { api } from '../../../lib/api-client';

export type Decision = { approvalId: number; decision: 'approve' | 'request-changes'; comment?: string };

/** The client's answer; an approved "finished" moves the commission on, so the detail is fetched again. */
export function decideApproval(studioId: number, { approvalId, decision, comment }: Decision): Promise<Approval> {
  return api<Approval>(`/api/studios/${studioId}/approvals/${approvalId}/${decision}`, { method: 'POST', body: comment ? { comment } : {} });
}

export function useDecideApproval(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (d: Decision) => decideApproval(studioId, d),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['commissions'] }),
  });
}
