import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ChangePasswordInput, MeResponse } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';
import { meQueryOptions } from './get-me';

/** The same person goes on signed in, in a new session: the other devices are signed out. */
export function changePassword(input: ChangePasswordInput): Promise<MeResponse> {
  return api<MeResponse>('/api/auth/password', { method: 'POST', body: input, rotatesSession: true });
}

export function useChangePassword() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: changePassword,
    onSuccess: (me) => queryClient.setQueryData(meQueryOptions().queryKey, me),
  });
}
