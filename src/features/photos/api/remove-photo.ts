import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export function removePhoto(studioId: number, photoId: number): Promise<void> {
  return api<void>(`/api/studios/${studioId}/photos/${photoId}`, { method: 'DELETE' });
}

export function useRemovePhoto(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (photoId: number) => removePhoto(studioId, photoId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['photos'] }),
  });
}
