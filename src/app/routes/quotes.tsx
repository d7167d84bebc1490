import { useStudioScope } from '../../lib/studio-scope';
import { MoneyTabs } from '../../features/money/components/money-tabs';
import { QuotesListRoute } from '../../features/quotes/routes/quotes-list';

export default function QuotesPage() {
  const { studioId, role } = useStudioScope();
  return (
    <>
      {role === 'owner' && <MoneyTabs studioId={studioId} />}
      <QuotesListRoute />
    </>
  );
}
