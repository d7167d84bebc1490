import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { invalidateTime } from './invalidate-time';

export function removeTime(studioId: number, entryId: number): Promise<void> {
  return api<void>(`/api/studios/${studioId}/time/${entryId}`, { method: 'DELETE' });
}

export function useRemoveTime(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (entryId: number) => removeTime(studioId, entryId),
    onSuccess: () => invalidateTime(queryClient),
  });
}
