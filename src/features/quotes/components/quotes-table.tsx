import { Link } from 'react-router-dom';
import { formatMoney } from '../../../../shared/money';
import type { QuoteSummary } from '../../../../shared/schemas/quotes';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { formatDate } from '../../../lib/format';
import { formatDay, QuoteStatusBadge } from './labels';

export function QuotesTable({ quotes, caption, timezone, forClient, base }: { quotes: QuoteSummary[]; caption: string; timezone: string; forClient: boolean; base: string }) {
  return (
    <Table caption={caption}>
      <THead>
        <Tr>
          <Th>Commission</Th>
          {!forClient && <Th className="hidden md:table-cell">Client</Th>}
          <Th className="hidden sm:table-cell">Sent</Th>
          <Th className="text-right">Total</Th>
          <Th>Status</Th>
        </Tr>
      </THead>
      <TBody>
        {quotes.map((q) => (
          <Tr key={q.id} className="hover:bg-verdigris-100">
            <Td>
              <Link to={`${base}/${q.id}`} relative="path" className="font-medium">
                {q.commissionTitle}
              </Link>
              <span className="block text-xs text-sable-600">
                Version {q.version}
                {!forClient && <span className="md:hidden"> · {q.client.name}</span>}
              </span>
            </Td>
            {!forClient && <Td className="hidden md:table-cell">{q.client.name}</Td>}
            <Td className="figures hidden whitespace-nowrap sm:table-cell">{q.sentAt ? formatDate(q.sentAt, timezone) : '—'}</Td>
            <Td className="figures text-right whitespace-nowrap">{formatMoney(q.total, q.currency)}</Td>
            <Td>
              <QuoteStatusBadge status={q.status} forClient={forClient} />
              {q.status === 'sent' && <span className="figures mt-1 block text-xs text-sable-600">Valid until {formatDay(q.validUntil)}</span>}
            </Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
