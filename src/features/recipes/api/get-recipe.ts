import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Recipe } from '../../../../shared/schemas/recipes';
import { api } from '../../../lib/api-client';

export function getRecipe(studioId: number, recipeId: number, signal?: AbortSignal): Promise<Recipe> {
  return api<Recipe>(`/api/studios/${studioId}/recipes/${recipeId}`, { signal });
}

export function recipeQueryOptions(studioId: number, recipeId: number) {
  return queryOptions({
    queryKey: ['recipes', 'detail', { studioId, recipeId }] as const,
    queryFn: ({ signal }) => getRecipe(studioId, recipeId, signal),
  });
}

export function useRecipe(studioId: number, recipeId: number, enabled = true) {
  return useQuery({ ...recipeQueryOptions(studioId, recipeId), enabled });
}
