import { useState, type FormEvent } from 'react';
import { Link } from 'react-router-dom';
import { Pipette, Plus, ShoppingBasket, Trash2, TriangleAlert } from 'lucide-react';
import { matchBand } from '../../../../shared/color';
import { schemeEntryInput, type ClientScheme, type SchemeEntry, type StudioScheme } from '../../../../shared/schemas/recipes';
import { Badge } from '../../../components/ui/badge';
import { Button, ButtonLink } from '../../../components/ui/button';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { SelectField, TextField } from '../../../components/ui/field';
import { LoadingBlock } from '../../../components/ui/spinner';
import { Swatch } from '../../../components/ui/swatch';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { useStudioScope } from '../../../lib/studio-scope';
import { useChangeScheme } from '../api/change-scheme';
import { useReferencePhotos } from '../api/get-reference-photos';
import { useRecipeOptions } from '../api/get-recipe-options';
import { useScheme } from '../api/get-scheme';
import { useShoppingList } from '../api/get-shopping-list';

type FigureRef = { id: number; name: string };

function Strip({ swatches, label }: { swatches: string[]; label: string }) {
  if (!swatches.length) return null;
  return (
    <span role="img" aria-label={`${label}: ${swatches.join(', ')}, approximate`} className="inline-flex overflow-hidden rounded-control border border-sable-600/40">
      {swatches.slice(0, 12).map((hex, i) => (
        <span key={`${hex}-${i}`} className="h-5 w-4" style={{ backgroundColor: hex }} />
      ))}
    </span>
  );
}

/**
 * The scheme of a commission: which recipe goes on which area of which figure. The studio edits it and
 * sees what to buy; the client sees the colours and recipe names only (the server sends nothing more).
 */
export function SchemeSection({ commissionId, figures = [] }: { commissionId: number; figures?: FigureRef[] }) {
  const { studioId } = useStudioScope();
  const scheme = useScheme(studioId, commissionId);
  if (scheme.isPending) return <LoadingBlock label="Loading the scheme…" />;
  if (scheme.error) return <ErrorNote title="The scheme did not load">{scheme.error.message}</ErrorNote>;
  return scheme.data.view === 'client' ? <ClientSchemeView scheme={scheme.data} /> : <StudioSchemeView scheme={scheme.data} figures={figures} />;
}

function groupByFigure<T extends { figure: FigureRef | null }>(entries: T[]) {
  const groups: { figure: FigureRef | null; entries: T[] }[] = [];
  for (const e of entries) {
    const key = e.figure?.id ?? null;
    let g = groups.find((x) => (x.figure?.id ?? null) === key);
    if (!g) groups.push((g = { figure: e.figure, entries: [] }));
    g.entries.push(e);
  }
  return groups;
}

function ClientSchemeView({ scheme }: { scheme: ClientScheme }) {
  if (scheme.entries.length === 0) return <p className="text-sm text-sable-600">The studio has not set out the colours yet. They will show here as swatches.</p>;
  return (
    <div className="flex flex-col gap-4" data-testid="scheme-swatches">
      <h3 className="text-base font-semibold">The colours the studio has chosen</h3>
      {groupByFigure(scheme.entries).map((g) => (
        <div key={g.figure?.id ?? 'all'}>
          <h4 className="mb-2 text-sm font-semibold text-sable-600">{g.figure ? g.figure.name : 'All figures'}</h4>
          <ul className="grid gap-3 sm:grid-cols-2">
            {g.entries.map((e) => (
              <li key={e.id} className="flex items-center gap-3 rounded-card border border-primer-300 bg-bone-50 p-3">
                <Swatch size="lg" hex={e.recipe.swatch} label={`${e.area}: ${e.recipe.name}${e.recipe.swatch ? `, ${e.recipe.swatch}` : ''}`} />
                <div className="min-w-0">
                  <p className="font-medium">{e.area}</p>
                  <p className="text-sm text-sable-600">{e.recipe.name}</p>
                  <div className="mt-1">
                    <Strip swatches={e.recipe.swatches.map((s) => s.hex)} label={`Colours of ${e.recipe.name}`} />
                  </div>
                </div>
              </li>
            ))}
          </ul>
        </div>
      ))}
      <p className="text-xs text-sable-600">Colours on a screen are approximate; paint on the figure will look a little different.</p>
    </div>
  );
}

