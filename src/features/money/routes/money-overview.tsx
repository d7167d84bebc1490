import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Banknote, HandCoins, PiggyBank } from 'lucide-react';
import { formatMoney } from '../../../../shared/money';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { formatDateTime, pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useMoney } from '../api/get-money';

function Tile({ icon, label, value, children }: { icon: ReactNode; label: string; value: ReactNode; children?: ReactNode }) {
  return (
    <div className="flex flex-col gap-1 rounded-card border border-primer-300 bg-bone-50 p-4 shadow-raised">
      <span className="flex items-center gap-2 text-sm text-sable-600">
        <span aria-hidden="true" className="text-verdigris-600">
          {icon}
        </span>
        {label}
      </span>
      <span className="figures text-xl font-semibold">{value}</span>
      {children && <span className="text-xs text-sable-600">{children}</span>}
    </div>
  );
}

function monthName(timezone: string): string {
  try {
    return new Intl.DateTimeFormat(undefined, { month: 'long', year: 'numeric', timeZone: timezone }).format(new Date());
  } catch {
    return 'this month';
  }
}

/** The owner's money at a glance: what is owed and by whom, what came in this month, what deposits are held. */
export function MoneyOverviewRoute() {
  const { studioId, timezone } = useStudioScope();
  const money = useMoney(studioId);

  return (
    <>
      <PageTitle title="Quotes & invoices" description="What is owed to you, what came in, and the deposits you hold for work not started." />
      {money.isPending ? (
        <LoadingBlock label="Adding it up…" />
      ) : money.error ? (
        <ErrorNote
          title="The figures did not load"
          action={
            <Button variant="secondary" size="sm" onClick={() => money.refetch()}>
              Try again
            </Button>
          }
        >
          {money.error.message}
        </ErrorNote>
      ) : (
        <MoneyBody view={money.data} timezone={timezone} />
      )}
    </>
  );
}

function MoneyBody({ view, timezone }: { view: NonNullable<ReturnType<typeof useMoney>['data']>; timezone: string }) {
  const m = (minor: number) => formatMoney(minor, view.currency);
  // Owed amounts are kept per currency: an invoice keeps the currency it was issued in.
  const owed = new Map<string, number>();
  for (const row of view.outstandingByClient) owed.set(row.currency, (owed.get(row.currency) ?? 0) + row.outstandingMinor);
  if (owed.size === 0) owed.set(view.currency, 0);
  const rows = [...view.outstandingByClient].sort((a, b) => b.outstandingMinor - a.outstandingMinor);

  return (
    <div className="flex flex-col gap-6">
      {view.paymentIssues.length > 0 && (
        <ErrorNote title="Payments that did not add up">
          <p>We did not count these as paid. Check them in the payment service; if the money arrived, record it on the invoice by hand.</p>
          <ul className="mt-2 flex list-disc flex-col gap-1 pl-4">
            {view.paymentIssues.map((p) => (
              <li key={p.eventId}>
                <span className="figures">{formatDateTime(p.at, timezone)}</span>:{' '}
                {p.invoiceId ? <Link to={`../invoices/${p.invoiceId}`} relative="path">{p.invoiceNumber ? `invoice ${p.invoiceNumber}` : 'an invoice'}</Link> : 'no invoice matched'} — {p.reason}
              </li>
            ))}
          </ul>
        </ErrorNote>
      )}

      <div className="grid gap-4 sm:grid-cols-3">
        <Tile icon={<HandCoins className="size-4" />} label="Owed to you" value={[...owed].map(([c, v]) => formatMoney(v, c)).join(' + ')}>
          {pluralize(view.openInvoices, 'open invoice')}
          {view.overdueInvoices > 0 && ` · ${view.overdueInvoices} overdue`}
        </Tile>
        <Tile icon={<Banknote className="size-4" />} label={`Paid in ${monthName(timezone)}`} value={m(view.paidThisMonthMinor)}>
          Net of refunds made this month.
        </Tile>
        <Tile icon={<PiggyBank className="size-4" />} label="Deposits held" value={m(view.depositsHeldMinor)}>
          For commissions not yet on the bench.
        </Tile>
      </div>

      <Card title="Owed, by client">
        {rows.length === 0 ? (
          <EmptyState title="Nobody owes you anything">Open invoices show up here until they are paid.</EmptyState>
        ) : (
          <Table caption="What each client owes" captionHidden>
            <THead>
              <Tr>
                <Th>Client</Th>
                <Th className="text-right">Open invoices</Th>
                <Th className="hidden text-right sm:table-cell">Overdue</Th>
                <Th className="text-right">Owed</Th>
              </Tr>
            </THead>
            <TBody>
              {rows.map((r) => (
                <Tr key={`${r.client.id}-${r.currency}`}>
                  <Td>
                    <Link to={`../invoices?client=${r.client.id}`} relative="path" className="font-medium">
                      {r.client.name}
                    </Link>
                  </Td>
                  <Td className="figures text-right">{r.invoices}</Td>
                  <Td className="figures hidden text-right sm:table-cell">{r.overdue > 0 ? <span className="font-semibold text-oxide-600">{r.overdue}</span> : '—'}</Td>
                  <Td className="figures text-right whitespace-nowrap">{formatMoney(r.outstandingMinor, r.currency)}</Td>
                </Tr>
              ))}
            </TBody>
          </Table>
        )}
      </Card>
    </div>
  );
}
