import { CreditCard } from 'lucide-react';
import { formatMoney } from '../../../../shared/money';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { useStartCheckout } from '../api/start-checkout';
import type { Invoice } from '../../../../shared/schemas/invoices';

export function canPay(inv: Invoice): boolean {
  return (inv.status === 'open' || inv.status === 'partly_paid') && inv.balanceDue > 0;
}

/** Goes to the payment service's checkout page for what is left to pay; it brings the client back to the return page. */
export function PayButton({ studioId, invoice }: { studioId: number; invoice: Invoice }) {
  const checkout = useStartCheckout(studioId, invoice.id);
  // After a successful answer the browser is on its way to the checkout page: keep the button busy.
  const busy = checkout.isPending || checkout.isSuccess;
  return (
    <div className="flex flex-col gap-2">
      <div>
        <Button onClick={() => checkout.mutate()} loading={busy}>
          <CreditCard aria-hidden="true" className="size-4" />
          Pay {formatMoney(invoice.balanceDue, invoice.currency)}
        </Button>
      </div>
      <p className="text-xs text-sable-600">You pay by card on the payment service’s secure page and come straight back here.</p>
      {checkout.error && <ErrorNote title="The payment page did not open">{checkout.error.message}</ErrorNote>}
    </div>
  );
}
