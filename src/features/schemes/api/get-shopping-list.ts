import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ShoppingList } from '../../../../shared/schemas/recipes';
import { api } from '../../../lib/api-client';

export function getShoppingList(studioId: number, commissionId: number, signal?: AbortSignal): Promise<ShoppingList> {
  return api<ShoppingList>(`/api/studios/${studioId}/commissions/${commissionId}/shopping-list`, { signal });
}

export function shoppingListQueryOptions(studioId: number, commissionId: number) {
  return queryOptions({
    queryKey: ['schemes', 'shopping-list', { studioId, commissionId }] as const,
    queryFn: ({ signal }) => getShoppingList(studioId, commissionId, signal),
  });
}

export function useShoppingList(studioId: number, commissionId: number, enabled = true) {
  return useQuery({ ...shoppingListQueryOptions(studioId, commissionId), enabled });
}
