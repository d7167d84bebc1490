import { useStudioScope } from '../../lib/studio-scope';
import { MoneyTabs } from '../../features/money/components/money-tabs';
import { ReportsRoute } from '../../features/reports/routes/reports';

export default function ReportsPage() {
  const { studioId } = useStudioScope();
  return (
    <>
      <MoneyTabs studioId={studioId} />
      <ReportsRoute />
    </>
  );
}
