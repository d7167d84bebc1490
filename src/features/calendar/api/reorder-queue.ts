import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ScheduleView } from '../../../../shared/schemas/schedule';
import { api } from '../../../lib/api-client';
import { scheduleKey } from './get-schedule';

/** The whole queue in its new order; 409 queue_changed when it no longer matches the studio's queue. */
export function reorderQueue(studioId: number, commissionIds: number[]): Promise<ScheduleView> {
  return api<ScheduleView>(`/api/studios/${studioId}/schedule/queue`, { method: 'PUT', body: { commissionIds } });
}

export function useReorderQueue(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (commissionIds: number[]) => reorderQueue(studioId, commissionIds),
    onSettled: () => Promise.all([queryClient.invalidateQueries({ queryKey: scheduleKey }), queryClient.invalidateQueries({ queryKey: ['dashboard'] })]),
  });
}
