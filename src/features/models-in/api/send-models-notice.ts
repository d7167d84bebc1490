import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ModelsIn, ModelsNoticeInput } from '../../../../shared/schemas/shipments';
import { api } from '../../../lib/api-client';
import { modelsInQueryOptions } from './get-models-in';

export function sendModelsNotice(studioId: number, commissionId: number, body: ModelsNoticeInput): Promise<ModelsIn> {
  return api<ModelsIn>(`/api/studios/${studioId}/commissions/${commissionId}/models-in/notice`, { method: 'POST', body });
}

export function useSendModelsNotice(studioId: number, commissionId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ModelsNoticeInput) => sendModelsNotice(studioId, commissionId, body),
    onSuccess: (m) => {
      queryClient.setQueryData(modelsInQueryOptions(studioId, commissionId).queryKey, m);
      return queryClient.invalidateQueries({ queryKey: ['commissions', 'activity'] });
    },
  });
}
