import { useStudioScope } from '../../lib/studio-scope';
import { MoneyTabs } from '../../features/money/components/money-tabs';
import { PriceTableRoute } from '../../features/price-table/routes/price-table';

export default function PricesPage() {
  const { studioId } = useStudioScope();
  return (
    <>
      <MoneyTabs studioId={studioId} />
      <PriceTableRoute />
    </>
  );
}
