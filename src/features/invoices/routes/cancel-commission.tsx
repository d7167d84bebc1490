import { useState, type FormEvent } from 'react';
import { Link, useParams } from 'react-router-dom';
import { ChevronLeft } from 'lucide-react';
import { formatMoney } from '../../../../shared/money';
import { formatHours } from '../../../../shared/pricing';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { TextArea } from '../../../components/ui/field';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useStudioScope } from '../../../lib/studio-scope';
import { useCancelCommission, useCancellation, type CancelResult } from '../api/cancellation';
import { invoiceTitle } from '../components/labels';

function Row({ label, value, strong = false }: { label: string; value: string; strong?: boolean }) {
  return (
    <div className={strong ? 'flex justify-between gap-4 border-t border-primer-300 pt-2 font-semibold' : 'flex justify-between gap-4'}>
      <dt>{label}</dt>
      <dd className="figures text-right">{value}</dd>
    </div>
  );
}

/**
 * /commissions/:commissionId/cancel — the owner sees what the studio's terms keep and refund for
 * the work done so far, and only then confirms. `title` names the commission when the caller knows it.
 */
export function CancelCommissionRoute({ title }: { title?: string }) {
  const { studioId } = useStudioScope();
  const commissionId = Number(useParams().commissionId);
  const valid = Number.isInteger(commissionId) && commissionId > 0;
  const [done, setDone] = useState<CancelResult | null>(null);
  const preview = useCancellation(studioId, commissionId, { enabled: valid && !done });
  const cancel = useCancelCommission(studioId, commissionId);
  const [reason, setReason] = useState('');
  const [reasonError, setReasonError] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);

  async function submit(e: FormEvent) {
    e.preventDefault();
    if (!reason.trim()) {
      setReasonError('Give a reason for cancelling; the client sees it.');
      return;
    }
    setReasonError(null);
    setFormError(null);
    try {
      setDone(await cancel.mutateAsync(reason.trim()));
    } catch (err) {
      setFormError(err instanceof Error ? err.message : 'The commission was not cancelled.');
    }
  }

  const back = (
    <Link to=".." relative="path" className="mb-3 inline-flex items-center gap-1 text-sm">
      <ChevronLeft aria-hidden="true" className="size-4" />
      Back to the commission
    </Link>
  );

  if (done) {
    const p = done.preview;
    const m = (minor: number) => formatMoney(minor, p.currency);
    return (
      <>
        {back}
        <PageTitle title="Commission cancelled" description={title} />
        <Card>
          <div className="flex flex-col gap-3 text-sm">
            <p>
              {p.refundMinor === 0
                ? 'Nothing is refunded.'
                : p.cardRefundMinor === p.refundMinor
                  ? `${m(p.refundMinor)} goes back to the client’s card.`
                  : `${m(p.refundMinor)} goes back to the client${p.cardRefundMinor > 0 ? `, ${m(p.cardRefundMinor)} of it to their card` : ''}.`}
            </p>
            {p.refundMinor - p.cardRefundMinor > 0 && (
              <p>
                Pay the other <span className="figures font-semibold">{m(p.refundMinor - p.cardRefundMinor)}</span> back yourself, the way it came (bank transfer or cash).
              </p>
            )}
            {done.creditNotes.length > 0 && (
              <ul className="flex flex-col gap-1">
                {done.creditNotes.map((cn) => (
                  <li key={cn.id}>
                    <Link to={`../../../invoices/${cn.id}`} relative="path">
                      {invoiceTitle(cn)}
                    </Link>{' '}
                    <span className="figures">{m(cn.total)}</span>
                  </li>
                ))}
              </ul>
            )}
          </div>
        </Card>
      </>
    );
  }

  return (
    <>
      {back}
      <PageTitle title="Cancel the commission" description={title} />
      {!valid ? (
        <ErrorNote>That link does not point to a commission.</ErrorNote>
      ) : preview.isPending ? (
        <LoadingBlock label="Working out the refund…" />
      ) : preview.error ? (
        <ErrorNote title="The refund could not be worked out">{preview.error.message}</ErrorNote>
      ) : (
        <div className="flex flex-col gap-6">
          <Card title="What your terms give">
            <div className="flex flex-col gap-4">
              <p className="max-w-prose text-sm">{preview.data.explanation}</p>
              <dl className="flex max-w-sm flex-col gap-1 text-sm">
                <Row label="Deposit received" value={formatMoney(preview.data.depositPaid, preview.data.currency)} />
                <Row label={`Work done (${formatHours(preview.data.workDoneMinutes)})`} value={formatMoney(preview.data.workDoneMinor, preview.data.currency)} />
                <Row label="The studio keeps" value={formatMoney(preview.data.keptMinor, preview.data.currency)} />
                <Row label="Refund to the client" value={formatMoney(preview.data.refundMinor, preview.data.currency)} strong />
                {preview.data.cardRefundMinor > 0 && <Row label="of which back to their card" value={formatMoney(preview.data.cardRefundMinor, preview.data.currency)} />}
              </dl>
              {preview.data.voidsInvoiceIds.length > 0 && (
                <Note>
                  {preview.data.voidsInvoiceIds.length === 1 ? 'One unpaid invoice is' : `${preview.data.voidsInvoiceIds.length} unpaid invoices are`} voided.
                </Note>
              )}
            </div>
          </Card>
          <Card title="Confirm">
            <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label="Cancel the commission">
              {formError && <ErrorNote>{formError}</ErrorNote>}
              <TextArea label="Reason" rows={3} value={reason} onChange={(e) => setReason(e.target.value)} error={reasonError ?? undefined} hint="Kept with the commission and shown to the client." />
              <div className="flex flex-wrap gap-2">
                <Button type="submit" variant="danger" loading={cancel.isPending}>
                  {preview.data.refundMinor > 0 ? `Cancel and refund ${formatMoney(preview.data.refundMinor, preview.data.currency)}` : 'Cancel the commission'}
                </Button>
                <Link to=".." relative="path" className="inline-flex min-h-10 items-center px-2 text-sm">
                  Keep the commission
                </Link>
              </div>
              <p className="text-xs text-sable-600">This cannot be undone.</p>
            </form>
          </Card>
        </div>
      )}
    </>
  );
}
