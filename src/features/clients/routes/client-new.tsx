import { Link, useNavigate } from 'react-router-dom';
import { ChevronLeft } from 'lucide-react';
import { Card } from '../../../components/ui/card';
import { PageTitle } from '../../../components/ui/page-title';
import { useToast } from '../../../components/ui/toast';
import { useStudioScope } from '../../../lib/studio-scope';
import { useCreateClient } from '../api/create-client';
import { ClientForm } from '../components/client-form';

export function ClientNewRoute() {
  const { studioId } = useStudioScope();
  const create = useCreateClient(studioId);
  const navigate = useNavigate();
  const toast = useToast();

  return (
    <>
      <BackToClients />
      <PageTitle title="Add a client" description="Only the name is needed now; the rest can follow." />
      <Card>
        <ClientForm
          submitLabel="Add client"
          pending={create.isPending}
          onCancel={() => navigate('..', { relative: 'path' })}
          onSave={async (body) => {
            const client = await create.mutateAsync(body);
            toast.show(`${client.name} added.`);
            navigate(`../${client.id}`, { relative: 'path', replace: true });
          }}
        />
      </Card>
    </>
  );
}

export function BackToClients() {
  return (
    <Link to=".." relative="path" className="mb-3 inline-flex items-center gap-1 text-sm">
      <ChevronLeft aria-hidden="true" className="size-4" />
      All clients
    </Link>
  );
}
