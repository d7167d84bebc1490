import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CapacityView, SetHoursInput } from '../../../../shared/schemas/capacity';
import { api } from '../../../lib/api-client';
import { capacityQueryOptions } from './get-capacity';
import { invalidateAfterCapacity } from './invalidate';

export function setHours(studioId: number, painterId: number, body: SetHoursInput): Promise<CapacityView> {
  return api<CapacityView>(`/api/studios/${studioId}/capacity/painters/${painterId}/hours`, { method: 'PUT', body });
}

export function useSetHours(studioId: number, painterId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: SetHoursInput) => setHours(studioId, painterId, body),
    onSuccess: (view) => {
      queryClient.setQueryData(capacityQueryOptions(studioId).queryKey, view);
      return invalidateAfterCapacity(queryClient);
    },
  });
}
