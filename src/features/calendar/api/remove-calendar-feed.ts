import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { calendarFeedQueryOptions } from './get-calendar-feed';

export const removeCalendarFeed = (studioId: number) => api<void>(`/api/studios/${studioId}/calendar-feed`, { method: 'DELETE' });

export function useRemoveCalendarFeed(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => removeCalendarFeed(studioId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: calendarFeedQueryOptions(studioId).queryKey }),
  });
}
