import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Photo } from '../../../../shared/schemas/photos';
import { allPages } from '../../../lib/all-pages';

export function getPhotos(studioId: number, commissionId: number, signal?: AbortSignal): Promise<Photo[]> {
  return allPages<Photo>(`/api/studios/${studioId}/commissions/${commissionId}/photos`, { signal });
}

export function photosQueryOptions(studioId: number, commissionId: number) {
  return queryOptions({
    queryKey: ['photos', 'list', { studioId, commissionId }] as const,
    queryFn: ({ signal }) => getPhotos(studioId, commissionId, signal),
  });
}

export function usePhotos(studioId: number, commissionId: number) {
  return useQuery(photosQueryOptions(studioId, commissionId));
}
