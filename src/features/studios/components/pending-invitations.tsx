import type { Invitation } from '../../../../shared/schemas/studios';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { useToast } from '../../../components/ui/toast';
import { formatDate } from '../../../lib/format';
import { useRevokeInvitation } from '../api/revoke-invitation';
import { ROLE_LABEL } from './role-label';

export function PendingInvitations({ studioId, invitations, timezone }: { studioId: number; invitations: Invitation[]; timezone: string }) {
  const revoke = useRevokeInvitation(studioId);
  const toast = useToast();

  if (invitations.length === 0) {
    return <EmptyState title="No open invitations">Invitations you send wait here until they are accepted.</EmptyState>;
  }

  async function onRevoke(inv: Invitation) {
    try {
      await revoke.mutateAsync(inv.id);
      toast.show(`Invitation for ${inv.email} revoked. The link no longer works.`);
    } catch (err) {
      toast.show(err instanceof Error ? err.message : 'That did not work. Try again.', 'error');
    }
  }

  return (
    <Table caption="Invitations not yet accepted" captionHidden>
      <THead>
        <Tr>
          <Th>E-mail</Th>
          <Th>Role</Th>
          <Th className="hidden sm:table-cell">Open until</Th>
          <Th>
            <span className="sr-only">Actions</span>
          </Th>
        </Tr>
      </THead>
      <TBody>
        {invitations.map((inv) => (
          <Tr key={inv.id}>
            <Td className="break-all">
              {inv.email}
              <span className="block text-xs text-sable-600 sm:hidden">Open until {formatDate(inv.expiresAt, timezone)}</span>
            </Td>
            <Td>
              <Badge tone={inv.role === 'client' ? 'info' : 'neutral'}>{inv.clientId !== null ? 'Client portal' : ROLE_LABEL[inv.role]}</Badge>
            </Td>
            <Td className="hidden whitespace-nowrap sm:table-cell">{formatDate(inv.expiresAt, timezone)}</Td>
            <Td className="text-right">
              <Button
                variant="ghost"
                size="sm"
                loading={revoke.isPending && revoke.variables === inv.id}
                onClick={() => onRevoke(inv)}
                aria-label={`Revoke the invitation for ${inv.email}`}
              >
                Revoke
              </Button>
            </Td>
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
