import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { Photo, updatePhotoInput } from '../../../../shared/schemas/photos';

export type UpdatePhotoBody = z.input<typeof updatePhotoInput>;
import { api } from '../../../lib/api-client';

export function updatePhoto(studioId: number, photoId: number, input: UpdatePhotoBody): Promise<Photo> {
  return api<Photo>(`/api/studios/${studioId}/photos/${photoId}`, { method: 'PATCH', body: input });
}

export function useUpdatePhoto(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ photoId, ...input }: UpdatePhotoBody & { photoId: number }) => updatePhoto(studioId, photoId, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['photos'] }),
  });
}
