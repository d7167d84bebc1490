import { queryOptions, useQuery } from '@tanstack/react-query';
import { isHex, normalizeHex } from '../../../../shared/color';
import type { PaintMatchView } from '../../../../shared/schemas/paints';
import { api } from '../../../lib/api-client';

export function getNearestPaints(studioId: number, hex: string, k: number, signal?: AbortSignal) {
  return api<{ hex: string; matches: PaintMatchView[] }>(`/api/studios/${studioId}/paints/nearest`, { query: { hex, k }, signal });
}

export function nearestPaintsQueryOptions(studioId: number, hex: string, k = 3) {
  const h = isHex(hex) ? normalizeHex(hex) : '';
  return queryOptions({
    queryKey: ['paints', 'nearest', { studioId, hex: h, k }] as const,
    queryFn: ({ signal }) => getNearestPaints(studioId, h, k, signal),
    enabled: h !== '',
  });
}

export function useNearestPaints(studioId: number, hex: string, k = 3) {
  return useQuery(nearestPaintsQueryOptions(studioId, hex, k));
}
