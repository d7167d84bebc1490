import { useEffect, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { ClipboardList, Plus, Search } from 'lucide-react';
import { commissionStatuses, commissionStatusLabels } from '../../../../shared/commission-lifecycle';
import { Button, ButtonLink } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { Pager } from '../../../components/ui/pager';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock, Spinner } from '../../../components/ui/spinner';
import { pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useCommissions } from '../api/get-commissions';
import { CommissionsTable } from '../components/commissions-table';

const PAGE_SIZE = 50;
/** Everything still in the studio's hands. */
const ACTIVE = 'enquiry,quoted,booked,on_bench,ready_to_ship,on_hold';

export function CommissionsListRoute() {
  const { studioId, role, timezone } = useStudioScope();
  const canCreate = role === 'owner';
  const [params, setParams] = useSearchParams();
  const q = params.get('q') ?? '';
  const status = params.get('status') ?? 'active';
  const offset = Math.max(0, Number(params.get('from') ?? 0) || 0);
  const [typed, setTyped] = useState(q);

  useEffect(() => {
    if (typed.trim() === q) return;
    const t = window.setTimeout(() => {
      setParams(
        (p) => {
          const next = new URLSearchParams(p);
          if (typed.trim()) next.set('q', typed.trim());
          else next.delete('q');
          next.delete('from');
          return next;
        },
        { replace: true },
      );
    }, 300);
    return () => window.clearTimeout(t);
  }, [typed, q, setParams]);

  const list = useCommissions(studioId, {
    q: q || undefined,
    status: status === 'all' ? undefined : status === 'active' ? ACTIVE : status,
    limit: PAGE_SIZE,
    offset,
  });
  const page = list.data;

  function set(key: string, value: string | null) {
    setParams((p) => {
      const next = new URLSearchParams(p);
      if (value) next.set(key, value);
      else next.delete(key);
      if (key !== 'from') next.delete('from');
      return next;
    });
  }

  const statusWord = status === 'active' ? 'open' : status === 'all' ? '' : commissionStatusLabels[status as keyof typeof commissionStatusLabels]?.toLowerCase();

  return (
    <>
      <PageTitle
        title="Commissions"
        description="Every order from enquiry to shipped."
        actions={
          canCreate && (
            <ButtonLink to="new">
              <Plus aria-hidden="true" className="size-4" />
              New commission
            </ButtonLink>
          )
        }
      />

      <form role="search" aria-label="Find commissions" className="mb-4 flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()}>
        <div className="min-w-0 flex-1 basis-64">
          <label htmlFor="commission-search" className="mb-1 block text-sm font-medium">
            Search commissions
          </label>
          <div className="relative">
            <Search aria-hidden="true" className="pointer-events-none absolute top-1/2 left-3 size-4 -translate-y-1/2 text-sable-600" />
            <input
              id="commission-search"
              type="search"
              value={typed}
              onChange={(e) => setTyped(e.target.value)}
              placeholder="Title or client"
              aria-describedby="commission-search-count"
              className="min-h-10 w-full rounded-control border border-sable-600 bg-white pr-10 pl-9 text-base"
            />
            {list.isFetching && !list.isPending && (
              <span className="absolute top-1/2 right-3 -translate-y-1/2 text-sable-600">
                <Spinner label="Searching…" />
              </span>
            )}
          </div>
        </div>
        <div className="basis-56">
          <label htmlFor="commission-status" className="mb-1 block text-sm font-medium">
            Status
          </label>
          <select
            id="commission-status"
            value={status}
            onChange={(e) => set('status', e.target.value === 'active' ? null : e.target.value)}
            className="min-h-10 w-full rounded-control border border-sable-600 bg-white px-3 text-base"
          >
            <option value="active">Open</option>
            <option value="all">All</option>
            {commissionStatuses.map((s) => (
              <option key={s} value={s}>
                {commissionStatusLabels[s]}
              </option>
            ))}
          </select>
        </div>
        <p id="commission-search-count" className="w-full text-xs text-sable-600" aria-live="polite">
          {page ? `${pluralize(page.total, statusWord ? `${statusWord} commission` : 'commission')}${q ? ` match “${q}”` : ''}` : ''}
        </p>
      </form>

      {list.isPending ? (
        <LoadingBlock label="Loading commissions…" />
      ) : list.error ? (
        <ErrorNote
          title="The commissions did not load"
          action={
            <Button variant="secondary" size="sm" onClick={() => list.refetch()}>
              Try again
            </Button>
          }
        >
          {list.error.message}
        </ErrorNote>
      ) : page && page.items.length === 0 ? (
        q || status !== 'active' ? (
          <EmptyState icon={<Search className="size-8" />} title="Nothing matches">
            Try another word, or set the status to “All”.
          </EmptyState>
        ) : (
          <EmptyState
            icon={<ClipboardList className="size-8" />}
            title="No open commissions"
            action={canCreate && <ButtonLink to="new">Record the first commission</ButtonLink>}
          >
            {canCreate ? 'Record a client’s order with its figures; each figure gets its stage checklist.' : 'When an owner records a commission, it shows up here.'}
          </EmptyState>
        )
      ) : page ? (
        <>
          <CommissionsTable items={page.items} caption={q ? `Commissions matching “${q}”` : 'Commissions'} timezone={timezone} />
          <Pager label="Pages of commissions" page={page} onOffset={(o) => set('from', o ? String(o) : null)} />
        </>
      ) : null}
    </>
  );
}
