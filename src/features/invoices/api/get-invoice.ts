import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { Invoice } from '../../../../shared/schemas/invoices';

export function getInvoice(studioId: number, invoiceId: number, signal?: AbortSignal): Promise<Invoice> {
  return api<Invoice>(`/api/studios/${studioId}/invoices/${invoiceId}`, { signal });
}

export function invoiceQueryOptions(studioId: number, invoiceId: number) {
  return queryOptions({
    queryKey: ['invoices', 'detail', { studioId, invoiceId }] as const,
    queryFn: ({ signal }) => getInvoice(studioId, invoiceId, signal),
  });
}

export function useInvoice(studioId: number, invoiceId: number, opts: { enabled?: boolean; refetchInterval?: number | false } = {}) {
  return useQuery({ ...invoiceQueryOptions(studioId, invoiceId), ...opts });
}

/** The PDF is a plain link: the browser sends the session cookie and shows or saves the file. */
export function invoicePdfUrl(studioId: number, invoiceId: number): string {
  return `/api/studios/${studioId}/invoices/${invoiceId}/pdf`;
}
