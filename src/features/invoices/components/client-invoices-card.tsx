import { Link } from 'react-router-dom';
import { formatMoney } from '../../../../shared/money';
import { Card } from '../../../components/ui/card';
import { useStudioScope } from '../../../lib/studio-scope';
import { useInvoices } from '../api/get-invoices';
import { invoiceTitle, InvoiceStatusBadge } from './labels';

/** For the client's home: invoices with something left to pay, and the way to all of them. */
export function ClientInvoicesCard() {
  const { studioId } = useStudioScope();
  const open = useInvoices(studioId, { status: 'open', limit: 10 });
  const partly = useInvoices(studioId, { status: 'partly_paid', limit: 10 });
  const items = [...(open.data?.items ?? []), ...(partly.data?.items ?? [])].filter((i) => i.kind !== 'credit_note' && i.balanceDue > 0);
  const base = `/studio/${studioId}/invoices`;
  return (
    <Card title="Invoices" actions={<Link to={base}>All your invoices</Link>}>
      {items.length === 0 ? (
        <p className="text-sm text-sable-600">Nothing to pay right now.</p>
      ) : (
        <ul className="flex flex-col gap-2 text-sm">
          {items.map((i) => (
            <li key={i.id} className="flex flex-wrap items-center justify-between gap-2">
              <Link to={`${base}/${i.id}`} className="font-medium">
                {invoiceTitle(i)}
              </Link>
              <span className="flex items-center gap-2">
                <span className="figures">{formatMoney(i.balanceDue, i.currency)} to pay</span>
                <InvoiceStatusBadge status={i.status} overdue={i.overdue} />
              </span>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
