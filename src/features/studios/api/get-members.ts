import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Member } from '../../../../shared/schemas/studios';
import { allPages } from '../../../lib/all-pages';

export function getMembers(studioId: number, signal?: AbortSignal): Promise<Member[]> {
  return allPages<Member>(`/api/studios/${studioId}/members`, { signal });
}

export function membersQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['studios', 'members', studioId] as const,
    queryFn: ({ signal }) => getMembers(studioId, signal),
  });
}

export function useMembers(studioId: number) {
  return useQuery(membersQueryOptions(studioId));
}
