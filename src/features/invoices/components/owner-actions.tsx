import { useState, type FormEvent } from 'react';
import { Link } from 'react-router-dom';
import { formatMoney, fromMinor } from '../../../../shared/money';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField, TextArea, TextField } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { useIssueInvoice, useRecordPayment, useRefundInvoice, useVoidInvoice } from '../api/invoice-mutations';
import { manualPaymentMethods, type Invoice } from '../../../../shared/schemas/invoices';
import { methodLabels, todayIn } from './labels';
import { readAmount } from './money-input';

type Props = { studioId: number; invoice: Invoice; timezone: string };

function RecordPaymentDialog({ studioId, invoice, timezone, open, onClose }: Props & { open: boolean; onClose: () => void }) {
  const record = useRecordPayment(studioId, invoice.id);
  const toast = useToast();
  const [method, setMethod] = useState<(typeof manualPaymentMethods)[number]>('bank');
  const [amount, setAmount] = useState(() => fromMinor(invoice.balanceDue, invoice.currency));
  const [receivedOn, setReceivedOn] = useState(() => todayIn(timezone));
  const [reference, setReference] = useState('');
  const [amountError, setAmountError] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setFormError(null);
    const read = readAmount(amount, invoice.currency, { max: invoice.balanceDue });
    if ('error' in read) {
      setAmountError(read.error);
      return;
    }
    setAmountError(null);
    try {
      const updated = await record.mutateAsync({ method, amountMinor: read.minor, receivedAt: receivedOn, reference: reference.trim() || undefined });
      toast.show(updated.balanceDue === 0 ? 'Payment recorded — the invoice is paid.' : `Payment recorded. ${formatMoney(updated.balanceDue, updated.currency)} left to pay.`);
      onClose();
    } catch (err) {
      setFormError(err instanceof Error ? err.message : 'The payment was not recorded. Try again.');
    }
  }

  return (
    <Dialog open={open} onClose={onClose} title="Record a payment" description="For money that reached you outside the card checkout: a bank transfer, cash, or anything else.">
      <form onSubmit={submit} noValidate className="flex flex-col gap-4">
        {formError && <ErrorNote>{formError}</ErrorNote>}
        <SelectField label="How it was paid" value={method} onChange={(e) => setMethod(e.target.value as (typeof manualPaymentMethods)[number])}>
          {manualPaymentMethods.map((m) => (
            <option key={m} value={m}>
              {methodLabels[m]}
            </option>
          ))}
        </SelectField>
        <TextField
          label={`Amount (${invoice.currency})`}
          className="figures"
          inputMode="decimal"
          autoComplete="off"
          value={amount}
          onChange={(e) => setAmount(e.target.value)}
          hint={`${formatMoney(invoice.balanceDue, invoice.currency)} is left to pay. Less records a part payment.`}
          error={amountError ?? undefined}
        />
        <TextField label="Received on" type="date" value={receivedOn} max={todayIn(timezone)} onChange={(e) => setReceivedOn(e.target.value)} />
        <TextField label="Reference" optional autoComplete="off" hint="The bank’s reference, a receipt number…" value={reference} onChange={(e) => setReference(e.target.value)} />
        <div className="flex flex-wrap justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" loading={record.isPending}>
            Record payment
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

function RefundDialog({ studioId, invoice, open, onClose }: Props & { open: boolean; onClose: () => void }) {
  const refund = useRefundInvoice(studioId, invoice.id);
  const toast = useToast();
  // as it was when the dialog opened: after the refund the invoice shows nothing left to refund
  const [refundable] = useState(invoice.paid);
  const [whole, setWhole] = useState(true);
  const [amount, setAmount] = useState('');
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<{ amount?: string; reason?: string }>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [creditNote, setCreditNote] = useState<Invoice | null>(null);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setFormError(null);
    const next: typeof errors = {};
    let amountMinor: number | undefined;
    if (!whole) {
      const read = readAmount(amount, invoice.currency, { max: refundable });
      if ('error' in read) next.amount = read.error === 'That is more than is left on this invoice.' ? 'That is more than was paid and not yet refunded.' : read.error;
      else amountMinor = read.minor;
    }
    if (!reason.trim()) next.reason = 'Say why, for the credit note and your records.';
    setErrors(next);
    if (next.amount || next.reason) return;
    try {
      const res = await refund.mutateAsync({ amountMinor, reason: reason.trim() });
      toast.show(`Refund of ${formatMoney(res.creditNote.total < 0 ? -res.creditNote.total : res.creditNote.total, invoice.currency)} made.`);
      setCreditNote(res.creditNote);
    } catch (err) {
      setFormError(err instanceof Error ? err.message : 'The refund did not go through. Try again.');
    }
  }

  return (
    <Dialog
      open={open}
      onClose={onClose}
      title="Refund"
      description={`${formatMoney(refundable, invoice.currency)} was paid and not yet refunded. A credit note records the refund; card payments go back to the card.`}
    >
      {creditNote ? (
        <div className="flex flex-col gap-4">
          <p className="text-sm">
            Done. <Link to={`../${creditNote.id}`} relative="path" onClick={onClose}>Credit note {creditNote.number ?? ''}</Link> records the refund.
          </p>
          <div className="flex justify-end">
            <Button onClick={onClose}>Close</Button>
          </div>
        </div>
      ) : (
        <form onSubmit={submit} noValidate className="flex flex-col gap-4">
          {formError && <ErrorNote>{formError}</ErrorNote>}
          <fieldset className="flex flex-col gap-2">
            <legend className="mb-1 text-sm font-medium">How much</legend>
            <label className="flex items-center gap-2 text-sm">
              <input type="radio" name="refund-size" className="size-4 accent-verdigris-600" checked={whole} onChange={() => setWhole(true)} />
              <span className="figures">Everything paid: {formatMoney(refundable, invoice.currency)}</span>
            </label>
            <label className="flex items-center gap-2 text-sm">
              <input type="radio" name="refund-size" className="size-4 accent-verdigris-600" checked={!whole} onChange={() => setWhole(false)} />
              Part of it
            </label>
          </fieldset>
          {!whole && (
            <TextField
              label={`Refund amount (${invoice.currency})`}
              className="figures"
              inputMode="decimal"
              autoComplete="off"
              value={amount}
              onChange={(e) => setAmount(e.target.value)}
              error={errors.amount}
            />
          )}
          <TextArea label="Reason" rows={3} value={reason} onChange={(e) => setReason(e.target.value)} error={errors.reason} hint="Shown on the credit note." />
          <div className="flex flex-wrap justify-end gap-2">
            <Button variant="secondary" onClick={onClose}>
              Cancel
            </Button>
            <Button type="submit" variant="danger" loading={refund.isPending}>
              Refund
            </Button>
          </div>
        </form>
      )}
    </Dialog>
  );
}

