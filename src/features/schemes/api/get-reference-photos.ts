import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Photo } from '../../../../shared/schemas/photos';
import { allPages } from '../../../lib/all-pages';

/** The commission's reference photos, to open one and match its colours against the rack. */
export function getReferencePhotos(studioId: number, commissionId: number, signal?: AbortSignal): Promise<Photo[]> {
  return allPages<Photo>(`/api/studios/${studioId}/commissions/${commissionId}/photos`, { signal }).then((all) => all.filter((p) => p.kind === 'reference'));
}

export function referencePhotosQueryOptions(studioId: number, commissionId: number) {
  return queryOptions({
    // Under 'photos', so an upload or removal elsewhere refreshes this list too.
    queryKey: ['photos', 'references', { studioId, commissionId }] as const,
    queryFn: ({ signal }) => getReferencePhotos(studioId, commissionId, signal),
  });
}

export function useReferencePhotos(studioId: number, commissionId: number, enabled = true) {
  return useQuery({ ...referencePhotosQueryOptions(studioId, commissionId), enabled });
}
