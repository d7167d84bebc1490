import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Invoice } from '../../../../shared/schemas/invoices';
import type { CancellationPreview } from '../../../../shared/schemas/quotes';
import { api } from '../../../lib/api-client';
import { invoicesKey } from './get-invoices';

const path = (studioId: number, commissionId: number) => `/api/studios/${studioId}/commissions/${commissionId}/cancellation`;

/** What cancelling would keep and refund, by the studio's terms, before the owner confirms. */
export function getCancellation(studioId: number, commissionId: number, signal?: AbortSignal): Promise<CancellationPreview> {
  return api<CancellationPreview>(path(studioId, commissionId), { signal });
}

export function cancellationQueryOptions(studioId: number, commissionId: number) {
  return queryOptions({
    queryKey: ['invoices', 'cancellation', { studioId, commissionId }] as const,
    queryFn: ({ signal }) => getCancellation(studioId, commissionId, signal),
    staleTime: 0,
  });
}

export function useCancellation(studioId: number, commissionId: number, opts: { enabled?: boolean } = {}) {
  return useQuery({ ...cancellationQueryOptions(studioId, commissionId), ...opts });
}

export type CancelResult = { preview: CancellationPreview; creditNotes: Invoice[] };

export function useCancelCommission(studioId: number, commissionId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (reason: string) => api<CancelResult>(path(studioId, commissionId), { method: 'POST', body: { reason } }),
    // the commission's status, its quotes and the money overview all change
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: invoicesKey }),
        queryClient.invalidateQueries({ queryKey: ['commissions'] }),
        queryClient.invalidateQueries({ queryKey: ['quotes'] }),
        queryClient.invalidateQueries({ queryKey: ['money'] }),
      ]),
  });
}
