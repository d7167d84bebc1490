import { Card } from '../../../components/ui/card';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useStudioScope } from '../../../lib/studio-scope';
import { useInvitations } from '../api/get-invitations';
import { useMembers } from '../api/get-members';
import { InviteMemberForm } from '../components/invite-member-form';
import { MembersTable } from '../components/members-table';
import { PendingInvitations } from '../components/pending-invitations';

export function TeamRoute({ devMail = false }: { devMail?: boolean }) {
  const { studioId, userId, timezone } = useStudioScope();
  const members = useMembers(studioId);
  const invitations = useInvitations(studioId);

  return (
    <>
      <PageTitle title="Team" description="Who works in the studio, and who has been invited." />
      <div className="flex flex-col gap-6">
        <Card title="People">
          {members.isPending ? (
            <LoadingBlock />
          ) : members.error ? (
            <ErrorNote title="The team did not load">{members.error.message}</ErrorNote>
          ) : (
            <MembersTable studioId={studioId} members={members.data.filter((m) => m.role !== 'client')} myUserId={userId} timezone={timezone} />
          )}
        </Card>
        <Card title="Invite someone" description="They get an e-mail with a link to join.">
          <InviteMemberForm studioId={studioId} devMail={devMail} />
        </Card>
        <Card title="Open invitations">
          {invitations.isPending ? (
            <LoadingBlock />
          ) : invitations.error ? (
            <ErrorNote title="The invitations did not load">{invitations.error.message}</ErrorNote>
          ) : (
            <PendingInvitations studioId={studioId} invitations={invitations.data} timezone={timezone} />
          )}
        </Card>
      </div>
    </>
  );
}
