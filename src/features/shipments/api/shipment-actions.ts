import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { DeliveredInput, ShipInput, Shipment, updateShipmentInput } from '../../../../shared/schemas/shipments';
import { api } from '../../../lib/api-client';
import { shipmentsQueryOptions } from './get-shipments';

export type UpdateShipmentBody = z.input<typeof updateShipmentInput>;
const base = (studioId: number, commissionId: number) => `/api/studios/${studioId}/commissions/${commissionId}/shipments`;

export const createShipment = (studioId: number, commissionId: number) => api<Shipment>(base(studioId, commissionId), { method: 'POST', body: {} });
export const updateShipment = (studioId: number, commissionId: number, id: number, body: UpdateShipmentBody) =>
  api<Shipment>(`${base(studioId, commissionId)}/${id}`, { method: 'PATCH', body });
export const shipShipment = (studioId: number, commissionId: number, id: number, body: ShipInput) => api<Shipment>(`${base(studioId, commissionId)}/${id}/ship`, { method: 'POST', body });
export const recordDelivery = (studioId: number, commissionId: number, id: number, body: DeliveredInput) =>
  api<Shipment>(`${base(studioId, commissionId)}/${id}/delivered`, { method: 'POST', body });
export const confirmReceipt = (studioId: number, commissionId: number, id: number) => api<Shipment>(`${base(studioId, commissionId)}/${id}/received`, { method: 'POST', body: {} });

/**
 * Every change to a shipment answers the shipment; the list is refreshed from it. Shipping, delivery and
 * receipt also move the commission, so its detail, lists and activity are refetched.
 */
function useShipmentMutation<T>(studioId: number, commissionId: number, fn: (body: T) => Promise<Shipment>, movesCommission: boolean) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: (s) => {
      queryClient.setQueryData(shipmentsQueryOptions(studioId, commissionId).queryKey, (old: Shipment[] | undefined) => (old?.some((x) => x.id === s.id) ? old.map((x) => (x.id === s.id ? s : x)) : [...(old ?? []), s]));
      if (!movesCommission) return queryClient.invalidateQueries({ queryKey: ['commissions', 'activity'] });
      return queryClient.invalidateQueries({ queryKey: ['commissions'] });
    },
  });
}

export const useCreateShipment = (studioId: number, commissionId: number) => useShipmentMutation<void>(studioId, commissionId, () => createShipment(studioId, commissionId), false);
export const useUpdateShipment = (studioId: number, commissionId: number, id: number) =>
  useShipmentMutation<UpdateShipmentBody>(studioId, commissionId, (body) => updateShipment(studioId, commissionId, id, body), false);
export const useShip = (studioId: number, commissionId: number, id: number) => useShipmentMutation<ShipInput>(studioId, commissionId, (body) => shipShipment(studioId, commissionId, id, body), true);
export const useRecordDelivery = (studioId: number, commissionId: number, id: number) =>
  useShipmentMutation<DeliveredInput>(studioId, commissionId, (body) => recordDelivery(studioId, commissionId, id, body), true);
export const useConfirmReceipt = (studioId: number, commissionId: number, id: number) => useShipmentMutation<void>(studioId, commissionId, () => confirmReceipt(studioId, commissionId, id), true);
