import { queryOptions, useQuery } from '@tanstack/react-query';
import type { EarliestDeliveryView } from '../../../../shared/schemas/schedule';
import { api } from '../../../lib/api-client';

/** "If booked today": when the studio could deliver this much work, after the queue ahead of it. */
export function getEarliestDelivery(studioId: number, hours: number, signal?: AbortSignal): Promise<EarliestDeliveryView> {
  return api<EarliestDeliveryView>(`/api/studios/${studioId}/schedule/earliest-delivery`, { query: { hours }, signal });
}

export function earliestDeliveryQueryOptions(studioId: number, hours: number) {
  return queryOptions({
    queryKey: ['schedule', 'earliest-delivery', { studioId, hours }] as const,
    queryFn: ({ signal }) => getEarliestDelivery(studioId, hours, signal),
    staleTime: 60_000,
  });
}

export function useEarliestDelivery(studioId: number, hours: number | null) {
  return useQuery({ ...earliestDeliveryQueryOptions(studioId, hours ?? 0), enabled: hours !== null && hours >= 0.05 });
}
