import { useEffect, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { BookOpen, Plus, Search } from 'lucide-react';
import { Button, ButtonLink } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { SubNav } from '../../../components/ui/sub-nav';
import { pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useRecipes } from '../api/get-recipes';
import { RecipesTable } from '../components/recipes-table';

export function RecipesListRoute() {
  const { studioId } = useStudioScope();
  const [params, setParams] = useSearchParams();
  const q = params.get('q') ?? '';
  const [typed, setTyped] = useState(q);
  useEffect(() => {
    if (typed.trim() === q) return;
    const t = window.setTimeout(() => setParams(typed.trim() ? { q: typed.trim() } : {}, { replace: true }), 300);
    return () => window.clearTimeout(t);
  }, [typed, q, setParams]);
  const recipes = useRecipes(studioId, q || undefined);

  return (
    <>
      <PageTitle
        title="Paints & recipes"
        description="Reusable recipes for an area, step by step."
        actions={
          <ButtonLink to="new">
            <Plus aria-hidden="true" className="size-4" />
            New recipe
          </ButtonLink>
        }
      />
      <SubNav
        label="Paints and recipes"
        items={[
          { to: `/studio/${studioId}/paints`, label: 'Paint rack', end: true },
          { to: `/studio/${studioId}/paints/recipes`, label: 'Recipes' },
        ]}
      />
      <form role="search" className="mb-4 max-w-md" onSubmit={(e) => e.preventDefault()}>
        <label htmlFor="recipe-search" className="mb-1 block text-sm font-medium">
          Search recipes
        </label>
        <div className="relative">
          <Search aria-hidden="true" className="pointer-events-none absolute top-1/2 left-3 size-4 -translate-y-1/2 text-sable-600" />
          <input id="recipe-search" type="search" value={typed} onChange={(e) => setTyped(e.target.value)} placeholder="Recipe name" className="min-h-10 w-full rounded-control border border-sable-600 bg-white pr-3 pl-9 text-base" />
        </div>
      </form>
      {recipes.isPending ? (
        <LoadingBlock label="Loading recipes…" />
      ) : recipes.error ? (
        <ErrorNote title="The recipes did not load" action={<Button variant="secondary" size="sm" onClick={() => recipes.refetch()}>Try again</Button>}>
          {recipes.error.message}
        </ErrorNote>
      ) : recipes.data.length === 0 ? (
        q ? (
          <EmptyState icon={<Search className="size-8" />} title={`No recipe matches “${q}”`} />
        ) : (
          <EmptyState icon={<BookOpen className="size-8" />} title="No recipes yet" action={<ButtonLink to="new">Write the first recipe</ButtonLink>}>
            A recipe is the steps for one area — “washed denim”, “warm skin” — to use again on any commission.
          </EmptyState>
        )
      ) : (
        <>
          <p className="mb-2 text-xs text-sable-600">{pluralize(recipes.data.length, 'recipe')}</p>
          <RecipesTable recipes={recipes.data} caption={q ? `Recipes matching “${q}”` : 'All recipes'} />
        </>
      )}
    </>
  );
}
