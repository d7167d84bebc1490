import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Figure, FigureInput } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';

export function addFigure(studioId: number, commissionId: number, input: FigureInput): Promise<Figure> {
  return api<Figure>(`/api/studios/${studioId}/commissions/${commissionId}/figures`, { method: 'POST', body: input });
}

export function useAddFigure(studioId: number, commissionId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: FigureInput) => addFigure(studioId, commissionId, input),
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: ['commissions'] }), queryClient.invalidateQueries({ queryKey: ['board'] })]),
  });
}
