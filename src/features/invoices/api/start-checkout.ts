import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

/**
 * Asks the server for a checkout page for the invoice's open balance. The page lives on the
 * payment service's origin, so the browser goes there with location.assign (a form post to
 * another origin would be stopped by our content security policy).
 */
export function startCheckout(studioId: number, invoiceId: number): Promise<{ url: string }> {
  return api<{ url: string }>(`/api/studios/${studioId}/invoices/${invoiceId}/checkout`, { method: 'POST' });
}

export function useStartCheckout(studioId: number, invoiceId: number) {
  return useMutation({
    mutationFn: () => startCheckout(studioId, invoiceId),
    onSuccess: ({ url }) => window.location.assign(url),
  });
}
