import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { createInvoiceInput, Invoice } from '../../../../shared/schemas/invoices';
import { api } from '../../../lib/api-client';
import { invoiceQueryOptions } from './get-invoice';
import { invoicesKey } from './get-invoices';

export type CreateInvoiceBody = z.input<typeof createInvoiceInput>;

/** A progress or custom invoice, saved as a draft; the owner issues it from its page. */
export function createInvoice(studioId: number, body: CreateInvoiceBody): Promise<Invoice> {
  return api<Invoice>(`/api/studios/${studioId}/invoices`, { method: 'POST', body });
}

export function useCreateInvoice(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateInvoiceBody) => createInvoice(studioId, body),
    onSuccess: (inv) => {
      queryClient.setQueryData(invoiceQueryOptions(studioId, inv.id).queryKey, inv);
      return queryClient.invalidateQueries({ queryKey: invoicesKey });
    },
  });
}
