import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Invitation, InviteMemberInput } from '../../../../shared/schemas/studios';
import { api } from '../../../lib/api-client';
import { invitationsQueryOptions } from './get-invitations';

export function createInvitation(studioId: number, input: InviteMemberInput): Promise<Invitation> {
  return api<Invitation>(`/api/studios/${studioId}/invitations`, { method: 'POST', body: input });
}

export function useCreateInvitation(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: InviteMemberInput) => createInvitation(studioId, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: invitationsQueryOptions(studioId).queryKey }),
  });
}
