import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Comment } from '../../../../shared/schemas/comments';
import { allPages } from '../../../lib/all-pages';

export function getComments(studioId: number, commissionId: number, signal?: AbortSignal): Promise<Comment[]> {
  return allPages<Comment>(`/api/studios/${studioId}/commissions/${commissionId}/comments`, { signal });
}

export function commentsQueryOptions(studioId: number, commissionId: number) {
  return queryOptions({
    queryKey: ['commissions', 'comments', { studioId, commissionId }] as const,
    queryFn: ({ signal }) => getComments(studioId, commissionId, signal),
  });
}

export function useComments(studioId: number, commissionId: number) {
  return useQuery(commentsQueryOptions(studioId, commissionId));
}
