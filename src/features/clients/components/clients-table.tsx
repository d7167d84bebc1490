import { Link } from 'react-router-dom';
import type { Client } from '../../../../shared/schemas/clients';
import { Badge } from '../../../components/ui/badge';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';

function PortalBadge({ client }: { client: Client }) {
  if (client.erasedAt) return <Badge>Erased</Badge>;
  if (client.hasAccount) return <Badge tone="info">In the portal</Badge>;
  if (client.invitedAt) return <Badge tone="neutral">Invited</Badge>;
  return <span className="text-sable-600">—</span>;
}

export function ClientsTable({ clients, caption }: { clients: Client[]; caption: string }) {
  return (
    <Table caption={caption}>
      <THead>
        <Tr>
          <Th>Name</Th>
          <Th className="hidden md:table-cell">E-mail</Th>
          <Th className="hidden lg:table-cell">Phone</Th>
          <Th className="hidden sm:table-cell">Where</Th>
          <Th>Portal</Th>
        </Tr>
      </THead>
      <TBody>
        {clients.map((c) => (
          <Tr key={c.id} className="hover:bg-verdigris-100">
            <Td>
              <Link to={String(c.id)} className="font-medium">
                {c.name}
              </Link>
              {c.email && <span className="block text-xs break-all text-sable-600 md:hidden">{c.email}</span>}
            </Td>
            <Td className="hidden break-all md:table-cell">{c.email ?? <span className="text-sable-600">—</span>}</Td>
            <Td className="hidden whitespace-nowrap lg:table-cell">{c.phone ?? <span className="text-sable-600">—</span>}</Td>
            <Td className="hidden sm:table-cell">{[c.address?.city, c.address?.country].filter(Boolean).join(', ') || <span className="text-sable-600">—</span>}</Td>
            <Td>
              <PortalBadge client={c} />
            </Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
