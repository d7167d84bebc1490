import type { Client } from '../../../../shared/schemas/clients';
import { Button } from '../../../components/ui/button';
import { useToast } from '../../../components/ui/toast';
import { formatDate } from '../../../lib/format';
import { useInviteClient } from '../api/invite-client';

/** Why the portal invitation cannot be sent yet, or null when it can. */
export function portalInviteBlocker(client: Client): string | null {
  if (client.hasAccount) return `${client.name} already has a portal account and can sign in.`;
  if (!client.email) return 'Add an e-mail address first, so the invitation has somewhere to go.';
  return null;
}

export function PortalInvite({ studioId, client, timezone }: { studioId: number; client: Client; timezone: string }) {
  const invite = useInviteClient(studioId, client.id);
  const toast = useToast();
  const blocker = portalInviteBlocker(client);
  const reasonId = `portal-reason-${client.id}`;

  async function send() {
    try {
      await invite.mutateAsync();
      toast.show(`Invitation sent to ${client.email}.`);
    } catch (err) {
      toast.show(err instanceof Error ? err.message : 'The invitation did not go out. Try again.', 'error');
    }
  }

  return (
    <div className="flex flex-col gap-2">
      <p className="text-sm text-sable-600">
        In the portal a client follows their commissions, approves the scheme and pays — without chasing you for updates.
      </p>
      <div className="flex flex-wrap items-center gap-3">
        <Button variant="secondary" onClick={send} loading={invite.isPending} disabled={blocker !== null} aria-describedby={reasonId}>
          {client.invitedAt && !client.hasAccount ? 'Send the invitation again' : 'Invite to portal'}
        </Button>
        <p id={reasonId} className="text-sm text-sable-600">
          {blocker ?? (client.invitedAt ? `Last invited ${formatDate(client.invitedAt, timezone)}.` : `The link goes to ${client.email}.`)}
        </p>
      </div>
    </div>
  );
}
