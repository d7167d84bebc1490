import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { LoginInput, MeResponse } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';
import { replaceSession } from './session-cache';

export function login(input: LoginInput): Promise<MeResponse> {
  return api<MeResponse>('/api/auth/login', { method: 'POST', body: input, rotatesSession: true });
}

export function useLogin() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: login,
    onSuccess: (me) => replaceSession(queryClient, me),
  });
}
