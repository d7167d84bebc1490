import { Link } from 'react-router-dom';
import { formatMoney } from '../../../../shared/money';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { formatDate } from '../../../lib/format';
import type { Invoice } from '../../../../shared/schemas/invoices';
import { formatDay, invoiceTitle, InvoiceStatusBadge, kindLabels } from './labels';

export function InvoicesTable({ invoices, caption, timezone, showClient, base }: { invoices: Invoice[]; caption: string; timezone: string; showClient: boolean; base: string }) {
  return (
    <Table caption={caption}>
      <THead>
        <Tr>
          <Th>Invoice</Th>
          {showClient && <Th className="hidden md:table-cell">Client</Th>}
          <Th className="hidden sm:table-cell">Issued</Th>
          <Th className="hidden lg:table-cell">Due</Th>
          <Th className="text-right">Total</Th>
          <Th className="hidden text-right sm:table-cell">Left to pay</Th>
          <Th>Status</Th>
        </Tr>
      </THead>
      <TBody>
        {invoices.map((inv) => (
          <Tr key={inv.id} className="hover:bg-verdigris-100">
            <Td>
              <Link to={`${base}/${inv.id}`} className="font-medium">
                {inv.number ?? 'Draft'}
              </Link>
              <span className="block text-xs text-sable-600">
                {kindLabels[inv.kind]} · {inv.commissionTitle}
                {showClient && <span className="md:hidden"> · {inv.client.name}</span>}
              </span>
              <span className="sr-only">{invoiceTitle(inv)}</span>
            </Td>
            {showClient && <Td className="hidden whitespace-nowrap md:table-cell">{inv.client.name}</Td>}
            <Td className="figures hidden whitespace-nowrap sm:table-cell">{inv.issuedAt ? formatDate(inv.issuedAt, timezone) : '—'}</Td>
            <Td className="figures hidden whitespace-nowrap lg:table-cell">{inv.dueDate ? formatDay(inv.dueDate) : '—'}</Td>
            <Td className="figures text-right whitespace-nowrap">{formatMoney(inv.total, inv.currency)}</Td>
            <Td className="figures hidden text-right whitespace-nowrap sm:table-cell">{formatMoney(inv.balanceDue, inv.currency)}</Td>
            <Td>
              <InvoiceStatusBadge status={inv.status} overdue={inv.overdue} />
            </Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