function StudioSchemeView({ scheme, figures }: { scheme: StudioScheme; figures: FigureRef[] }) {
  const { studioId } = useStudioScope();
  const change = useChangeScheme(studioId, scheme.commissionId);
  const toast = useToast();
  const [removeError, setRemoveError] = useState<string | null>(null);

  return (
    <div className="flex flex-col gap-5">
      {scheme.entries.length === 0 ? (
        <p className="text-sm text-sable-600">No recipes in the scheme yet. Add one for each area — skin, cloth, metal — and the client sees its colours.</p>
      ) : (
        <div className="flex flex-col gap-4">
          {groupByFigure(scheme.entries).map((g) => (
            <div key={g.figure?.id ?? 'all'}>
              <h3 className="mb-2 text-sm font-semibold text-sable-600">{g.figure ? g.figure.name : 'Whole commission'}</h3>
              <ul className="flex flex-col divide-y divide-primer-300 rounded-card border border-primer-300 bg-bone-50">
                {g.entries.map((e) => (
                  <EntryRow
                    key={e.id}
                    entry={e}
                    removing={change.remove.isPending && change.remove.variables === e.id}
                    onRemove={async () => {
                      setRemoveError(null);
                      try {
                        await change.remove.mutateAsync(e.id);
                        toast.show(`${e.area} is out of the scheme.`);
                      } catch (err) {
                        setRemoveError(isApiError(err) ? err.message : 'That did not work. Try again.');
                      }
                    }}
                  />
                ))}
              </ul>
            </div>
          ))}
        </div>
      )}
      {removeError && <ErrorNote>{removeError}</ErrorNote>}
      <AddEntryForm commissionId={scheme.commissionId} figures={figures} />
      <ShoppingList commissionId={scheme.commissionId} hasEntries={scheme.entries.length > 0} />
      <ReferencePalettes commissionId={scheme.commissionId} />
    </div>
  );
}

function EntryRow({ entry, removing, onRemove }: { entry: SchemeEntry; removing: boolean; onRemove: () => void }) {
  const { studioId } = useStudioScope();
  const r = entry.recipe;
  return (
    <li className="flex flex-wrap items-center gap-3 p-3">
      <Swatch hex={r.swatch} label={`${entry.area}: ${r.name}${r.swatch ? `, ${r.swatch}` : ''}`} />
      <div className="min-w-0 flex-1">
        <p className="font-medium">{entry.area}</p>
        <p className="text-sm">
          <Link to={`/studio/${studioId}/paints/recipes/${r.id}`}>{r.name}</Link>
          <span className="text-sable-600"> · {r.stepCount} {r.stepCount === 1 ? 'step' : 'steps'}</span>
          {r.hazards.length > 0 && (
            <span className="ml-2 inline-flex items-center gap-1 text-xs text-sable-600">
              <TriangleAlert aria-hidden="true" className="size-3.5" />
              Safety note in the recipe
            </span>
          )}
        </p>
        {entry.notes && <p className="text-sm text-sable-600">{entry.notes}</p>}
      </div>
      <Strip swatches={r.swatches} label={`Colours of ${r.name}`} />
      <Button variant="ghost" size="sm" loading={removing} onClick={onRemove} aria-label={`Take ${entry.area} out of the scheme`}>
        <Trash2 aria-hidden="true" className="size-4" />
      </Button>
    </li>
  );
}

function AddEntryForm({ commissionId, figures }: { commissionId: number; figures: FigureRef[] }) {
  const { studioId } = useStudioScope();
  const recipes = useRecipeOptions(studioId);
  const change = useChangeScheme(studioId, commissionId);
  const toast = useToast();
  const [figureId, setFigureId] = useState('');
  const [area, setArea] = useState('');
  const [recipeId, setRecipeId] = useState('');
  const [notes, setNotes] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [formError, setFormError] = useState<string | null>(null);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setFormError(null);
    const body = { figureId: figureId ? Number(figureId) : null, area, recipeId: Number(recipeId) || 0, notes };
    const parsed = schemeEntryInput.safeParse(body);
    if (!parsed.success) {
      const out: Record<string, string> = {};
      for (const i of parsed.error.issues) out[String(i.path[0])] ??= i.message;
      setErrors(out);
      return;
    }
    setErrors({});
    try {
      await change.add.mutateAsync(body);
      toast.show(`${parsed.data.area} added to the scheme.`);
      setArea('');
      setNotes('');
      setRecipeId('');
    } catch (err) {
      if (isApiError(err) && Object.keys(err.fields).length) setErrors(err.fields);
      else setFormError(isApiError(err) ? err.message : 'That did not save. Try again.');
    }
  }

  return (
    <form onSubmit={submit} noValidate aria-label="Add a recipe to the scheme" className="flex flex-col gap-3 rounded-card border border-dashed border-primer-300 p-3">
      <h3 className="text-sm font-semibold">Add a recipe to the scheme</h3>
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <SelectField label="For" value={figureId} onChange={(e) => setFigureId(e.target.value)} error={errors.figureId}>
          <option value="">Whole commission</option>
          {figures.map((f) => (
            <option key={f.id} value={f.id}>
              {f.name}
            </option>
          ))}
        </SelectField>
        <TextField label="Area" placeholder="e.g. cloak" value={area} onChange={(e) => setArea(e.target.value)} error={errors.area} autoComplete="off" />
        <SelectField label="Recipe" value={recipeId} onChange={(e) => setRecipeId(e.target.value)} error={errors.recipeId} disabled={recipes.isPending}>
          <option value="">{recipes.isPending ? 'Loading recipes…' : 'Choose a recipe…'}</option>
          {recipes.data?.map((r) => (
            <option key={r.id} value={r.id}>
              {r.name}
            </option>
          ))}
        </SelectField>
        <TextField label="Note" optional value={notes} onChange={(e) => setNotes(e.target.value)} error={errors.notes} autoComplete="off" />
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" loading={change.add.isPending}>
          <Plus aria-hidden="true" className="size-4" />
          Add to scheme
        </Button>
        <Link to={`/studio/${studioId}/paints/recipes/new`} className="text-sm">
          Write a new recipe
        </Link>
      </div>
    </form>
  );
}

