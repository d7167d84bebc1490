import { useSearchParams } from 'react-router-dom';
import { FileText } from 'lucide-react';
import { quoteStatuses, quoteStatusLabels, type QuoteStatus } from '../../../../shared/schemas/quotes';
import { Button } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField } from '../../../components/ui/field';
import { Pager } from '../../../components/ui/pager';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useQuotes } from '../api/get-quotes';
import { QuotesTable } from '../components/quotes-table';

const PAGE_SIZE = 50;

/** Owners: every quote, by status. Clients: the quotes sent to them (never drafts). */
export function QuotesListRoute() {
  const { studioId, role, timezone } = useStudioScope();
  const forClient = role === 'client';
  const [params, setParams] = useSearchParams();
  const s = params.get('status');
  const status = (quoteStatuses as readonly string[]).includes(s ?? '') ? (s as QuoteStatus) : undefined;
  const offset = Math.max(0, Number(params.get('from') ?? 0) || 0);
  const quotes = useQuotes(studioId, { status, limit: PAGE_SIZE, offset });
  const page = quotes.data;

  function set(name: string, value: string | undefined) {
    setParams((p) => {
      const next = new URLSearchParams(p);
      if (value) next.set(name, value);
      else next.delete(name);
      if (name !== 'from') next.delete('from');
      return next;
    });
  }

  return (
    <>
      <PageTitle
        title="Quotes"
        description={forClient ? 'Quotes the studio has sent you. Open one to read it and answer.' : 'Every quote and its versions. A quote starts from a commission’s figures.'}
      />
      {!forClient && (
        <form role="search" aria-label="Filter quotes" className="mb-4 flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()}>
          <SelectField label="Status" className="w-52" value={status ?? ''} onChange={(e) => set('status', e.target.value || undefined)}>
            <option value="">Any status</option>
            {quoteStatuses.map((k) => (
              <option key={k} value={k}>
                {quoteStatusLabels[k]}
              </option>
            ))}
          </SelectField>
          <p className="w-full text-xs text-sable-600" aria-live="polite">
            {page ? pluralize(page.total, 'quote') : ''}
          </p>
        </form>
      )}
      {quotes.isPending ? (
        <LoadingBlock label="Loading quotes…" />
      ) : quotes.error || !page ? (
        <ErrorNote
          title="The quotes did not load"
          action={
            <Button variant="secondary" size="sm" onClick={() => quotes.refetch()}>
              Try again
            </Button>
          }
        >
          {quotes.error?.message}
        </ErrorNote>
      ) : page.items.length === 0 ? (
        <EmptyState icon={<FileText className="size-8" />} title={status ? 'No quote has that status' : 'No quotes yet'}>
          {status
            ? 'Try another status.'
            : forClient
              ? 'When the studio sends you a quote, it shows up here and in your e-mail.'
              : 'Open a commission and prepare a quote from its figures.'}
        </EmptyState>
      ) : (
        <>
          <QuotesTable quotes={page.items} caption={status ? `Quotes: ${quoteStatusLabels[status]}` : 'All quotes'} timezone={timezone} forClient={forClient} base="." />
          <Pager label="Pages of quotes" page={page} onOffset={(o) => set('from', o ? String(o) : undefined)} />
        </>
      )}
    </>
  );
}
