import { useStudioScope } from '../../lib/studio-scope';
import { MoneyTabs } from '../../features/money/components/money-tabs';
import { MoneyOverviewRoute } from '../../features/money/routes/money-overview';

export default function MoneyPage() {
  const { studioId } = useStudioScope();
  return (
    <>
      <MoneyTabs studioId={studioId} />
      <MoneyOverviewRoute />
    </>
  );
}
