import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PublicStudio } from '../../../../shared/schemas/enquiries';
import { api } from '../../../lib/api-client';

export function getPublicStudio(slug: string, signal?: AbortSignal): Promise<PublicStudio> {
  return api<PublicStudio>(`/api/public/studios/${encodeURIComponent(slug)}`, { signal });
}

export function publicStudioQueryOptions(slug: string) {
  return queryOptions({
    queryKey: ['public-studio', 'detail', { slug }] as const,
    queryFn: ({ signal }) => getPublicStudio(slug, signal),
  });
}

export function usePublicStudio(slug: string) {
  return useQuery(publicStudioQueryOptions(slug));
}
