import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { EraseClientInput, EraseResult } from '../../../../shared/schemas/privacy';
import { api, isApiError } from '../../../lib/api-client';
import { clientPrivacyQueryOptions } from './get-client-privacy';

/** Erases the client's personal data; issued invoices stay under an anonymised placeholder. */
export function eraseClient(studioId: number, clientId: number, body: EraseClientInput): Promise<EraseResult> {
  return api<EraseResult>(`/api/studios/${studioId}/clients/${clientId}/erase`, { method: 'POST', body });
}

export function useEraseClient(studioId: number, clientId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: EraseClientInput) => eraseClient(studioId, clientId, body),
    // The name, the commissions, invoices and lists all change: refetch whatever shows them.
    onSuccess: () => queryClient.invalidateQueries(),
    // Refused because something is still open: show the current list of what stands in the way.
    onError: (err) => {
      if (isApiError(err, 409)) void queryClient.invalidateQueries({ queryKey: clientPrivacyQueryOptions(studioId, clientId).queryKey });
    },
  });
}
