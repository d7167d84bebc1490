import { useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { AuthShell } from '../../../components/layout/auth-shell';
import { ErrorNote } from '../../../components/ui/error-note';
import { useDocumentTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { formatDate } from '../../../lib/format';
import type { Role } from '../../../../shared/schemas/common';
import { useInvitation } from '../api/get-invitation';
import { ExistingAccountForm, NewAccountForm } from '../components/accept-invitation-form';

const ROLE_LINE: Record<Role, string> = {
  owner: 'as an owner: quotes, invoices, team and settings',
  painter: 'as a painter at the bench',
  client: 'as a client, to follow your commissions, approve and pay',
};

const GONE = 'This invitation has been used or has expired — ask the studio for a new one.';

export function AcceptInvitationRoute() {
  useDocumentTitle('Your invitation');
  const { token = '' } = useParams();
  const navigate = useNavigate();
  const toast = useToast();
  const invitation = useInvitation(token);
  const [gone, setGone] = useState(false);

  let body;
  if (invitation.isPending) {
    body = <LoadingBlock label="Opening your invitation…" />;
  } else if (gone || isApiError(invitation.error, 410)) {
    body = <ErrorNote title="Invitation no longer open">{GONE}</ErrorNote>;
  } else if (isApiError(invitation.error, 404)) {
    body = (
      <ErrorNote title="We do not know this invitation">
        Check that the whole link from the e-mail was copied, or ask the studio to send it again.
      </ErrorNote>
    );
  } else if (invitation.error) {
    body = (
      <ErrorNote title="The invitation did not load" action={<button type="button" className="underline" onClick={() => invitation.refetch()}>Try again</button>}>
        {invitation.error.message}
      </ErrorNote>
    );
  } else {
    const inv = invitation.data;
    const Form = inv.accountExists ? ExistingAccountForm : NewAccountForm;
    body = (
      <>
        <h1 className="mb-1 text-xl font-semibold">Join {inv.studioName}</h1>
        <p className="mb-1 text-sm">
          {inv.studioName} has invited you {ROLE_LINE[inv.role]}.
        </p>
        <p className="mb-6 text-xs text-sable-600">Open until {formatDate(inv.expiresAt)}.</p>
        <Form
          token={token}
          invitation={inv}
          onGone={() => setGone(true)}
          onAccepted={(result) => {
            toast.show(`Welcome to ${inv.studioName}.`);
            navigate(`/studio/${result.studioId}`, { replace: true });
          }}
        />
      </>
    );
  }

  return (
    <AuthShell
      aside={
        <p className="text-center text-sm text-sable-600">
          <Link to="/sign-in">Go to sign in</Link>
        </p>
      }
    >
      {body}
    </AuthShell>
  );
}
