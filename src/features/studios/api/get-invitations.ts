import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Invitation } from '../../../../shared/schemas/studios';
import { allPages } from '../../../lib/all-pages';

export function getInvitations(studioId: number, signal?: AbortSignal): Promise<Invitation[]> {
  return allPages<Invitation>(`/api/studios/${studioId}/invitations`, { signal });
}

export function invitationsQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['studios', 'invitations', studioId] as const,
    queryFn: ({ signal }) => getInvitations(studioId, signal),
    // Client invitations are sent from the clients screens; always look again when the team opens.
    staleTime: 0,
  });
}

export function useInvitations(studioId: number) {
  return useQuery(invitationsQueryOptions(studioId));
}
