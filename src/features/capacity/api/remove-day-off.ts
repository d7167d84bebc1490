import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { invalidateAfterCapacity } from './invalidate';

export const removeDayOff = (studioId: number, id: number) => api<void>(`/api/studios/${studioId}/capacity/days-off/${id}`, { method: 'DELETE' });

export function useRemoveDayOff(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: (id: number) => removeDayOff(studioId, id), onSuccess: () => invalidateAfterCapacity(queryClient) });
}
