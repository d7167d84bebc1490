import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ShippingSettings, ShippingSettingsInput } from '../../../../shared/schemas/shipments';
import { api } from '../../../lib/api-client';

export function getShippingSettings(studioId: number, signal?: AbortSignal): Promise<ShippingSettings> {
  return api<ShippingSettings>(`/api/studios/${studioId}/shipping-settings`, { signal });
}

export function shippingSettingsQueryOptions(studioId: number) {
  return queryOptions({
    queryKey: ['shipping-settings', 'detail', { studioId }] as const,
    queryFn: ({ signal }) => getShippingSettings(studioId, signal),
  });
}

export function useShippingSettings(studioId: number, enabled = true) {
  return useQuery({ ...shippingSettingsQueryOptions(studioId), enabled });
}

export function saveShippingSettings(studioId: number, body: ShippingSettingsInput): Promise<ShippingSettings> {
  return api<ShippingSettings>(`/api/studios/${studioId}/shipping-settings`, { method: 'PUT', body });
}

export function useSaveShippingSettings(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ShippingSettingsInput) => saveShippingSettings(studioId, body),
    onSuccess: (s) => {
      queryClient.setQueryData(shippingSettingsQueryOptions(studioId).queryKey, s);
      // "Abroad" and the auto-close date of every shipment depend on these.
      return queryClient.invalidateQueries({ queryKey: ['shipments'] });
    },
  });
}
