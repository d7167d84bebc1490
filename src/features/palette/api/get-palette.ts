import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PhotoPalette, PointColour } from '../../../../shared/schemas/paints';
import { api } from '../../../lib/api-client';

export function getPalette(studioId: number, photoId: number, signal?: AbortSignal): Promise<PhotoPalette> {
  return api<PhotoPalette>(`/api/studios/${studioId}/reference-photos/${photoId}/palette`, { signal });
}

export function paletteQueryOptions(studioId: number, photoId: number) {
  return queryOptions({
    // Under 'paints': the matches change with the rack.
    queryKey: ['paints', 'palette', { studioId, photoId }] as const,
    queryFn: ({ signal }) => getPalette(studioId, photoId, signal),
  });
}

export function usePalette(studioId: number, photoId: number, enabled = true) {
  return useQuery({ ...paletteQueryOptions(studioId, photoId), enabled });
}

export function getPoint(studioId: number, photoId: number, x: number, y: number, signal?: AbortSignal): Promise<PointColour> {
  return api<PointColour>(`/api/studios/${studioId}/reference-photos/${photoId}/point`, { query: { x, y }, signal });
}

/** The colour at a point of the photo, x and y as fractions of its width and height (rounded to 0.1 %). */
export function pointQueryOptions(studioId: number, photoId: number, point: { x: number; y: number } | null) {
  const x = point ? Math.round(point.x * 1000) / 1000 : 0;
  const y = point ? Math.round(point.y * 1000) / 1000 : 0;
  return queryOptions({
    queryKey: ['paints', 'palette-point', { studioId, photoId, x, y }] as const,
    queryFn: ({ signal }) => getPoint(studioId, photoId, x, y, signal),
    enabled: point !== null,
    staleTime: 60_000,
  });
}

export function usePoint(studioId: number, photoId: number, point: { x: number; y: number } | null) {
  return useQuery(pointQueryOptions(studioId, photoId, point));
}
