import { useQuery } from '@tanstack/react-query';
import { useStudioScope } from '../../lib/studio-scope';
import { DepositInvoiceCard } from '../../features/invoices/components/commission-invoices-card';
import { priceTableQueryOptions } from '../../features/price-table/api/get-price-table';
import { QuoteDetailRoute } from '../../features/quotes/routes/quote-detail';

/** The owner's draft editor prices with the studio's table; an accepted quote leads on to its deposit invoice. */
export default function QuoteDetailPage() {
  const { studioId, role } = useStudioScope();
  const prices = useQuery({ ...priceTableQueryOptions(studioId), enabled: role === 'owner' });
  return (
    <QuoteDetailRoute
      priceTable={prices.data}
      priceTableError={prices.error}
      afterAccept={(quote) => <DepositInvoiceCard commissionId={quote.commissionId} invoicesPath="../../invoices" />}
    />
  );
}
