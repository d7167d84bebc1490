import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TimeEntry } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';
import { invalidateTime } from './invalidate-time';

/** Starting a timer stops the one the person had running, wherever it was. */
export function startTimer(studioId: number, stageId: number): Promise<TimeEntry> {
  return api<TimeEntry>(`/api/studios/${studioId}/stages/${stageId}/timer`, { method: 'POST' });
}

export function useStartTimer(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (stageId: number) => startTimer(studioId, stageId),
    onSuccess: () => invalidateTime(queryClient),
  });
}
