import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { createPaintInput, Paint } from '../../../../shared/schemas/paints';
import { api } from '../../../lib/api-client';
import { paintsKey } from './get-paints';

export type PaintBody = z.input<typeof createPaintInput>;

export function createPaint(studioId: number, body: PaintBody): Promise<Paint> {
  return api<Paint>(`/api/studios/${studioId}/paints`, { method: 'POST', body });
}

export function updatePaint(studioId: number, paintId: number, body: Partial<PaintBody>): Promise<Paint> {
  return api<Paint>(`/api/studios/${studioId}/paints/${paintId}`, { method: 'PATCH', body });
}

/** Adds a paint, or changes one when `paintId` is given; every rack list refreshes after. */
export function useSavePaint(studioId: number, paintId?: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: PaintBody) => (paintId ? updatePaint(studioId, paintId, body) : createPaint(studioId, body)),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: paintsKey }),
  });
}
