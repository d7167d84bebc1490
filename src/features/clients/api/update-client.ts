import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { Client, updateClientInput } from '../../../../shared/schemas/clients';
import { api } from '../../../lib/api-client';
import { clientQueryOptions } from './get-client';
import { clientListsKey } from './get-clients';

export type UpdateClientBody = z.input<typeof updateClientInput>;

export function updateClient(studioId: number, clientId: number, input: UpdateClientBody): Promise<Client> {
  return api<Client>(`/api/studios/${studioId}/clients/${clientId}`, { method: 'PATCH', body: input });
}

export function useUpdateClient(studioId: number, clientId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateClientBody) => updateClient(studioId, clientId, input),
    onSuccess: (client) => {
      queryClient.setQueryData(clientQueryOptions(studioId, clientId).queryKey, client);
      return queryClient.invalidateQueries({ queryKey: clientListsKey });
    },
  });
}
