// Changes to quotes. A quote decision moves the commission and creates invoices, so those screens'
// caches are refreshed too (by their key prefixes: the quotes feature does not read them).
import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { acceptQuoteInput, createQuoteInput, declineQuoteInput, Quote, requestQuoteChangesInput, updateQuoteInput } from '../../../../shared/schemas/quotes';
import { api } from '../../../lib/api-client';
import { quoteQueryOptions } from './get-quote';
import { quotesKey } from './get-quotes';

export type CreateQuoteBody = z.input<typeof createQuoteInput>;
export type UpdateQuoteBody = z.input<typeof updateQuoteInput>;
export type AcceptQuoteBody = z.input<typeof acceptQuoteInput>;
export type RequestChangesBody = z.input<typeof requestQuoteChangesInput>;
export type DeclineQuoteBody = z.input<typeof declineQuoteInput>;

const quotePath = (studioId: number, quoteId: number) => `/api/studios/${studioId}/quotes/${quoteId}`;

export const createQuote = (studioId: number, commissionId: number, body: CreateQuoteBody = {}) =>
  api<Quote>(`/api/studios/${studioId}/commissions/${commissionId}/quotes`, { method: 'POST', body });
export const updateQuote = (studioId: number, quoteId: number, body: UpdateQuoteBody) => api<Quote>(quotePath(studioId, quoteId), { method: 'PATCH', body });
export const sendQuote = (studioId: number, quoteId: number) => api<Quote>(`${quotePath(studioId, quoteId)}/send`, { method: 'POST' });
export const acceptQuote = (studioId: number, quoteId: number, body: AcceptQuoteBody) => api<Quote>(`${quotePath(studioId, quoteId)}/accept`, { method: 'POST', body });
export const requestQuoteChanges = (studioId: number, quoteId: number, body: RequestChangesBody) =>
  api<Quote>(`${quotePath(studioId, quoteId)}/request-changes`, { method: 'POST', body });
export const declineQuote = (studioId: number, quoteId: number, body: DeclineQuoteBody) => api<Quote>(`${quotePath(studioId, quoteId)}/decline`, { method: 'POST', body });

function settle(queryClient: QueryClient, studioId: number, quote: Quote, alsoMoney: boolean) {
  queryClient.setQueryData(quoteQueryOptions(studioId, quote.id).queryKey, quote);
  const waits = [queryClient.invalidateQueries({ queryKey: quotesKey }), queryClient.invalidateQueries({ queryKey: ['commissions'] })];
  if (alsoMoney) waits.push(queryClient.invalidateQueries({ queryKey: ['invoices'] }), queryClient.invalidateQueries({ queryKey: ['money'] }));
  return Promise.all(waits);
}

export function useCreateQuote(studioId: number, commissionId: number) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: (body: CreateQuoteBody = {}) => createQuote(studioId, commissionId, body), onSuccess: (q) => settle(queryClient, studioId, q, false) });
}

export function useUpdateQuote(studioId: number, quoteId: number) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: (body: UpdateQuoteBody) => updateQuote(studioId, quoteId, body), onSuccess: (q) => settle(queryClient, studioId, q, false) });
}

/** Saves the draft as it stands on screen, then sends it: what the client gets is what the owner saw. */
export function useSaveAndSendQuote(studioId: number, quoteId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (body: UpdateQuoteBody) => {
      await updateQuote(studioId, quoteId, body);
      return sendQuote(studioId, quoteId);
    },
    onSuccess: (q) => settle(queryClient, studioId, q, false),
  });
}

export function useAcceptQuote(studioId: number, quoteId: number) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: (body: AcceptQuoteBody) => acceptQuote(studioId, quoteId, body), onSuccess: (q) => settle(queryClient, studioId, q, true) });
}

export function useRequestQuoteChanges(studioId: number, quoteId: number) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: (body: RequestChangesBody) => requestQuoteChanges(studioId, quoteId, body), onSuccess: (q) => settle(queryClient, studioId, q, false) });
}

export function useDeclineQuote(studioId: number, quoteId: number) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: (body: DeclineQuoteBody) => declineQuote(studioId, quoteId, body), onSuccess: (q) => settle(queryClient, studioId, q, false) });
}
