// The owner's actions on one invoice; each answers the invoice as it now stands.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { invoiceQueryOptions } from './get-invoice';
import { invoicesKey } from './get-invoices';
import type { Invoice, PaymentMethod } from '../../../../shared/schemas/invoices';

export type RecordPaymentBody = { method: PaymentMethod; amountMinor: number; receivedAt?: string; reference?: string };
export type RefundBody = { amountMinor?: number; reason: string };
export type RefundResult = { invoice: Invoice; creditNote: Invoice };

const base = (studioId: number, invoiceId: number) => `/api/studios/${studioId}/invoices/${invoiceId}`;

export const issueInvoice = (studioId: number, invoiceId: number) => api<Invoice>(`${base(studioId, invoiceId)}/issue`, { method: 'POST' });
export const voidInvoice = (studioId: number, invoiceId: number) => api<Invoice>(`${base(studioId, invoiceId)}/void`, { method: 'POST' });
export const recordPayment = (studioId: number, invoiceId: number, body: RecordPaymentBody) =>
  api<Invoice>(`${base(studioId, invoiceId)}/payments`, { method: 'POST', body });
export const refundInvoice = (studioId: number, invoiceId: number, body: RefundBody) =>
  api<RefundResult>(`${base(studioId, invoiceId)}/refunds`, { method: 'POST', body });

function useInvoiceMutation<TBody, TResult>(studioId: number, invoiceId: number, fn: (body: TBody) => Promise<TResult>, pick: (r: TResult) => Invoice) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: (result) => {
      queryClient.setQueryData(invoiceQueryOptions(studioId, invoiceId).queryKey, pick(result));
      // lists, the money overview and a credit note's own page all move with it
      return Promise.all([queryClient.invalidateQueries({ queryKey: invoicesKey }), queryClient.invalidateQueries({ queryKey: ['money'] })]);
    },
  });
}

export const useIssueInvoice = (studioId: number, invoiceId: number) =>
  useInvoiceMutation(studioId, invoiceId, () => issueInvoice(studioId, invoiceId), (i) => i);
export const useVoidInvoice = (studioId: number, invoiceId: number) =>
  useInvoiceMutation(studioId, invoiceId, () => voidInvoice(studioId, invoiceId), (i) => i);
export const useRecordPayment = (studioId: number, invoiceId: number) =>
  useInvoiceMutation(studioId, invoiceId, (body: RecordPaymentBody) => recordPayment(studioId, invoiceId, body), (i) => i);
export const useRefundInvoice = (studioId: number, invoiceId: number) =>
  // refunding an invoice answers it and its new credit note; paying out an open credit note answers the invoice it credits and the note
  useInvoiceMutation(studioId, invoiceId, (body: RefundBody) => refundInvoice(studioId, invoiceId, body), (r) => (r.invoice.id === invoiceId ? r.invoice : r.creditNote));
