import { Link } from 'react-router-dom';
import { ImageIcon } from 'lucide-react';
import type { EnquirySummary } from '../../../../shared/schemas/enquiries';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { formatDate, pluralize } from '../../../lib/format';
import { EnquiryStatusBadge } from './enquiry-status';

export function EnquiriesTable({ enquiries, caption, timezone }: { enquiries: EnquirySummary[]; caption: string; timezone: string }) {
  return (
    <Table caption={caption}>
      <THead>
        <Tr>
          <Th>From</Th>
          <Th>Figures</Th>
          <Th className="hidden md:table-cell">Tier</Th>
          <Th className="hidden sm:table-cell">Wished by</Th>
          <Th className="hidden lg:table-cell">Received</Th>
          <Th>Status</Th>
        </Tr>
      </THead>
      <TBody>
        {enquiries.map((e) => (
          <Tr key={e.id} className="hover:bg-verdigris-100">
            <Td>
              <Link to={String(e.id)} className="font-medium">
                {e.name}
              </Link>
              <span className="block text-xs break-all text-sable-600">{e.email}</span>
              <span className="block text-xs text-sable-600 lg:hidden">Received {formatDate(e.createdAt, timezone)}</span>
            </Td>
            <Td className="figures">
              {pluralize(e.modelCount, 'figure')}
              {e.photoCount > 0 && (
                <span className="mt-0.5 flex items-center gap-1 text-xs text-sable-600">
                  <ImageIcon aria-hidden="true" className="size-3.5" />
                  {pluralize(e.photoCount, 'photo')}
                </span>
              )}
            </Td>
            <Td className="hidden md:table-cell">{e.tier?.label ?? <span className="text-sable-600">No preference</span>}</Td>
            <Td className="hidden whitespace-nowrap sm:table-cell">{e.dueDate ? formatDate(`${e.dueDate}T12:00:00Z`, 'UTC') : <span className="text-sable-600">—</span>}</Td>
            <Td className="hidden whitespace-nowrap lg:table-cell">{formatDate(e.createdAt, timezone)}</Td>
            <Td>
              <EnquiryStatusBadge status={e.status} />
            </Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
