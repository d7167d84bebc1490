import { Link } from 'react-router-dom';
import { priorityLabels } from '../../../../shared/commission-lifecycle';
import type { CommissionSummary } from '../../../../shared/schemas/commissions';
import { Badge } from '../../../components/ui/badge';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { DueDate, formatDay } from './due-date';
import { ProgressBar } from './progress-bar';
import { StatusBadge } from './status-badge';

export function CommissionsTable({ items, caption, timezone }: { items: CommissionSummary[]; caption: string; timezone: string }) {
  return (
    <Table caption={caption}>
      <THead>
        <Tr>
          <Th>Commission</Th>
          <Th className="hidden md:table-cell">Client</Th>
          <Th>Status</Th>
          <Th className="hidden sm:table-cell">Due</Th>
          <Th className="hidden lg:table-cell">Progress</Th>
        </Tr>
      </THead>
      <TBody>
        {items.map((c) => (
          <Tr key={c.id} className="hover:bg-verdigris-100">
            <Td>
              <Link to={String(c.id)} className="font-medium">
                {c.title}
              </Link>
              <span className="flex flex-wrap items-center gap-x-1 text-xs text-sable-600">
                {c.priority === 'high' && <Badge tone="attention">{priorityLabels.high} priority</Badge>}
                <span className="md:hidden">{c.client.name} · </span>
                {c.modelCount} {c.modelCount === 1 ? 'figure' : 'figures'}
                <span className="sm:hidden"> · {c.dueDate ? `due ${formatDay(c.dueDate)}` : 'no due date'}</span>
              </span>
              <ProgressBar progress={c.progress} label={`Progress of ${c.title}`} compact className="mt-1 max-w-60 lg:hidden" />
            </Td>
            <Td className="hidden md:table-cell">{c.client.name}</Td>
            <Td>
              <StatusBadge status={c.status} />
            </Td>
            <Td className="hidden whitespace-nowrap sm:table-cell">
              <DueDate date={c.dueDate} status={c.status} timezone={timezone} />
            </Td>
            <Td className="hidden min-w-56 lg:table-cell">
              <ProgressBar progress={c.progress} label={`Progress of ${c.title}`} compact />
            </Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
