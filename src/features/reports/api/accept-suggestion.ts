import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PriceTable } from '../../../../shared/schemas/price-table';
import { api } from '../../../lib/api-client';
import { reportsKey } from './get-actuals';

export type CellChange = { sizeClass: string; tier: string; stage: string; hours: number };

/**
 * Accepting one suggested cell goes through the price table's own API: read the table as saved now, change
 * that one cell, save it back (the server validates the whole table again). Other cells stay as they are.
 */
export async function acceptSuggestion(studioId: number, change: CellChange): Promise<PriceTable> {
  const table = await api<PriceTable>(`/api/studios/${studioId}/price-table`);
  const row = table.stageHours[change.sizeClass]?.[change.tier];
  if (!row || !(change.stage in row)) throw new Error('That cell is no longer in the price table. Reload the page.');
  const next: PriceTable = {
    ...table,
    stageHours: { ...table.stageHours, [change.sizeClass]: { ...table.stageHours[change.sizeClass], [change.tier]: { ...row, [change.stage]: change.hours } } },
  };
  return api<PriceTable>(`/api/studios/${studioId}/price-table`, { method: 'PUT', body: next });
}

export function useAcceptSuggestion(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (change: CellChange) => acceptSuggestion(studioId, change),
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: reportsKey }), queryClient.invalidateQueries({ queryKey: ['price-table'] })]),
  });
}
