import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Invitation } from '../../../../shared/schemas/studios';
import { api } from '../../../lib/api-client';
import { clientQueryOptions } from './get-client';
import { clientListsKey } from './get-clients';

/** Sends the client an e-mail with a link to their portal account. */
export function inviteClient(studioId: number, clientId: number): Promise<Invitation> {
  return api<Invitation>(`/api/studios/${studioId}/clients/${clientId}/invite`, { method: 'POST' });
}

export function useInviteClient(studioId: number, clientId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => inviteClient(studioId, clientId),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: clientQueryOptions(studioId, clientId).queryKey }),
        queryClient.invalidateQueries({ queryKey: clientListsKey }),
      ]),
  });
}
