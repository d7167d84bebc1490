import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TimeEntry } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';
import { invalidateTime } from './invalidate-time';

export function stopTimer(studioId: number): Promise<TimeEntry> {
  return api<TimeEntry>(`/api/studios/${studioId}/timer/stop`, { method: 'POST' });
}

export function useStopTimer(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => stopTimer(studioId),
    // A 409 means it was already stopped (elsewhere): refresh either way.
    onSettled: () => invalidateTime(queryClient),
  });
}
