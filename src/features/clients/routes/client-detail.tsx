import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { Card } from '../../../components/ui/card';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle, useDocumentTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { Badge } from '../../../components/ui/badge';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { formatDate } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { clientQueryOptions } from '../api/get-client';
import { clientPrivacyQueryOptions } from '../api/get-client-privacy';
import { useUpdateClient } from '../api/update-client';
import { ClientDetails } from '../components/client-details';
import { ClientForm } from '../components/client-form';
import { ClientPrivacyPanel } from '../components/client-privacy';
import { PortalInvite } from '../components/portal-invite';
import { BackToClients } from './client-new';

export function ClientDetailRoute() {
  const { studioId, role, timezone } = useStudioScope();
  const params = useParams();
  const clientId = Number(params.clientId);
  const valid = Number.isInteger(clientId) && clientId > 0;
  const client = useQuery({ ...clientQueryOptions(studioId, clientId), enabled: valid });
  const update = useUpdateClient(studioId, clientId);
  // An erased client is a placeholder kept for its invoices: nothing to edit or invite any more.
  const privacy = useQuery({ ...clientPrivacyQueryOptions(studioId, clientId), enabled: valid && role === 'owner' });
  const erased = Boolean(privacy.data?.erasedAt);
  const toast = useToast();
  useDocumentTitle(client.data?.name ?? 'Client');

  if (!valid || isApiError(client.error, 404)) {
    return (
      <>
        <BackToClients />
        <PageTitle title="Client not found" />
        <ErrorNote>We could not find this client in the studio. They may have been removed, or the link is wrong.</ErrorNote>
      </>
    );
  }
  if (client.isPending) return <LoadingBlock label="Loading client…" />;
  if (client.error) {
    return (
      <>
        <BackToClients />
        <ErrorNote title="This client did not load">{client.error.message}</ErrorNote>
      </>
    );
  }

  const c = client.data;
  const canEdit = role === 'owner' && !erased;

  return (
    <>
      <BackToClients />
      <PageTitle
        title={c.name}
        description={
          <span className="inline-flex flex-wrap items-center gap-2">
            <span>Client since {formatDate(c.createdAt, timezone)}</span>
            {c.hasAccount && <Badge tone="info">In the portal</Badge>}
            {erased && <Badge>Erased</Badge>}
          </span>
        }
      />
      <div className="flex flex-col gap-6">
        {canEdit && (
          <Card title="Client portal">
            <PortalInvite studioId={studioId} client={c} timezone={timezone} />
          </Card>
        )}
        <Card title={canEdit ? 'Details' : 'Contact and address'}>
          {canEdit ? (
            <ClientForm
              key={c.id}
              client={c}
              submitLabel="Save changes"
              pending={update.isPending}
              onSave={async (body) => {
                await update.mutateAsync(body);
                toast.show('Client saved.');
              }}
            />
          ) : (
            <ClientDetails client={c} />
          )}
        </Card>
        {role === 'owner' && (
          <Card title="Privacy">
            <ClientPrivacyPanel studioId={studioId} client={c} timezone={timezone} />
          </Card>
        )}
      </div>
    </>
  );
}
