import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

/** Stops the caller's running timer (the time feature's endpoint); the logged time moves the forecast. */
export const stopTimer = (studioId: number) => api<unknown>(`/api/studios/${studioId}/timer/stop`, { method: 'POST' });

export function useStopTimer(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => stopTimer(studioId),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: ['dashboard'] }),
        queryClient.invalidateQueries({ queryKey: ['time'] }),
        queryClient.invalidateQueries({ queryKey: ['schedule'] }),
      ]),
  });
}
