import { useEffect, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { Plus, Search, Users } from 'lucide-react';
import { Button, ButtonLink } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { Pager } from '../../../components/ui/pager';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock, Spinner } from '../../../components/ui/spinner';
import { pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useClients } from '../api/get-clients';
import { ClientsTable } from '../components/clients-table';

const PAGE_SIZE = 50;

export function ClientsListRoute() {
  const { studioId, role } = useStudioScope();
  const canEdit = role === 'owner';
  const [params, setParams] = useSearchParams();
  const q = params.get('q') ?? '';
  const offset = Math.max(0, Number(params.get('from') ?? 0) || 0);
  const [typed, setTyped] = useState(q);

  // Wait for a pause in typing before asking the server.
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

  const clients = useClients(studioId, { q: q || undefined, limit: PAGE_SIZE, offset });

  function goTo(from: number) {
    setParams((p) => {
      const next = new URLSearchParams(p);
      if (from > 0) next.set('from', String(from));
      else next.delete('from');
      return next;
    });
  }

  const page = clients.data;

  return (
    <>
      <PageTitle
        title="Clients"
        description={canEdit ? 'Everyone who orders from the studio.' : 'Everyone who orders from the studio. Owners add and change clients.'}
        actions={
          canEdit && (
            <ButtonLink to="new">
              <Plus aria-hidden="true" className="size-4" />
              Add client
            </ButtonLink>
          )
        }
      />

      <form role="search" className="mb-4 max-w-md" onSubmit={(e) => e.preventDefault()}>
        <label htmlFor="client-search" className="mb-1 block text-sm font-medium">
          Search clients
        </label>
        <div className="relative">
          <Search aria-hidden="true" className="pointer-events-none absolute top-1/2 left-3 size-4 -translate-y-1/2 text-sable-600" />
          <input
            id="client-search"
            type="search"
            value={typed}
            onChange={(e) => setTyped(e.target.value)}
            placeholder="Name, e-mail or phone"
            aria-describedby="client-search-count"
            className="min-h-10 w-full rounded-control border border-sable-600 bg-white pr-10 pl-9 text-base"
          />
          {clients.isFetching && !clients.isPending && (
            <span className="absolute top-1/2 right-3 -translate-y-1/2 text-sable-600">
              <Spinner label="Searching…" />
            </span>
          )}
        </div>
        <p id="client-search-count" className="mt-1 text-xs text-sable-600" aria-live="polite">
          {page ? (q ? `${pluralize(page.total, 'client')} match “${q}”` : pluralize(page.total, 'client')) : ''}
        </p>
      </form>

      {clients.isPending ? (
        <LoadingBlock label="Loading clients…" />
      ) : clients.error ? (
        <ErrorNote
          title="The client list did not load"
          action={
            <Button variant="secondary" size="sm" onClick={() => clients.refetch()}>
              Try again
            </Button>
          }
        >
          {clients.error.message}
        </ErrorNote>
      ) : page && page.items.length === 0 ? (
        q ? (
          <EmptyState icon={<Search className="size-8" />} title={`No client matches “${q}”`}>
            Check the spelling, or search by e-mail or phone instead.
          </EmptyState>
        ) : (
          <EmptyState
            icon={<Users className="size-8" />}
            title="No clients yet"
            action={canEdit && <ButtonLink to="new">Add the first client</ButtonLink>}
          >
            {canEdit ? 'Add the people who send you figures, and invite them to follow along in the portal.' : 'When an owner adds clients, they show up here.'}
          </EmptyState>
        )
      ) : page ? (
        <>
          <ClientsTable clients={page.items} caption={q ? `Clients matching “${q}”` : 'All clients'} />
          <Pager label="Pages of clients" page={page} onOffset={(o) => goTo(o)} />
        </>
      ) : null}
    </>
  );
}
