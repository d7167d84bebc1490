import { Link, useParams } from 'react-router-dom';
import { ChevronLeft, FileDown } from 'lucide-react';
import { formatMoney } from '../../../../shared/money';
import { Card } from '../../../components/ui/card';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { PageTitle, useDocumentTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { buttonClasses } from '../../../components/ui/button';
import { isApiError } from '../../../lib/api-client';
import { formatDate, formatDateTime } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { invoicePdfUrl, useInvoice } from '../api/get-invoice';
import type { Invoice } from '../../../../shared/schemas/invoices';
import { InvoiceLines } from '../components/invoice-lines';
import { formatDay, invoiceTitle, InvoiceStatusBadge, methodLabels } from '../components/labels';
import { hasOwnerActions, OwnerInvoiceActions } from '../components/owner-actions';
import { canPay, PayButton } from '../components/pay-button';

export function BackToInvoices() {
  return (
    <Link to=".." relative="path" className="mb-3 inline-flex items-center gap-1 text-sm">
      <ChevronLeft aria-hidden="true" className="size-4" />
      All invoices
    </Link>
  );
}

function Payments({ invoice, timezone }: { invoice: Invoice; timezone: string }) {
  if (invoice.payments.length === 0) return <p className="text-sm text-sable-600">No payments yet.</p>;
  const m = (minor: number) => formatMoney(minor, invoice.currency);
  return (
    <Table caption="Payments received" captionHidden>
      <THead>
        <Tr>
          <Th>Received</Th>
          <Th>How</Th>
          <Th className="text-right">Amount</Th>
          <Th className="hidden text-right sm:table-cell">Refunded</Th>
          <Th className="hidden md:table-cell">Reference</Th>
        </Tr>
      </THead>
      <TBody>
        {invoice.payments.map((p) => (
          <Tr key={p.id}>
            <Td className="figures whitespace-nowrap">{formatDate(p.receivedAt, timezone)}</Td>
            <Td>{methodLabels[p.method] ?? p.method}</Td>
            <Td className="figures text-right whitespace-nowrap">{m(p.amountMinor)}</Td>
            <Td className="figures hidden text-right whitespace-nowrap sm:table-cell">{p.refundedMinor ? m(p.refundedMinor) : '—'}</Td>
            <Td className="hidden break-all md:table-cell">{p.reference ?? '—'}</Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}

/** Payment events that did not match what we asked for: never counted, shown plainly. */
function PaymentIssues({ invoice, timezone }: { invoice: Invoice; timezone: string }) {
  return (
    <ErrorNote title="A payment did not add up, so we did not count it">
      <ul className="flex list-disc flex-col gap-1 pl-4">
        {invoice.paymentIssues.map((p) => (
          <li key={p.eventId}>
            <span className="figures">{formatDateTime(p.at, timezone)}</span>: {p.reason} <span className="text-xs break-all text-sable-600">(event {p.eventId})</span>
          </li>
        ))}
      </ul>
      <p className="mt-2">Check the payment in the payment service. If the money did arrive, record it here by hand.</p>
    </ErrorNote>
  );
}

function StatusNote({ invoice, role }: { invoice: Invoice; role: string }) {
  const m = (minor: number) => formatMoney(minor, invoice.currency);
  if (invoice.kind === 'credit_note') {
    if (invoice.status === 'draft') return <Note>A draft credit note: the client does not see it until you issue it.</Note>;
    if (invoice.status === 'void') return <Note>This credit note was voided.</Note>;
    return <Note>{`${m(invoice.total)} credited${invoice.status === 'refunded' ? ' and paid back' : ''}.`}</Note>;
  }
  switch (invoice.status) {
    case 'paid':
      return <Note>{role === 'owner' ? 'Paid in full.' : 'Paid in full — thank you.'}</Note>;
    case 'void':
      return <Note>This invoice was voided: nothing is owed on it.</Note>;
    case 'refunded':
      return <Note>This invoice was refunded. The credit note shows the amount.</Note>;
    case 'partly_paid':
      return <Note>{`${m(invoice.paid)} paid so far; ${m(invoice.balanceDue)} left to pay.`}</Note>;
    case 'draft':
      return <Note>A draft: the client does not see it until you issue it.</Note>;
    default:
      return null;
  }
}

export function InvoiceDetailRoute() {
  const { studioId, role, timezone } = useStudioScope();
  const params = useParams();
  const invoiceId = Number(params.invoiceId);
  const valid = Number.isInteger(invoiceId) && invoiceId > 0;
  const invoice = useInvoice(studioId, invoiceId, { enabled: valid });
  useDocumentTitle(invoice.data ? invoiceTitle(invoice.data) : 'Invoice');

  if (!valid || isApiError(invoice.error, 404)) {
    return (
      <>
        <BackToInvoices />
        <PageTitle title="Invoice not found" />
        <ErrorNote>We could not find this invoice. The link may be wrong, or it is not one of yours.</ErrorNote>
      </>
    );
  }
  if (invoice.isPending) return <LoadingBlock label="Loading invoice…" />;
  if (invoice.error) {
    return (
      <>
        <BackToInvoices />
        <ErrorNote title="This invoice did not load">{invoice.error.message}</ErrorNote>
      </>
    );
  }

  const inv = invoice.data;
  const owner = role === 'owner';
  const overdue = inv.overdue;

  return (
    <>
      <BackToInvoices />
      <PageTitle
        title={invoiceTitle(inv)}
        description={
          <span className="flex flex-wrap items-center gap-x-3 gap-y-1">
            <InvoiceStatusBadge status={inv.status} overdue={overdue} />
            {owner && <span>{inv.client.name}</span>}
            {owner ? (
              <Link to={`../../commissions/${inv.commissionId}`} relative="path">
                {inv.commissionTitle}
              </Link>
            ) : (
              <span>{inv.commissionTitle}</span>
            )}
            {inv.issuedAt && <span className="figures">Issued {formatDate(inv.issuedAt, timezone)}</span>}
            {inv.dueDate && inv.balanceDue > 0 && <span className="figures">Due {formatDay(inv.dueDate)}</span>}
          </span>
        }
        actions={
          inv.status !== 'draft' || owner ? (
            <a href={invoicePdfUrl(studioId, inv.id)} className={buttonClasses('secondary', 'md', 'no-underline')} download>
              <FileDown aria-hidden="true" className="size-4" />
              Download PDF
            </a>
          ) : undefined
        }
      />
      <div className="flex flex-col gap-6">
        <StatusNote invoice={inv} role={role} />
        {owner && inv.paymentIssues.length > 0 && <PaymentIssues invoice={inv} timezone={timezone} />}
        {!owner && canPay(inv) && (
          <Card title="Pay this invoice">
            <PayButton studioId={studioId} invoice={inv} />
          </Card>
        )}
        {owner && hasOwnerActions(inv) && (
          <Card title="Actions">
            <OwnerInvoiceActions studioId={studioId} invoice={inv} timezone={timezone} />
          </Card>
        )}
        <Card title="What it is for">
          {inv.creditFor ? (
            <p className="mb-3 text-sm">
              Credit against <Link to={`../${inv.creditFor}`} relative="path">the invoice it corrects</Link>.
            </p>
          ) : null}
          <InvoiceLines invoice={inv} />
          {inv.note && <p className="mt-4 text-sm whitespace-pre-line">{inv.note}</p>}
          {inv.taxId && <p className="mt-2 text-xs text-sable-600">{`${inv.taxLabel || 'Tax'} ID: ${inv.taxId}`}</p>}
        </Card>
        {(inv.kind !== 'credit_note' || inv.payments.length > 0) && (
          <Card title="Payments">
            <Payments invoice={inv} timezone={timezone} />
          </Card>
        )}
      </div>
    </>
  );
}
