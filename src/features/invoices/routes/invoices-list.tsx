import { useSearchParams } from 'react-router-dom';
import { Plus, Receipt } from 'lucide-react';
import { Button, ButtonLink } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField } from '../../../components/ui/field';
import { Pager } from '../../../components/ui/pager';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useInvoices } from '../api/get-invoices';
import type { InvoiceStatus } from '../../../../shared/schemas/invoices';
import { CsvExport } from '../components/csv-export';
import { InvoicesTable } from '../components/invoices-table';
import { statusLabels } from '../components/labels';

const PAGE_SIZE = 50;
const STATUSES = Object.keys(statusLabels) as InvoiceStatus[];

export type ClientOption = { id: number; name: string };

/** Owners see every invoice with filters; a client sees their own (drafts never). */
export function InvoicesListRoute({ clients = [] }: { clients?: ClientOption[] }) {
  const { studioId, role, timezone } = useStudioScope();
  const owner = role === 'owner';
  const [params, setParams] = useSearchParams();
  const statusParam = params.get('status');
  const status = STATUSES.includes(statusParam as InvoiceStatus) ? (statusParam as InvoiceStatus) : undefined;
  const clientId = Number(params.get('client')) || undefined;
  const commissionId = Number(params.get('commission')) || undefined;
  const offset = Math.max(0, Number(params.get('from') ?? 0) || 0);
  const invoices = useInvoices(studioId, { status, clientId, commissionId, limit: PAGE_SIZE, offset });
  const page = invoices.data;
  const filtered = !!(status || clientId || commissionId);

  function setParam(name: string, value: string | undefined) {
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
        title="Invoices"
        description={owner ? 'Deposits, balances and everything else you have billed.' : 'What you have been billed, what is paid and what is left.'}
        actions={
          owner && (
            <ButtonLink to={commissionId ? `new?commission=${commissionId}` : 'new'} variant="secondary">
              <Plus aria-hidden="true" className="size-4" />
              New invoice
            </ButtonLink>
          )
        }
      />
      {owner && (
        <form role="search" aria-label="Filter invoices" className="mb-4 flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()}>
          <SelectField label="Status" className="w-48" value={status ?? ''} onChange={(e) => setParam('status', e.target.value || undefined)}>
            <option value="">Any status</option>
            {STATUSES.map((s) => (
              <option key={s} value={s}>
                {statusLabels[s]}
              </option>
            ))}
          </SelectField>
          {clients.length > 0 && (
            <SelectField label="Client" className="w-56" value={clientId ? String(clientId) : ''} onChange={(e) => setParam('client', e.target.value || undefined)}>
              <option value="">Every client</option>
              {clients.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.name}
                </option>
              ))}
            </SelectField>
          )}
          {commissionId && (
            <Button variant="ghost" onClick={() => setParam('commission', undefined)}>
              Show every commission
            </Button>
          )}
          <p className="w-full text-xs text-sable-600" aria-live="polite">
            {page ? pluralize(page.total, 'invoice') : ''}
          </p>
        </form>
      )}

      {invoices.isPending ? (
        <LoadingBlock label="Loading invoices…" />
      ) : invoices.error || !page ? (
        <ErrorNote
          title="The invoices did not load"
          action={
            <Button variant="secondary" size="sm" onClick={() => invoices.refetch()}>
              Try again
            </Button>
          }
        >
          {invoices.error?.message}
        </ErrorNote>
      ) : page.items.length === 0 ? (
        <EmptyState icon={<Receipt className="size-8" />} title={filtered ? 'No invoice matches' : 'No invoices yet'}>
          {filtered
            ? 'Try another status or client.'
            : owner
              ? 'A deposit invoice appears here when a client accepts a quote.'
              : 'When you accept a quote, the deposit invoice shows up here.'}
        </EmptyState>
      ) : (
        <>
          <InvoicesTable invoices={page.items} caption={filtered ? 'Invoices matching the filter' : 'All invoices'} timezone={timezone} showClient={owner} base="." />
          <Pager label="Pages of invoices" page={page} onOffset={(o) => setParam('from', o ? String(o) : undefined)} />
        </>
      )}

      {owner && (
        <Card title="For your accountant" description="Every issued invoice and credit note in the dates you choose, as a spreadsheet file (CSV)." className="mt-6">
          <CsvExport studioId={studioId} />
        </Card>
      )}
    </>
  );
}
