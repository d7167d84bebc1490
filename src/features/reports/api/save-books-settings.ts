import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { BooksSettings, BooksSettingsInput } from '../../../../shared/schemas/reports';
import { api } from '../../../lib/api-client';
import { reportsKey } from './get-actuals';

export const saveBooksSettings = (studioId: number, body: BooksSettingsInput) => api<BooksSettings>(`/api/studios/${studioId}/reports/settings`, { method: 'PUT', body });

export function useSaveBooksSettings(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: BooksSettingsInput) => saveBooksSettings(studioId, body),
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: reportsKey }), queryClient.invalidateQueries({ queryKey: ['dashboard'] })]),
  });
}
