import { useQuery } from '@tanstack/react-query';
import { clientsQueryOptions } from '../../features/clients/api/get-clients';
import { CommissionNewRoute } from '../../features/commissions/routes/commission-new';
import { membersQueryOptions } from '../../features/studios/api/get-members';
import { useStudioScope } from '../../lib/studio-scope';

/** Owner only: the client picker (without erased placeholders: no new work for them) and the painters come from their own features. */
export default function CommissionNewPage() {
  const { studioId } = useStudioScope();
  const clients = useQuery(clientsQueryOptions(studioId, { limit: 200, erased: 'hidden' }));
  const members = useQuery(membersQueryOptions(studioId));
  return (
    <CommissionNewRoute
      clients={(clients.data?.items ?? []).map((c) => ({ id: c.id, name: c.name }))}
      painters={(members.data ?? []).filter((m) => m.role !== 'client').map((m) => ({ id: m.userId, name: m.name }))}
    />
  );
}
