import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { membersQueryOptions } from './get-members';

export function removeMember(studioId: number, userId: number): Promise<void> {
  return api<void>(`/api/studios/${studioId}/members/${userId}`, { method: 'DELETE' });
}

export function useRemoveMember(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (userId: number) => removeMember(studioId, userId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: membersQueryOptions(studioId).queryKey }),
  });
}
