import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DayOff, DayOffInput } from '../../../../shared/schemas/capacity';
import { api } from '../../../lib/api-client';
import { invalidateAfterCapacity } from './invalidate';

export const addDayOff = (studioId: number, body: DayOffInput) => api<DayOff>(`/api/studios/${studioId}/capacity/days-off`, { method: 'POST', body });

export function useAddDayOff(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: (body: DayOffInput) => addDayOff(studioId, body), onSuccess: () => invalidateAfterCapacity(queryClient) });
}
