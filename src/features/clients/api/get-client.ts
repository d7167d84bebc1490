import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Client } from '../../../../shared/schemas/clients';
import { api } from '../../../lib/api-client';

export function getClient(studioId: number, clientId: number, signal?: AbortSignal): Promise<Client> {
  return api<Client>(`/api/studios/${studioId}/clients/${clientId}`, { signal });
}

export function clientQueryOptions(studioId: number, clientId: number) {
  return queryOptions({
    queryKey: ['clients', 'detail', { studioId, clientId }] as const,
    queryFn: ({ signal }) => getClient(studioId, clientId, signal),
  });
}

export function useClient(studioId: number, clientId: number) {
  return useQuery(clientQueryOptions(studioId, clientId));
}
