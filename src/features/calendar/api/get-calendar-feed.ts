import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CalendarFeedView } from '../../../../shared/schemas/schedule';
import { api } from '../../../lib/api-client';

/** The caller's own calendar feed: whether it is on, since when, last read by a calendar app. */
export const getCalendarFeed = (studioId: number, signal?: AbortSignal) => api<CalendarFeedView>(`/api/studios/${studioId}/calendar-feed`, { signal });

export function calendarFeedQueryOptions(studioId: number) {
  return queryOptions({ queryKey: ['calendar-feed', studioId] as const, queryFn: ({ signal }) => getCalendarFeed(studioId, signal) });
}

export const useCalendarFeed = (studioId: number) => useQuery(calendarFeedQueryOptions(studioId));
