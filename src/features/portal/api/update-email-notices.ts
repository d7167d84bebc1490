import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MeResponse } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';

/** The per-person switch for e-mail notices (comments, photos, approvals). */
export function updateEmailNotices(emailNotices: boolean): Promise<MeResponse> {
  return api<MeResponse>('/api/auth/me', { method: 'PATCH', body: { emailNotices } });
}

export function useUpdateEmailNotices() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (on: boolean) => updateEmailNotices(on),
    // The same key the auth feature's "me" query uses.
    onSuccess: (me) => queryClient.setQueryData(['auth', 'me'], me),
  });
}
