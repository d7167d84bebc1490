import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AcceptInvitationInput, MeResponse } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';

export type AcceptInvitationResult = MeResponse & { studioId: number };

export function acceptInvitation(token: string, input: AcceptInvitationInput): Promise<AcceptInvitationResult> {
  return api<AcceptInvitationResult>(`/api/invitations/${encodeURIComponent(token)}/accept`, {
    method: 'POST',
    body: input,
    rotatesSession: true,
  });
}

export function useAcceptInvitation(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: AcceptInvitationInput) => acceptInvitation(token, input),
    // Whoever was signed in before, the invited person is now: nothing cached for anyone else may stay.
    // The preview itself is kept so the screen does not flash "used" before moving on.
    onSuccess: () => queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== 'invitations' }),
  });
}
