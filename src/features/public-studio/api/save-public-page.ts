import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { PublicPageSettings, publicPageInput } from '../../../../shared/schemas/enquiries';
import { api } from '../../../lib/api-client';
import { publicPageQueryOptions } from './get-public-page';

export type PublicPageBody = z.input<typeof publicPageInput>;

export function savePublicPage(studioId: number, body: PublicPageBody): Promise<PublicPageSettings> {
  return api<PublicPageSettings>(`/api/studios/${studioId}/public-page`, { method: 'PUT', body });
}

export function useSavePublicPage(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: PublicPageBody) => savePublicPage(studioId, body),
    onSuccess: (page) => {
      queryClient.setQueryData(publicPageQueryOptions(studioId).queryKey, page);
      return queryClient.invalidateQueries({ queryKey: ['public-studio'] });
    },
  });
}
