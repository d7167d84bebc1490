import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { ChevronLeft } from 'lucide-react';
import { Card } from '../../../components/ui/card';
import { PageTitle } from '../../../components/ui/page-title';
import { useToast } from '../../../components/ui/toast';
import { useStudioScope } from '../../../lib/studio-scope';
import { useCreateCommission } from '../api/create-commission';
import { useLists } from '../api/get-lists';
import { CommissionForm } from '../components/commission-form';
import type { PersonOption } from '../components/figure-fields';

/** Clients and painters come from the app layer, which owns those features. */
export function CommissionNewRoute({ clients, painters }: { clients: PersonOption[]; painters: PersonOption[] }) {
  const { studioId } = useStudioScope();
  const lists = useLists(studioId);
  const create = useCreateCommission(studioId);
  const navigate = useNavigate();
  const toast = useToast();
  const [params] = useSearchParams();
  const clientId = Number(params.get('clientId')) || undefined;
  return (
    <>
      <BackToCommissions />
      <PageTitle title="New commission" description="The client’s order and its figures. You can add figures later too." />
      <Card>
        <CommissionForm
          clients={clients}
          painters={painters}
          lists={lists.data}
          defaultClientId={clientId}
          pending={create.isPending}
          onCancel={() => navigate('..', { relative: 'path' })}
          onSave={async (body) => {
            const c = await create.mutateAsync(body);
            toast.show(`“${c.title}” recorded as an enquiry.`);
            navigate(`../${c.id}`, { relative: 'path', replace: true });
          }}
        />
      </Card>
    </>
  );
}

export function BackToCommissions() {
  return (
    <Link to=".." relative="path" className="mb-3 inline-flex items-center gap-1 text-sm">
      <ChevronLeft aria-hidden="true" className="size-4" />
      All commissions
    </Link>
  );
}
