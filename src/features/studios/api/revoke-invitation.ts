import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { invitationsQueryOptions } from './get-invitations';

export function revokeInvitation(studioId: number, invitationId: number): Promise<void> {
  return api<void>(`/api/studios/${studioId}/invitations/${invitationId}`, { method: 'DELETE' });
}

export function useRevokeInvitation(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (invitationId: number) => revokeInvitation(studioId, invitationId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: invitationsQueryOptions(studioId).queryKey }),
  });
}
