import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { RecipeSummary } from '../../../../shared/schemas/recipes';
import { allPages } from '../../../lib/all-pages';

export function getRecipes(studioId: number, q: string | undefined, signal?: AbortSignal): Promise<RecipeSummary[]> {
  return allPages<RecipeSummary>(`/api/studios/${studioId}/recipes`, { query: { q }, signal });
}

export function recipesQueryOptions(studioId: number, q?: string) {
  return queryOptions({
    queryKey: ['recipes', 'list', { studioId, q }] as const,
    queryFn: ({ signal }) => getRecipes(studioId, q, signal),
    placeholderData: keepPreviousData,
  });
}

/** Every recipe list and detail, for invalidation after a change. */
export const recipesKey = ['recipes'] as const;

export function useRecipes(studioId: number, q?: string) {
  return useQuery(recipesQueryOptions(studioId, q));
}
