import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export function removeFigure(studioId: number, figureId: number): Promise<void> {
  return api<void>(`/api/studios/${studioId}/figures/${figureId}`, { method: 'DELETE' });
}

export function useRemoveFigure(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (figureId: number) => removeFigure(studioId, figureId),
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: ['commissions'] }), queryClient.invalidateQueries({ queryKey: ['board'] })]),
  });
}
