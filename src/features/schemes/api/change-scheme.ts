import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { schemeEntryInput, StudioScheme, UpdateSchemeEntryInput } from '../../../../shared/schemas/recipes';
import { api } from '../../../lib/api-client';
import { schemeQueryOptions } from './get-scheme';
import { shoppingListQueryOptions } from './get-shopping-list';

export type SchemeEntryBody = z.input<typeof schemeEntryInput>;

export function addSchemeEntry(studioId: number, commissionId: number, body: SchemeEntryBody): Promise<StudioScheme> {
  return api<StudioScheme>(`/api/studios/${studioId}/commissions/${commissionId}/scheme`, { method: 'POST', body });
}
export function updateSchemeEntry(studioId: number, entryId: number, body: UpdateSchemeEntryInput): Promise<StudioScheme> {
  return api<StudioScheme>(`/api/studios/${studioId}/scheme-entries/${entryId}`, { method: 'PATCH', body });
}
export function removeSchemeEntry(studioId: number, entryId: number): Promise<StudioScheme> {
  return api<StudioScheme>(`/api/studios/${studioId}/scheme-entries/${entryId}`, { method: 'DELETE' });
}

/** Every change answers with the whole scheme, which goes straight into the cache; the shopping list follows. */
export function useChangeScheme(studioId: number, commissionId: number) {
  const queryClient = useQueryClient();
  const done = (scheme: StudioScheme) => {
    queryClient.setQueryData(schemeQueryOptions(studioId, commissionId).queryKey, scheme);
    return Promise.all([
      queryClient.invalidateQueries({ queryKey: shoppingListQueryOptions(studioId, commissionId).queryKey }),
      // Recipes count the schemes that use them.
      queryClient.invalidateQueries({ queryKey: ['recipes'] }),
    ]);
  };
  return {
    add: useMutation({ mutationFn: (body: SchemeEntryBody) => addSchemeEntry(studioId, commissionId, body), onSuccess: done }),
    update: useMutation({ mutationFn: (v: { entryId: number; body: UpdateSchemeEntryInput }) => updateSchemeEntry(studioId, v.entryId, v.body), onSuccess: done }),
    remove: useMutation({ mutationFn: (entryId: number) => removeSchemeEntry(studioId, entryId), onSuccess: done }),
  };
}
