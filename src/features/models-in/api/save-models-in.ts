import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ModelsIn, ModelsInFormValues } from '../../../../shared/schemas/shipments';
import { api } from '../../../lib/api-client';
import { modelsInQueryOptions } from './get-models-in';

export function saveModelsIn(studioId: number, commissionId: number, body: ModelsInFormValues): Promise<ModelsIn> {
  return api<ModelsIn>(`/api/studios/${studioId}/commissions/${commissionId}/models-in`, { method: 'PUT', body });
}

export function useSaveModelsIn(studioId: number, commissionId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ModelsInFormValues) => saveModelsIn(studioId, commissionId, body),
    onSuccess: (m) => {
      queryClient.setQueryData(modelsInQueryOptions(studioId, commissionId).queryKey, m);
      return queryClient.invalidateQueries({ queryKey: ['commissions', 'activity'] });
    },
  });
}
