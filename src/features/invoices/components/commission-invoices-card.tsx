import { Link } from 'react-router-dom';
import { formatMoney } from '../../../../shared/money';
import { Card } from '../../../components/ui/card';
import { useStudioScope } from '../../../lib/studio-scope';
import { useInvoices } from '../api/get-invoices';
import { invoiceTitle, InvoiceStatusBadge } from './labels';
import { canPay, PayButton } from './pay-button';

/**
 * The deposit invoice of a commission, right where the client accepted the quote: with the Pay
 * button while it is open. `invoicesPath` is the invoices list, relative to the current URL.
 */
export function DepositInvoiceCard({ commissionId, invoicesPath }: { commissionId: number; invoicesPath: string }) {
  const { studioId, role } = useStudioScope();
  const invoices = useInvoices(studioId, { commissionId, kind: 'deposit', limit: 10 });
  const items = invoices.data?.items ?? [];
  // The newest deposit invoice is the one that counts (a later version may add a difference invoice).
  const inv = [...items].sort((a, b) => b.id - a.id).find((i) => i.status !== 'void');
  if (!inv) return null;
  const owner = role === 'owner';
  return (
    <Card title={canPay(inv) && !owner ? 'Next: pay the deposit' : 'Deposit'}>
      <div className="flex flex-col gap-3">
        <p className="flex flex-wrap items-center gap-2 text-sm">
          <Link to={`${invoicesPath}/${inv.id}`} relative="path" className="font-medium">
            {invoiceTitle(inv)}
          </Link>
          <span className="figures">{formatMoney(inv.total, inv.currency)}</span>
          <InvoiceStatusBadge status={inv.status} overdue={inv.overdue} />
        </p>
        {!owner && canPay(inv) && (
          <>
            <p className="text-sm text-sable-600">Your commission joins the studio’s queue as soon as the deposit is paid.</p>
            <PayButton studioId={studioId} invoice={inv} />
          </>
        )}
      </div>
    </Card>
  );
}
