import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ClientPrivacy } from '../../../../shared/schemas/privacy';
import { api } from '../../../lib/api-client';

/** Whether the client was erased, what would stop an erase, and how much it would touch (owners only). */
export function getClientPrivacy(studioId: number, clientId: number, signal?: AbortSignal): Promise<ClientPrivacy> {
  return api<ClientPrivacy>(`/api/studios/${studioId}/clients/${clientId}/privacy`, { signal });
}

export function clientPrivacyQueryOptions(studioId: number, clientId: number) {
  return queryOptions({
    queryKey: ['clients', 'privacy', { studioId, clientId }] as const,
    queryFn: ({ signal }) => getClientPrivacy(studioId, clientId, signal),
  });
}

export function useClientPrivacy(studioId: number, clientId: number) {
  return useQuery(clientPrivacyQueryOptions(studioId, clientId));
}

/** The ZIP of everything kept about the client: a plain link, so the browser downloads it itself. */
export const clientExportUrl = (studioId: number, clientId: number) => `/api/studios/${studioId}/clients/${clientId}/export`;
