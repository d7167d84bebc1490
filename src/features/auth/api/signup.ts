import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MeResponse, SignupInput } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';
import { replaceSession } from './session-cache';

export function signup(input: SignupInput): Promise<MeResponse> {
  return api<MeResponse>('/api/auth/signup', { method: 'POST', body: input, rotatesSession: true });
}

export function useSignup() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signup,
    onSuccess: (me) => replaceSession(queryClient, me),
  });
}
