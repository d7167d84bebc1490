import { useState } from 'react';
import type { Member } from '../../../../shared/schemas/studios';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote } from '../../../components/ui/error-note';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { useToast } from '../../../components/ui/toast';
import { formatDate } from '../../../lib/format';
import { useRemoveMember } from '../api/remove-member';
import { ROLE_LABEL } from './role-label';

export function MembersTable({ studioId, members, myUserId, timezone }: { studioId: number; members: Member[]; myUserId: number; timezone: string }) {
  const remove = useRemoveMember(studioId);
  const toast = useToast();
  const [leaving, setLeaving] = useState<Member | null>(null);
  const [error, setError] = useState<string | null>(null);

  function close() {
    setLeaving(null);
    setError(null);
  }

  async function confirmRemove() {
    if (!leaving) return;
    setError(null);
    try {
      await remove.mutateAsync(leaving.userId);
      toast.show(`${leaving.name} no longer has access to the studio.`);
      close();
    } catch (err) {
      setError(err instanceof Error ? err.message : 'That did not work. Try again.');
    }
  }

  return (
    <>
      <Table caption="People with access to the studio" captionHidden>
        <THead>
          <Tr>
            <Th>Name</Th>
            <Th className="hidden sm:table-cell">E-mail</Th>
            <Th>Role</Th>
            <Th className="hidden sm:table-cell">Joined</Th>
            <Th>
              <span className="sr-only">Actions</span>
            </Th>
          </Tr>
        </THead>
        <TBody>
          {members.map((m) => (
            <Tr key={m.userId}>
              <Td>
                <span className="font-medium">{m.name}</span>
                {m.userId === myUserId && <span className="text-sable-600"> (you)</span>}
                <span className="block text-xs break-all text-sable-600 sm:hidden">{m.email}</span>
              </Td>
              <Td className="hidden break-all sm:table-cell">{m.email}</Td>
              <Td>
                <Badge tone={m.role === 'owner' ? 'success' : m.role === 'client' ? 'info' : 'neutral'}>{ROLE_LABEL[m.role]}</Badge>
              </Td>
              <Td className="hidden whitespace-nowrap sm:table-cell">{formatDate(m.joinedAt, timezone)}</Td>
              <Td className="text-right">
                {m.userId !== myUserId && (
                  <Button variant="ghost" size="sm" onClick={() => setLeaving(m)} aria-label={`Remove ${m.name}`}>
                    Remove
                  </Button>
                )}
              </Td>
            </Tr>
          ))}
        </TBody>
      </Table>
      <Dialog
        open={leaving !== null}
        onClose={close}
        title={leaving ? `Remove ${leaving.name}?` : ''}
        description="They lose access to this studio straight away. Their past work stays on the records."
        footer={
          <>
            <Button variant="secondary" onClick={close}>
              Keep them
            </Button>
            <Button variant="danger" loading={remove.isPending} onClick={confirmRemove}>
              Remove
            </Button>
          </>
        }
      >
        {error && <ErrorNote>{error}</ErrorNote>}
      </Dialog>
    </>
  );
}
