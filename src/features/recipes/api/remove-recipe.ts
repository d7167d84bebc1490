import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { recipesKey } from './get-recipes';

export function removeRecipe(studioId: number, recipeId: number): Promise<void> {
  return api<void>(`/api/studios/${studioId}/recipes/${recipeId}`, { method: 'DELETE' });
}

export function useRemoveRecipe(studioId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (recipeId: number) => removeRecipe(studioId, recipeId),
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: recipesKey }), queryClient.invalidateQueries({ queryKey: ['paints'] })]),
  });
}
