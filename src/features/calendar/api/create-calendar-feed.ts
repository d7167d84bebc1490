import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CalendarFeedView } from '../../../../shared/schemas/schedule';
import { api } from '../../../lib/api-client';
import { calendarFeedQueryOptions } from './get-calendar-feed';

/** A new secret address; the answer is the only place it is shown (the server keeps its hash). */
export const createCalendarFeed = (studioId: number) => api<CalendarFeedView>(`/api/studios/${studioId}/calendar-feed`, { method: 'POST' });

export function useCreateCalendarFeed(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => createCalendarFeed(studioId),
    onSuccess: (feed) => queryClient.setQueryData(calendarFeedQueryOptions(studioId).queryKey, { ...feed, url: undefined }),
  });
}
