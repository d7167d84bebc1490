import { useMe } from '../../features/auth/api/get-me';
import { ClientHomeRoute, StudioHomeRoute } from '../../features/dashboard/routes/studio-home';
import { ClientInvoicesCard } from '../../features/invoices/components/client-invoices-card';
import { ClientQuotesCard } from '../../features/quotes/components/client-quotes-card';
import { useStudioScope } from '../../lib/studio-scope';

export default function StudioHomePage() {
  const { role } = useStudioScope();
  const name = useMe().data?.user.name ?? '';
  // The client's home lists their commissions with the date each should be ready (the forecast's).
  if (role !== 'client') return <StudioHomeRoute userName={name} />;
  return (
    <ClientHomeRoute
      userName={name}
      aside={
        <>
          <ClientQuotesCard />
          <ClientInvoicesCard />
        </>
      }
    />
  );
}
