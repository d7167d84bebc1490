import { queryOptions, useQuery } from '@tanstack/react-query';
import type { EarliestDeliveryView } from '../../../../shared/schemas/schedule';
import { api } from '../../../lib/api-client';
import { scheduleKey } from './get-schedule';

/** A commission being quoted (its stage estimates), or a number of bench hours with an optional wait after. */
export type DeliveryWork = { commissionId?: number; hours?: number; waitHours?: number; painterId?: number };

export function getEarliestDelivery(studioId: number, work: DeliveryWork, signal?: AbortSignal): Promise<EarliestDeliveryView> {
  return api<EarliestDeliveryView>(`/api/studios/${studioId}/schedule/earliest-delivery`, { query: { ...work }, signal });
}

export function earliestDeliveryQueryOptions(studioId: number, work: DeliveryWork) {
  return queryOptions({
    queryKey: [...scheduleKey, 'earliest-delivery', { studioId, ...work }] as const,
    queryFn: ({ signal }) => getEarliestDelivery(studioId, work, signal),
    staleTime: 60_000,
  });
}

export function useEarliestDelivery(studioId: number, work: DeliveryWork) {
  const enabled = work.commissionId !== undefined || (work.hours !== undefined && work.hours > 0);
  return useQuery({ ...earliestDeliveryQueryOptions(studioId, work), enabled });
}
