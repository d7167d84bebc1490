import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RunningTimer } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';

export function getTimer(studioId: number, signal?: AbortSignal): Promise<{ running: RunningTimer | null }> {
  return api<{ running: RunningTimer | null }>(`/api/studios/${studioId}/timer`, { signal });
}

/** The caller's running timer, kept on the server so it survives a reload or another device. */
export function timerQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['time', 'running', studioId] as const,
    queryFn: ({ signal }) => getTimer(studioId, signal),
    // Another device may start or stop it; look again now and then.
    refetchInterval: 60_000,
    refetchOnWindowFocus: true,
  });
}

export function useTimer(studioId: number, enabled = true) {
  return useQuery({ ...timerQueryOptions(studioId), enabled });
}
