import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PriceTable } from '../../../../shared/schemas/price-table';
import { api } from '../../../lib/api-client';

/** The studio's price table, or the defaults for its currency while none is saved. */
export function getPriceTable(studioId: number, signal?: AbortSignal): Promise<PriceTable> {
  return api<PriceTable>(`/api/studios/${studioId}/price-table`, { signal });
}

export function priceTableQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['price-table', 'detail', studioId] as const,
    queryFn: ({ signal }) => getPriceTable(studioId, signal),
  });
}

export function usePriceTable(studioId: number) {
  return useQuery(priceTableQueryOptions(studioId));
}
