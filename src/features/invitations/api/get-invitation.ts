import { queryOptions, useQuery } from '@tanstack/react-query';
import type { InvitationPreview } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';

export function getInvitation(token: string, signal?: AbortSignal): Promise<InvitationPreview> {
  return api<InvitationPreview>(`/api/invitations/${encodeURIComponent(token)}`, { signal });
}

export function invitationQueryOptions(token: string) {
  return queryOptions({
    queryKey: ['invitations', 'preview', token] as const,
    queryFn: ({ signal }) => getInvitation(token, signal),
    staleTime: 60_000,
  });
}

export function useInvitation(token: string) {
  return useQuery(invitationQueryOptions(token));
}
