import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RecipeSummary } from '../../../../shared/schemas/recipes';
import { allPages } from '../../../lib/all-pages';

/** All the studio's recipes, to choose one for an area of the scheme. */
export function getRecipeOptions(studioId: number, signal?: AbortSignal): Promise<RecipeSummary[]> {
  return allPages<RecipeSummary>(`/api/studios/${studioId}/recipes`, { signal });
}

export function recipeOptionsQueryOptions(studioId: number) {
  return queryOptions({
    // Under 'recipes', so a saved or removed recipe refreshes the choices.
    queryKey: ['recipes', 'options', { studioId }] as const,
    queryFn: ({ signal }) => getRecipeOptions(studioId, signal),
  });
}

export function useRecipeOptions(studioId: number, enabled = true) {
  return useQuery({ ...recipeOptionsQueryOptions(studioId), enabled });
}
