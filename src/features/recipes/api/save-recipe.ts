import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { Recipe, recipeInput } from '../../../../shared/schemas/recipes';
import { api } from '../../../lib/api-client';
import { recipeQueryOptions } from './get-recipe';
import { recipesKey } from './get-recipes';

export type RecipeBody = z.input<typeof recipeInput>;

export function createRecipe(studioId: number, body: RecipeBody): Promise<Recipe> {
  return api<Recipe>(`/api/studios/${studioId}/recipes`, { method: 'POST', body });
}

/** The editor sends the whole recipe, steps included, each time. */
export function replaceRecipe(studioId: number, recipeId: number, body: RecipeBody): Promise<Recipe> {
  return api<Recipe>(`/api/studios/${studioId}/recipes/${recipeId}`, { method: 'PUT', body });
}

export function useSaveRecipe(studioId: number, recipeId?: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: RecipeBody) => (recipeId ? replaceRecipe(studioId, recipeId, body) : createRecipe(studioId, body)),
    onSuccess: (recipe) => {
      queryClient.setQueryData(recipeQueryOptions(studioId, recipe.id).queryKey, recipe);
      // Paints count the recipes that use them, and schemes show recipe swatches.
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: recipesKey }),
        queryClient.invalidateQueries({ queryKey: ['paints'] }),
        queryClient.invalidateQueries({ queryKey: ['schemes'] }),
      ]);
    },
  });
}
