import { useEffect, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import { CircleCheck, Hourglass } from 'lucide-react';
import { formatMoney } from '../../../../shared/money';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { Spinner } from '../../../components/ui/spinner';
import { useStudioScope } from '../../../lib/studio-scope';
import { invoiceQueryOptions } from '../api/get-invoice';
import { invoiceTitle } from '../components/labels';

// The payment service tells us about the payment on its own channel (a signed event), a moment after
// it sends the payer back here; until then the invoice still shows as open, so ask again for a while.
const FAST_MS = 2_000;
const SLOW_MS = 10_000;
const PATIENCE_MS = 30_000;
const GIVE_UP_MS = 5 * 60_000;

export function InvoicePaidRoute() {
  const { studioId, role } = useStudioScope();
  const params = useParams();
  const invoiceId = Number(params.invoiceId);
  const [startedAt, setStartedAt] = useState(() => Date.now());
  const [now, setNow] = useState(() => Date.now());
  const waited = now - startedAt;

  useEffect(() => {
    const t = window.setInterval(() => setNow(Date.now()), 1_000);
    return () => window.clearInterval(t);
  }, []);

  const invoice = useQuery({
    ...invoiceQueryOptions(studioId, invoiceId),
    enabled: Number.isInteger(invoiceId) && invoiceId > 0,
    refetchInterval: (q) => {
      const s = q.state.data?.status;
      if (s === 'paid' || s === 'refunded' || s === 'void') return false;
      if (waited > GIVE_UP_MS) return false;
      return waited > PATIENCE_MS ? SLOW_MS : FAST_MS;
    },
  });

  const inv = invoice.data;
  const paid = inv?.status === 'paid';
  const title = paid ? 'Payment received — thank you' : waited > PATIENCE_MS ? 'Still waiting for the payment service…' : 'Confirming your payment…';

  return (
    <>
      <PageTitle title={title} />
      <div className="flex flex-col gap-6" aria-live="polite">
        {invoice.error && !inv ? (
          <ErrorNote title="We could not look up the invoice">{invoice.error.message}</ErrorNote>
        ) : paid && inv ? (
          <Card>
            <div className="flex gap-3">
              <CircleCheck aria-hidden="true" className="mt-0.5 size-6 shrink-0 text-verdigris-600" />
              <div className="flex flex-col gap-2">
                <p>
                  <span className="figures font-semibold">{formatMoney(inv.paid, inv.currency)}</span> reached us for {invoiceTitle(inv).toLowerCase()}.
                  {inv.kind === 'deposit' && ' Your commission is booked and joins the queue.'}
                </p>
                <p className="text-sm text-sable-600">A receipt is on its way by e-mail.</p>
                <p className="flex flex-wrap gap-x-4 gap-y-1">
                  <Link to=".." relative="path">
                    See the invoice
                  </Link>
                  {role === 'client' && (
                    <Link to="../../.." relative="path">
                      Back to your commissions
                    </Link>
                  )}
                </p>
              </div>
            </div>
          </Card>
        ) : (
          <Card>
            <div className="flex gap-3">
              {waited > PATIENCE_MS ? <Hourglass aria-hidden="true" className="mt-0.5 size-6 shrink-0 text-sable-600" /> : <Spinner label="Checking the payment…" className="mt-1" />}
              <div className="flex flex-col gap-2">
                {waited > PATIENCE_MS ? (
                  <>
                    <p>The payment service has not confirmed the payment to us yet. That usually takes seconds, now and then a few minutes.</p>
                    <p className="text-sm text-sable-600">
                      You can leave this page: you will get a receipt by e-mail once it is through, and the invoice will show as paid. If your card was
                      charged and the invoice still shows as open tomorrow, {role === 'client' ? 'write to the studio' : 'check the payment service'}.
                    </p>
                    <div className="flex flex-wrap gap-2">
                      <Button
                        variant="secondary"
                        onClick={() => {
                          setStartedAt(Date.now());
                          void invoice.refetch();
                        }}
                      >
                        Check again
                      </Button>
                      <Link to=".." relative="path" className="inline-flex min-h-10 items-center text-sm">
                        Back to the invoice
                      </Link>
                    </div>
                  </>
                ) : (
                  <p>Thank you. We are waiting for the payment service to confirm the payment — this page updates by itself.</p>
                )}
              </div>
            </div>
          </Card>
        )}
      </div>
    </>
  );
}
