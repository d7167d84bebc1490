import { useState } from 'react';
import { Link, useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { ChevronLeft, Pencil, Trash2 } from 'lucide-react';
import { isHex, normalizeHex } from '../../../../shared/color';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle, useDocumentTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { Swatch } from '../../../components/ui/swatch';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useHazardTexts } from '../api/get-hazards';
import { usePaintOptions } from '../api/get-paint-options';
import { useRecipe } from '../api/get-recipe';
import { useRemoveRecipe } from '../api/remove-recipe';
import { useSaveRecipe } from '../api/save-recipe';
import { RecipeEditor } from '../components/recipe-editor';
import { RecipeSteps } from '../components/recipe-steps';

function BackToRecipes() {
  const { studioId } = useStudioScope();
  return (
    <Link to={`/studio/${studioId}/paints/recipes`} className="mb-3 inline-flex items-center gap-1 text-sm">
      <ChevronLeft aria-hidden="true" className="size-4" />
      All recipes
    </Link>
  );
}

const positiveInt = (v: string | null) => {
  const n = Number(v);
  return Number.isInteger(n) && n > 0 ? n : undefined;
};

/** A new recipe; `?colour=#RRGGBB&photo=ID&paint=ID` start it from a colour picked on a reference photo. */
export function RecipeNewRoute() {
  const { studioId } = useStudioScope();
  const [params] = useSearchParams();
  const colour = params.get('colour') ?? '';
  const start = { colour: isHex(colour) ? normalizeHex(colour) : undefined, sourcePhotoId: positiveInt(params.get('photo')), paintId: positiveInt(params.get('paint')) };
  const paints = usePaintOptions(studioId);
  const hazards = useHazardTexts(studioId);
  const save = useSaveRecipe(studioId);
  const navigate = useNavigate();
  const toast = useToast();
  return (
    <>
      <BackToRecipes />
      <PageTitle
        title="New recipe"
        description={start.colour ? <span className="inline-flex items-center gap-2"><Swatch size="sm" hex={start.colour} label={`Target colour ${start.colour}`} />Started from a colour of a reference photo.</span> : 'The steps for one area, to use again on any commission.'}
      />
      {paints.isPending ? (
        <LoadingBlock label="Loading the rack…" />
      ) : paints.error ? (
        <ErrorNote title="The rack did not load">{paints.error.message}</ErrorNote>
      ) : (
        <Card>
          <RecipeEditor
            start={start}
            paints={paints.data}
            hazards={hazards.data}
            submitLabel="Save recipe"
            pending={save.isPending}
            onCancel={() => navigate(-1)}
            onSave={async (body) => {
              const r = await save.mutateAsync(body);
              toast.show(`Recipe “${r.name}” saved.`);
              navigate(`/studio/${studioId}/paints/recipes/${r.id}`, { replace: true });
            }}
          />
        </Card>
      )}
    </>
  );
}

export function RecipeDetailRoute() {
  const { studioId } = useStudioScope();
  const recipeId = Number(useParams().recipeId);
  const valid = Number.isInteger(recipeId) && recipeId > 0;
  const recipe = useRecipe(studioId, recipeId, valid);
  const hazards = useHazardTexts(studioId);
  const [params, setParams] = useSearchParams();
  const editing = params.get('edit') === '1';
  const paints = usePaintOptions(studioId);
  const save = useSaveRecipe(studioId, recipeId);
  const remove = useRemoveRecipe(studioId);
  const [confirm, setConfirm] = useState(false);
  const [removeError, setRemoveError] = useState<string | null>(null);
  const navigate = useNavigate();
  const toast = useToast();
  useDocumentTitle(recipe.data?.name ?? 'Recipe');

  if (!valid || isApiError(recipe.error, 404)) {
    return (
      <>
        <BackToRecipes />
        <PageTitle title="Recipe not found" />
        <ErrorNote>This recipe is not in the studio. It may have been removed, or the link is wrong.</ErrorNote>
      </>
    );
  }
  if (recipe.isPending) return <LoadingBlock label="Loading recipe…" />;
  if (recipe.error) return <ErrorNote title="This recipe did not load">{recipe.error.message}</ErrorNote>;
  const r = recipe.data;
  const setEditing = (on: boolean) => setParams(on ? { edit: '1' } : {}, { replace: true });

  return (
    <>
      <BackToRecipes />
      <PageTitle
        title={r.name}
        description={
          <span className="inline-flex flex-wrap items-center gap-2">
            {r.swatch && <Swatch size="sm" hex={r.swatch} label={`${r.colour ? 'Target colour' : 'First colour'} ${r.swatch}`} />}
            <span>
              {pluralize(r.steps.length, 'step')}
              {r.schemeCount ? ` · in ${pluralize(r.schemeCount, 'scheme')}` : ''}
              {r.colour ? ` · aiming for ${r.colour}` : ''}
            </span>
          </span>
        }
        actions={
          !editing && (
            <>
              <Button onClick={() => setEditing(true)}>
                <Pencil aria-hidden="true" className="size-4" />
                Edit recipe
              </Button>
              <Button variant="secondary" onClick={() => setConfirm(true)}>
                <Trash2 aria-hidden="true" className="size-4" />
                Remove
              </Button>
            </>
          )
        }
      />
      {editing ? (
        paints.isPending ? (
          <LoadingBlock label="Loading the rack…" />
        ) : paints.error ? (
          <ErrorNote title="The rack did not load">{paints.error.message}</ErrorNote>
        ) : (
          <Card>
            <RecipeEditor
              key={r.updatedAt}
              recipe={r}
              paints={paints.data}
              hazards={hazards.data}
              submitLabel="Save changes"
              pending={save.isPending}
              onCancel={() => setEditing(false)}
              onSave={async (body) => {
                await save.mutateAsync(body);
                toast.show('Recipe saved.');
                setEditing(false);
              }}
            />
          </Card>
        )
      ) : (
        <div className="flex flex-col gap-4">
          {r.description && <p className="max-w-prose text-sm">{r.description}</p>}
          <RecipeSteps recipe={r} hazards={hazards.data} />
        </div>
      )}
      <Dialog
        open={confirm}
        onClose={() => {
          setConfirm(false);
          setRemoveError(null);
        }}
        title={`Remove “${r.name}”?`}
        description={r.schemeCount ? `It is in ${pluralize(r.schemeCount, 'scheme')}; take it out of them first.` : 'The recipe and its steps go. The paints stay on the rack.'}
        footer={
          r.schemeCount ? (
            <Button variant="secondary" onClick={() => setConfirm(false)}>
              Close
            </Button>
          ) : (
            <>
              <Button variant="secondary" onClick={() => setConfirm(false)}>
                Keep it
              </Button>
              <Button
                variant="danger"
                loading={remove.isPending}
                onClick={async () => {
                  try {
                    await remove.mutateAsync(r.id);
                    toast.show(`Recipe “${r.name}” removed.`);
                    navigate(`/studio/${studioId}/paints/recipes`, { replace: true });
                  } catch (err) {
                    setRemoveError(isApiError(err) ? err.message : 'That did not work. Try again.');
                  }
                }}
              >
                Remove recipe
              </Button>
            </>
          )
        }
      >
        {removeError && <ErrorNote>{removeError}</ErrorNote>}
      </Dialog>
    </>
  );
}
