import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Comment } from '../../../../shared/schemas/comments';
import { api } from '../../../lib/api-client';
import { commentsQueryOptions } from './get-comments';

export function addComment(studioId: number, commissionId: number, body: string): Promise<Comment> {
  return api<Comment>(`/api/studios/${studioId}/commissions/${commissionId}/comments`, { method: 'POST', body: { body } });
}

export function useAddComment(studioId: number, commissionId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: string) => addComment(studioId, commissionId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: commentsQueryOptions(studioId, commissionId).queryKey }),
  });
}
