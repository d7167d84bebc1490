import { useMutation } from '@tanstack/react-query';
import type { ResetRequestInput } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';

/** Always answers 202, whether or not the address has an account. */
export function requestPasswordReset(input: ResetRequestInput): Promise<{ ok: true }> {
  return api<{ ok: true }>('/api/auth/password-reset', { method: 'POST', body: input });
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
