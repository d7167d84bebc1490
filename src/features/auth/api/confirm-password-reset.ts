import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MeResponse, ResetConfirmInput } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';
import { replaceSession } from './session-cache';

export function confirmPasswordReset(input: ResetConfirmInput): Promise<MeResponse> {
  return api<MeResponse>('/api/auth/password-reset/confirm', { method: 'POST', body: input, rotatesSession: true });
}

export function useConfirmPasswordReset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: confirmPasswordReset,
    onSuccess: (me) => replaceSession(queryClient, me),
  });
}
