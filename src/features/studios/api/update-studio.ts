import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { Studio, updateStudioInput } from '../../../../shared/schemas/studios';
import { api } from '../../../lib/api-client';
import { studioQueryOptions } from './get-studio';

/** What the form sends: the schema's input, untrimmed; the server parses it with the same schema. */
export type UpdateStudioBody = z.input<typeof updateStudioInput>;

export function updateStudio(studioId: number, input: UpdateStudioBody): Promise<Studio> {
  return api<Studio>(`/api/studios/${studioId}`, { method: 'PATCH', body: input });
}

export function useUpdateStudio(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateStudioBody) => updateStudio(studioId, input),
    onSuccess: (studio) => queryClient.setQueryData(studioQueryOptions(studioId).queryKey, studio),
  });
}
