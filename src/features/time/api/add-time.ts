import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ManualTimeInput, TimeEntry } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';
import { invalidateTime } from './invalidate-time';

export function addTime(studioId: number, stageId: number, input: ManualTimeInput): Promise<TimeEntry> {
  return api<TimeEntry>(`/api/studios/${studioId}/stages/${stageId}/time`, { method: 'POST', body: input });
}

export function useAddTime(studioId: number, stageId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ManualTimeInput) => addTime(studioId, stageId, input),
    onSuccess: () => invalidateTime(queryClient),
  });
}
