import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { Client, createClientInput } from '../../../../shared/schemas/clients';
import { api } from '../../../lib/api-client';
import { clientQueryOptions } from './get-client';
import { clientListsKey } from './get-clients';

/** The form's values as typed; the server parses them with the same schema. */
export type CreateClientBody = z.input<typeof createClientInput>;

export function createClient(studioId: number, input: CreateClientBody): Promise<Client> {
  return api<Client>(`/api/studios/${studioId}/clients`, { method: 'POST', body: input });
}

export function useCreateClient(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateClientBody) => createClient(studioId, input),
    onSuccess: (client) => {
      queryClient.setQueryData(clientQueryOptions(studioId, client.id).queryKey, client);
      return queryClient.invalidateQueries({ queryKey: clientListsKey });
    },
  });
}
