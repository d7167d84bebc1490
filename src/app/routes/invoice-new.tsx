import { useQuery } from '@tanstack/react-query';
import { useStudioScope } from '../../lib/studio-scope';
import { commissionsQueryOptions } from '../../features/commissions/api/get-commissions';
import { InvoiceNewRoute } from '../../features/invoices/routes/invoice-new';
import { priceTableQueryOptions } from '../../features/price-table/api/get-price-table';

/** A new invoice needs the studio's commissions to choose from and the price table's currency and tax. */
export default function InvoiceNewPage() {
  const { studioId } = useStudioScope();
  const commissions = useQuery(commissionsQueryOptions(studioId, { limit: 200 }));
  const prices = useQuery(priceTableQueryOptions(studioId));
  const t = prices.data;
  return (
    <InvoiceNewRoute
      commissions={commissions.data?.items.filter((c) => c.status !== 'cancelled' && c.status !== 'closed').map((c) => ({ id: c.id, title: c.title, clientName: c.client.name }))}
      defaults={t && { currency: t.currency, taxLabel: t.tax.label, rateBp: t.tax.rateBp, inclusive: t.tax.pricesIncludeTax }}
    />
  );
}
