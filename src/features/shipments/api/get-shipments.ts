import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Shipment } from '../../../../shared/schemas/shipments';
import { api } from '../../../lib/api-client';

export function getShipments(studioId: number, commissionId: number, signal?: AbortSignal): Promise<Shipment[]> {
  return api<Shipment[]>(`/api/studios/${studioId}/commissions/${commissionId}/shipments`, { signal });
}

export function shipmentsQueryOptions(studioId: number, commissionId: number) {
  return queryOptions({
    queryKey: ['shipments', 'list', { studioId, commissionId }] as const,
    queryFn: ({ signal }) => getShipments(studioId, commissionId, signal),
  });
}

export function useShipments(studioId: number, commissionId: number) {
  return useQuery(shipmentsQueryOptions(studioId, commissionId));
}
