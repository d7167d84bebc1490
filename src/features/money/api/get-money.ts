import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MoneyView } from '../../../../shared/schemas/invoices';
import { api } from '../../../lib/api-client';

export function getMoney(studioId: number, signal?: AbortSignal): Promise<MoneyView> {
  return api<MoneyView>(`/api/studios/${studioId}/money`, { signal });
}

export function moneyQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['money', 'overview', studioId] as const,
    queryFn: ({ signal }) => getMoney(studioId, signal),
  });
}

export function useMoney(studioId: number) {
  return useQuery(moneyQueryOptions(studioId));
}
