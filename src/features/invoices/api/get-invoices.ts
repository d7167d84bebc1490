import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { Page } from '../../../../shared/schemas/common';
import type { Invoice, InvoiceKind, InvoiceStatus } from '../../../../shared/schemas/invoices';

type InvoicePage = Page<Invoice>;

export type InvoicesFilter = { status?: InvoiceStatus; kind?: InvoiceKind; clientId?: number; commissionId?: number; limit?: number; offset?: number };

export function getInvoices(studioId: number, filter: InvoicesFilter, signal?: AbortSignal): Promise<InvoicePage> {
  return api<InvoicePage>(`/api/studios/${studioId}/invoices`, { query: { ...filter }, signal });
}

export function invoicesQueryOptions(studioId: number, filter: InvoicesFilter = {}) {
  return queryOptions({
    queryKey: ['invoices', 'list', { studioId, ...filter }] as const,
    queryFn: ({ signal }) => getInvoices(studioId, filter, signal),
    placeholderData: keepPreviousData,
  });
}

/** Every invoice query (lists and details) starts with this, for invalidation after money moves. */
export const invoicesKey = ['invoices'] as const;

export function useInvoices(studioId: number, filter: InvoicesFilter) {
  return useQuery(invoicesQueryOptions(studioId, filter));
}
