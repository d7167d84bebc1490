import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ScheduleView } from '../../../../shared/schemas/schedule';
import { MAX_PAGE_SIZE } from '../../../../shared/schemas/common';
import { allOffsets } from '../../../lib/all-pages';
import { api } from '../../../lib/api-client';

export type ScheduleWindow = { from?: string; weeks?: number };

/** The whole queue on the timeline (the queue editor moves all of it): the server sends a page of commissions at a time. */
export function getSchedule(studioId: number, window: ScheduleWindow, signal?: AbortSignal): Promise<ScheduleView> {
  return allOffsets<ScheduleView>(
    (offset) => api<ScheduleView>(`/api/studios/${studioId}/schedule`, { query: { from: window.from, weeks: window.weeks, limit: MAX_PAGE_SIZE, offset }, signal }),
    (into, next) => ({ ...into, commissions: [...into.commissions, ...next.commissions] }),
  );
}

/** Everything that depends on the forecast starts with this key, so one invalidation refreshes it all. */
export const scheduleKey = ['schedule'] as const;

export function scheduleQueryOptions(studioId: number, window: ScheduleWindow = {}) {
  return queryOptions({
    queryKey: [...scheduleKey, 'view', { studioId, ...window }] as const,
    queryFn: ({ signal }) => getSchedule(studioId, window, signal),
    placeholderData: keepPreviousData,
  });
}

export function useSchedule(studioId: number, window: ScheduleWindow = {}) {
  return useQuery(scheduleQueryOptions(studioId, window));
}
