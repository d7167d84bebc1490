import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { paintsKey } from './get-paints';

export function removePaint(studioId: number, paintId: number): Promise<void> {
  return api<void>(`/api/studios/${studioId}/paints/${paintId}`, { method: 'DELETE' });
}

export function useRemovePaint(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (paintId: number) => removePaint(studioId, paintId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: paintsKey }),
  });
}
