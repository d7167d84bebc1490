import { useQuery } from '@tanstack/react-query';
import { useStudioScope } from '../../lib/studio-scope';
import { clientsQueryOptions } from '../../features/clients/api/get-clients';
import { InvoicesListRoute } from '../../features/invoices/routes/invoices-list';
import { MoneyTabs } from '../../features/money/components/money-tabs';

/** Owners filter the invoices by client, so the list gets the studio's clients. */
export default function InvoicesPage() {
  const { studioId, role } = useStudioScope();
  const owner = role === 'owner';
  const clients = useQuery({ ...clientsQueryOptions(studioId, { limit: 200 }), enabled: owner });
  return (
    <>
      {owner && <MoneyTabs studioId={studioId} />}
      <InvoicesListRoute clients={clients.data?.items.map((c) => ({ id: c.id, name: c.name }))} />
    </>
  );
}
