import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ImportReport } from '../../../../shared/schemas/paints';
import { api } from '../../../lib/api-client';
import { paintsKey } from './get-paints';

export function importPaints(studioId: number, csv: string): Promise<ImportReport> {
  return api<ImportReport>(`/api/studios/${studioId}/paints/import`, { method: 'POST', body: { csv } });
}

export function useImportPaints(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (csv: string) => importPaints(studioId, csv),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: paintsKey }),
  });
}

/** The export is a plain download: the browser saves the file the server names. */
export const exportPaintsUrl = (studioId: number) => `/api/studios/${studioId}/paints/export`;
