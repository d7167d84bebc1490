import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { TimeEntry, UpdateTimeInput } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';
import { invalidateTime } from './invalidate-time';

export function updateTime(studioId: number, entryId: number, input: UpdateTimeInput): Promise<TimeEntry> {
  return api<TimeEntry>(`/api/studios/${studioId}/time/${entryId}`, { method: 'PATCH', body: input });
}

export function useUpdateTime(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ entryId, ...input }: UpdateTimeInput & { entryId: number }) => updateTime(studioId, entryId, input),
    onSuccess: () => invalidateTime(queryClient),
  });
}
