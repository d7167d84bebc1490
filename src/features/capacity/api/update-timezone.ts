import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Studio } from '../../../../shared/schemas/studios';
import { api } from '../../../lib/api-client';
import { invalidateAfterCapacity } from './invalidate';

/** The studio's timezone lives on the studio (PATCH /api/studios/:id); every date of the calendar follows it. */
export const updateTimezone = (studioId: number, timezone: string) => api<Studio>(`/api/studios/${studioId}`, { method: 'PATCH', body: { timezone } });

export function useUpdateTimezone(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (timezone: string) => updateTimezone(studioId, timezone),
    onSuccess: () => Promise.all([invalidateAfterCapacity(queryClient), queryClient.invalidateQueries({ queryKey: ['studios'] })]),
  });
}
