import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Stage, UpdateStageInput } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';

export function updateStage(studioId: number, stageId: number, input: UpdateStageInput): Promise<Stage> {
  return api<Stage>(`/api/studios/${studioId}/stages/${stageId}`, { method: 'PATCH', body: input });
}

/** A stage change moves progress everywhere: the commission, its lists and the bench board. */
export function useUpdateStage(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ stageId, ...input }: UpdateStageInput & { stageId: number }) => updateStage(studioId, stageId, input),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: ['commissions'] }),
        queryClient.invalidateQueries({ queryKey: ['board'] }),
      ]),
  });
}