function ShoppingList({ commissionId, hasEntries }: { commissionId: number; hasEntries: boolean }) {
  const { studioId } = useStudioScope();
  const list = useShoppingList(studioId, commissionId, hasEntries);
  if (!hasEntries) return null;
  return (
    <section aria-labelledby="shopping-title" className="rounded-card border border-primer-300 bg-bone-50 p-3">
      <h3 id="shopping-title" className="mb-2 flex items-center gap-2 text-sm font-semibold">
        <ShoppingBasket aria-hidden="true" className="size-4" />
        Shopping list for this scheme
      </h3>
      {list.isPending ? (
        <LoadingBlock label="Checking the rack…" />
      ) : list.error ? (
        <ErrorNote>{list.error.message}</ErrorNote>
      ) : list.data.restock.length === 0 && list.data.unmatched.length === 0 ? (
        <p className="text-sm text-sable-600">Nothing to buy: every paint of the scheme is in stock, and the rack has a close match for each target colour.</p>
      ) : (
        <div className="flex flex-col gap-3 text-sm">
          {list.data.restock.length > 0 && (
            <div>
              <p className="mb-1 font-medium">Restock</p>
              <ul className="flex flex-col gap-1">
                {list.data.restock.map((r) => (
                  <li key={r.paint.id} className="flex flex-wrap items-center gap-2">
                    <Swatch size="sm" hex={r.paint.hex} label={`${r.paint.name}${r.paint.hex ? `, ${r.paint.hex}` : ''}`} />
                    <Link to={`/studio/${studioId}/paints/${r.paint.id}`}>{r.paint.name}</Link>
                    {r.paint.maker && <span className="text-sable-600">{r.paint.maker}</span>}
                    {r.paint.stockState === 'out' ? <Badge tone="danger">Out</Badge> : <Badge tone="attention">Low · {r.paint.stock} left</Badge>}
                    <span className="text-xs text-sable-600">for {r.recipes.join(', ')}</span>
                  </li>
                ))}
              </ul>
            </div>
          )}
          {list.data.unmatched.length > 0 && (
            <div>
              <p className="mb-1 font-medium">Colours the rack has nothing close to (ΔE00 5 or more)</p>
              <ul className="flex flex-col gap-1">
                {list.data.unmatched.map((u) => (
                  <li key={u.recipeId} className="flex flex-wrap items-center gap-2">
                    <Swatch size="sm" hex={u.hex} label={`Target colour ${u.hex}`} />
                    <span>
                      {u.recipeName} <span className="font-mono text-xs">{u.hex}</span>
                    </span>
                    {u.nearest && (
                      <span className="text-xs text-sable-600">
                        nearest: {u.nearest.paint.name}, ΔE00 <span className="figures">{u.nearest.deltaE.toFixed(1)}</span> ({matchBand(u.nearest.deltaE)})
                      </span>
                    )}
                    <Link to={`/studio/${studioId}/paints/new?hex=${encodeURIComponent(u.hex)}`} className="text-xs">
                      Add a paint in this colour
                    </Link>
                  </li>
                ))}
              </ul>
            </div>
          )}
        </div>
      )}
    </section>
  );
}

function ReferencePalettes({ commissionId }: { commissionId: number }) {
  const { studioId } = useStudioScope();
  const photos = useReferencePhotos(studioId, commissionId);
  if (photos.isPending || photos.error || photos.data.length === 0) return null;
  return (
    <section aria-labelledby="references-title">
      <h3 id="references-title" className="mb-2 text-sm font-semibold">
        Match the client&rsquo;s reference photos to the rack
      </h3>
      <ul className="flex flex-wrap gap-3">
        {photos.data.map((p, i) => (
          <li key={p.id} className="flex w-36 flex-col gap-1">
            <img src={p.urls.thumb} alt={p.caption ?? 'Reference photo'} className="aspect-square w-36 rounded-control border border-primer-300 object-cover" loading="lazy" />
            <ButtonLink to={`/studio/${studioId}/paints/palette/${p.id}`} variant="secondary" size="sm" aria-label={`Match colours of reference photo ${i + 1}${p.caption ? `, ${p.caption}` : ''}`}>
              <Pipette aria-hidden="true" className="size-4" />
              Match colours
            </ButtonLink>
          </li>
        ))}
      </ul>
      <Note className="mt-2 text-xs">Matches use the rack&rsquo;s colours and are for the studio only; the client sees the photo and the scheme.</Note>
    </section>
  );
}
