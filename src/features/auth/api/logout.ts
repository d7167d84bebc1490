import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { replaceSession } from './session-cache';

export function logout(): Promise<void> {
  return api<void>('/api/auth/logout', { method: 'POST', rotatesSession: true });
}

export function useLogout() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: logout,
    onSuccess: () => replaceSession(queryClient, null, { byChoice: true }),
  });
}
