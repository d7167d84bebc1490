import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TimeEntry } from '../../../../shared/schemas/commissions';
import { allPages } from '../../../lib/all-pages';

export function getStageTime(studioId: number, stageId: number, signal?: AbortSignal): Promise<TimeEntry[]> {
  return allPages<TimeEntry>(`/api/studios/${studioId}/stages/${stageId}/time`, { signal });
}

export function stageTimeQueryOptions(studioId: number, stageId: number) {
  return queryOptions({
    queryKey: ['time', 'stage', { studioId, stageId }] as const,
    queryFn: ({ signal }) => getStageTime(studioId, stageId, signal),
  });
}

export function useStageTime(studioId: number, stageId: number) {
  return useQuery(stageTimeQueryOptions(studioId, stageId));
}