function VoidDialog({ studioId, invoice, open, onClose }: Props & { open: boolean; onClose: () => void }) {
  const voidIt = useVoidInvoice(studioId, invoice.id);
  const toast = useToast();
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={`Void ${invoice.number ? `invoice ${invoice.number}` : 'this draft'}?`}
      description="A void invoice stays on record with its number, but nobody owes it any more. This cannot be undone."
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            Keep it
          </Button>
          <Button
            variant="danger"
            loading={voidIt.isPending}
            onClick={async () => {
              try {
                await voidIt.mutateAsync(undefined);
                toast.show('Invoice voided.');
                onClose();
              } catch (err) {
                toast.show(err instanceof Error ? err.message : 'The invoice was not voided.', 'error');
              }
            }}
          >
            Void invoice
          </Button>
        </>
      }
    />
  );
}

/** An open credit note (a revision below what was paid) is settled by paying the credit back. */
function PayOutDialog({ studioId, invoice, open, onClose }: Props & { open: boolean; onClose: () => void }) {
  const refund = useRefundInvoice(studioId, invoice.id);
  const toast = useToast();
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={`Pay out ${formatMoney(invoice.total, invoice.currency)}?`}
      description="The credit goes back to the client from the payments on the invoice it corrects; card payments go back to the card."
    >
      <form
        noValidate
        className="flex flex-col gap-4"
        onSubmit={async (e) => {
          e.preventDefault();
          if (!reason.trim()) {
            setError('Say why, for your records.');
            return;
          }
          try {
            await refund.mutateAsync({ reason: reason.trim() });
            toast.show('Credit paid out.');
            onClose();
          } catch (err) {
            setError(err instanceof Error ? err.message : 'The credit was not paid out.');
          }
        }}
      >
        <TextArea label="Reason" rows={3} value={reason} onChange={(e) => setReason(e.target.value)} error={error ?? undefined} />
        <div className="flex flex-wrap justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" variant="danger" loading={refund.isPending}>
            Pay out
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

/** Whether the owner can do anything with the invoice in its current status. */
export function hasOwnerActions(invoice: Invoice): boolean {
  const s = invoice.status;
  if (invoice.kind === 'credit_note') return s === 'draft' || s === 'open';
  return s === 'draft' || s === 'open' || s === 'partly_paid' || invoice.paid > 0;
}

/** What the owner can do with the invoice in its current status. */
export function OwnerInvoiceActions({ studioId, invoice, timezone }: Props) {
  const [open, setOpen] = useState<'pay' | 'refund' | 'void' | 'payout' | null>(null);
  const issue = useIssueInvoice(studioId, invoice.id);
  const toast = useToast();
  const close = () => setOpen(null);
  const s = invoice.status;
  const refundable = invoice.paid;
  return (
    <div className="flex flex-wrap gap-2">
      {s === 'draft' && (
        <Button
          loading={issue.isPending}
          onClick={async () => {
            try {
              const issued = await issue.mutateAsync(undefined);
              toast.show(`Invoice ${issued.number ?? ''} issued and sent to ${issued.client.name}.`);
            } catch (err) {
              toast.show(err instanceof Error ? err.message : 'The invoice was not issued.', 'error');
            }
          }}
        >
          Issue invoice
        </Button>
      )}
      {(s === 'open' || s === 'partly_paid') && invoice.kind !== 'credit_note' && <Button onClick={() => setOpen('pay')}>Record a payment</Button>}
      {s === 'open' && invoice.kind === 'credit_note' && <Button onClick={() => setOpen('payout')}>Pay the credit out</Button>}
      {refundable > 0 && invoice.kind !== 'credit_note' && (
        <Button variant="secondary" onClick={() => setOpen('refund')}>
          Refund
        </Button>
      )}
      {(s === 'draft' || s === 'open') && invoice.paid === 0 && (
        <Button variant="secondary" onClick={() => setOpen('void')}>
          Void
        </Button>
      )}
      {open === 'pay' && <RecordPaymentDialog studioId={studioId} invoice={invoice} timezone={timezone} open onClose={close} />}
      {open === 'refund' && <RefundDialog studioId={studioId} invoice={invoice} timezone={timezone} open onClose={close} />}
      {open === 'payout' && <PayOutDialog studioId={studioId} invoice={invoice} timezone={timezone} open onClose={close} />}
      {open === 'void' && <VoidDialog studioId={studioId} invoice={invoice} timezone={timezone} open onClose={close} />}
    </div>
  );
}
