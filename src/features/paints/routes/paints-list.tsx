import { useEffect, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { Download, FileUp, Palette, Plus, Search } from 'lucide-react';
import { paintTypeLabels, paintTypes, type PaintFilter, type PaintType } from '../../../../shared/schemas/paints';
import { Button, ButtonLink, buttonClasses } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock, Spinner } from '../../../components/ui/spinner';
import { SubNav } from '../../../components/ui/sub-nav';
import { pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { usePaints } from '../api/get-paints';
import { exportPaintsUrl } from '../api/import-paints';
import { PaintsTable } from '../components/paints-table';

export function PaintsSubNav() {
  const { studioId } = useStudioScope();
  return (
    <SubNav
      label="Paints and recipes"
      items={[
        { to: `/studio/${studioId}/paints`, label: 'Paint rack', end: true },
        { to: `/studio/${studioId}/paints/recipes`, label: 'Recipes' },
      ]}
    />
  );
}

export function PaintsListRoute() {
  const { studioId } = useStudioScope();
  const [params, setParams] = useSearchParams();
  const q = params.get('q') ?? '';
  const type = (paintTypes as readonly string[]).includes(params.get('type') ?? '') ? (params.get('type') as PaintType) : undefined;
  const stock = params.get('stock') === 'short' ? 'short' : undefined;
  const [typed, setTyped] = useState(q);

  const set = (key: string, value: string | undefined) =>
    setParams(
      (p) => {
        const next = new URLSearchParams(p);
        if (value) next.set(key, value);
        else next.delete(key);
        return next;
      },
      { replace: true },
    );

  useEffect(() => {
    if (typed.trim() === q) return;
    const t = window.setTimeout(() => set('q', typed.trim() || undefined), 300);
    return () => window.clearTimeout(t);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [typed, q]);

  const filter: PaintFilter = { q: q || undefined, type, stock };
  const paints = usePaints(studioId, filter);
  const filtered = Boolean(q || type || stock);

  return (
    <>
      <PageTitle
        title="Paints & recipes"
        description="The studio's paints with their colours and stock."
        actions={
          <>
            <ButtonLink to="new">
              <Plus aria-hidden="true" className="size-4" />
              Add paint
            </ButtonLink>
            <ButtonLink to="import" variant="secondary">
              <FileUp aria-hidden="true" className="size-4" />
              Import CSV
            </ButtonLink>
            <a href={exportPaintsUrl(studioId)} download className={buttonClasses('secondary', 'md', 'no-underline')}>
              <Download aria-hidden="true" className="size-4" />
              Export CSV
            </a>
          </>
        }
      />
      <PaintsSubNav />

      <form role="search" className="mb-4 flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()}>
        <div className="min-w-56 flex-1">
          <label htmlFor="paint-search" className="mb-1 block text-sm font-medium">
            Search the rack
          </label>
          <div className="relative">
            <Search aria-hidden="true" className="pointer-events-none absolute top-1/2 left-3 size-4 -translate-y-1/2 text-sable-600" />
            <input
              id="paint-search"
              type="search"
              value={typed}
              onChange={(e) => setTyped(e.target.value)}
              placeholder="Name, maker, range or #hex"
              className="min-h-10 w-full rounded-control border border-sable-600 bg-white pr-10 pl-9 text-base"
            />
            {paints.isFetching && !paints.isPending && (
              <span className="absolute top-1/2 right-3 -translate-y-1/2 text-sable-600">
                <Spinner label="Searching…" />
              </span>
            )}
          </div>
        </div>
        <div>
          <label htmlFor="paint-type" className="mb-1 block text-sm font-medium">
            Type
          </label>
          <select id="paint-type" value={type ?? ''} onChange={(e) => set('type', e.target.value || undefined)} className="min-h-10 rounded-control border border-sable-600 bg-white px-3 text-base">
            <option value="">All types</option>
            {paintTypes.map((t) => (
              <option key={t} value={t}>
                {paintTypeLabels[t]}
              </option>
            ))}
          </select>
        </div>
        <label className="flex min-h-10 items-center gap-2 text-sm">
          <input type="checkbox" checked={stock === 'short'} onChange={(e) => set('stock', e.target.checked ? 'short' : undefined)} className="size-4 accent-verdigris-600" />
          Only low or out of stock
        </label>
      </form>

      {paints.isPending ? (
        <LoadingBlock label="Loading the rack…" />
      ) : paints.error ? (
        <ErrorNote title="The rack did not load" action={<Button variant="secondary" size="sm" onClick={() => paints.refetch()}>Try again</Button>}>
          {paints.error.message}
        </ErrorNote>
      ) : paints.data.length === 0 ? (
        filtered ? (
          <EmptyState icon={<Search className="size-8" />} title="No paint matches">
            Try another word, or clear the filters.
          </EmptyState>
        ) : (
          <EmptyState icon={<Palette className="size-8" />} title="The rack is empty" action={<ButtonLink to="new">Add the first paint</ButtonLink>}>
            Add paints one by one, or import a CSV file of the whole rack.
          </EmptyState>
        )
      ) : (
        <>
          <p className="mb-2 text-xs text-sable-600" aria-live="polite">
            {pluralize(paints.data.length, 'paint')}
            {filtered ? ' match' : ' on the rack'} · {pluralize(paints.data.filter((p) => p.stockState !== 'ok').length, 'paint')} low or out
          </p>
          <PaintsTable paints={paints.data} caption={filtered ? 'Paints matching the filters' : 'The paint rack'} />
        </>
      )}
    </>
  );
}
