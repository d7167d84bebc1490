import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PublicPageSettings } from '../../../../shared/schemas/enquiries';
import { api } from '../../../lib/api-client';

export function getPublicPage(studioId: number, signal?: AbortSignal): Promise<PublicPageSettings> {
  return api<PublicPageSettings>(`/api/studios/${studioId}/public-page`, { signal });
}

export function publicPageQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['public-page', 'detail', { studioId }] as const,
    queryFn: ({ signal }) => getPublicPage(studioId, signal),
  });
}

export function usePublicPage(studioId: number) {
  return useQuery(publicPageQueryOptions(studioId));
}
