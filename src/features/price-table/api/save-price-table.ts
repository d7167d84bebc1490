import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PriceTable, PriceTableInput } from '../../../../shared/schemas/price-table';
import { api } from '../../../lib/api-client';
import { priceTableQueryOptions } from './get-price-table';

/** Replaces the whole table; the server checks it with the same schema and answers the stored table. */
export function savePriceTable(studioId: number, table: PriceTableInput): Promise<PriceTable> {
  return api<PriceTable>(`/api/studios/${studioId}/price-table`, { method: 'PUT', body: table });
}

export function useSavePriceTable(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (table: PriceTableInput) => savePriceTable(studioId, table),
    onSuccess: (table) => queryClient.setQueryData(priceTableQueryOptions(studioId).queryKey, table),
  });
}
