import { useMemo, useState, type FormEvent } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { ChevronLeft, Plus, Trash2 } from 'lucide-react';
import { formatMoney, toMinor } from '../../../../shared/money';
import { formatBasisPoints } from '../../../../shared/pricing';
import { invoiceTotals } from '../../../../shared/schemas/invoices';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField, TextArea, TextField } from '../../../components/ui/field';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { useStudioScope } from '../../../lib/studio-scope';
import { useCreateInvoice } from '../api/create-invoice';
import { todayIn } from '../components/labels';

export type CommissionOption = { id: number; title: string; clientName: string };
export type InvoiceTaxDefaults = { currency: string; taxLabel: string; rateBp: number; inclusive: boolean };

type LineDraft = { description: string; quantity: string; unit: string; tax: string };
const emptyLine: LineDraft = { description: '', quantity: '1', unit: '', tax: '' };

function parsePercent(text: string): number | null {
  const m = /^(\d+)(?:\.(\d{1,2}))?$/.exec(text.trim().replace(/\s*%$/, ''));
  if (!m) return null;
  const bp = Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
  return bp <= 10_000 ? bp : null;
}

/** A progress payment or any other invoice for a commission, saved as a draft to check before issuing. */
export function InvoiceNewRoute({ commissions, defaults }: { commissions: CommissionOption[] | undefined; defaults: InvoiceTaxDefaults | undefined }) {
  const { studioId, timezone } = useStudioScope();
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const toast = useToast();
  const create = useCreateInvoice(studioId);
  const [commissionId, setCommissionId] = useState(params.get('commission') ?? '');
  const [kind, setKind] = useState<'progress' | 'custom'>('progress');
  const [lines, setLines] = useState<LineDraft[]>([{ ...emptyLine }]);
  const [dueDate, setDueDate] = useState('');
  const [note, setNote] = useState('');
  const [submitted, setSubmitted] = useState(false);
  const [serverError, setServerError] = useState<string | null>(null);
  const [serverFields, setServerFields] = useState<Record<string, string>>({});

  const currency = defaults?.currency ?? 'EUR';
  const read = useMemo(() => {
    const errors: Record<string, string> = {};
    const out = lines.map((l, i) => {
      if (!l.description.trim()) errors[`lines.${i}.description`] = 'Describe the line.';
      const q = l.quantity.trim();
      if (!/^\d+$/.test(q) || Number(q) < 1 || Number(q) > 10_000) errors[`lines.${i}.quantity`] = 'Use a whole number from 1.';
      let unitMinor = 0;
      try {
        unitMinor = toMinor(l.unit, currency);
        if (unitMinor < 0) errors[`lines.${i}.unitMinor`] = 'Prices cannot be negative.';
      } catch (err) {
        errors[`lines.${i}.unitMinor`] = l.unit.trim() === '' ? 'Enter a price.' : err instanceof Error ? err.message : 'That is not an amount.';
      }
      let taxBp: number | undefined;
      if (l.tax.trim() !== '') {
        const bp = parsePercent(l.tax);
        if (bp === null) errors[`lines.${i}.taxBp`] = 'Enter a rate such as 19 or 7.5, or leave it empty.';
        else taxBp = bp;
      }
      return { description: l.description.trim(), quantity: Number(q) || 1, unitMinor, taxBp };
    });
    if (!commissionId) errors.commissionId = 'Choose the commission this invoice is for.';
    return { out, errors };
  }, [lines, currency, commissionId]);

  const totals = defaults ? invoiceTotals(read.out.map((l) => ({ ...l, taxBp: l.taxBp ?? defaults.rateBp })), defaults.inclusive) : null;
  const errors = submitted ? { ...serverFields, ...read.errors } : serverFields;

  async function submit(e: FormEvent) {
    e.preventDefault();
    setSubmitted(true);
    setServerError(null);
    setServerFields({});
    if (Object.keys(read.errors).length) return;
    try {
      const inv = await create.mutateAsync({
        commissionId: Number(commissionId),
        kind,
        lines: read.out,
        dueDate: dueDate || undefined,
        note: note.trim() || undefined,
      });
      toast.show('Draft saved. Check it, then issue it to the client.');
      navigate(`../${inv.id}`, { relative: 'path', replace: true });
    } catch (err) {
      if (isApiError(err) && Object.keys(err.fields).length) setServerFields(err.fields);
      setServerError(err instanceof Error ? err.message : 'The invoice was not saved.');
    }
  }

  if (!commissions || !defaults) return <LoadingBlock />;
  const setLine = (i: number, patch: Partial<LineDraft>) => setLines(lines.map((l, k) => (k === i ? { ...l, ...patch } : l)));

  return (
    <>
      <Link to=".." relative="path" className="mb-3 inline-flex items-center gap-1 text-sm">
        <ChevronLeft aria-hidden="true" className="size-4" />
        All invoices
      </Link>
      <PageTitle title="New invoice" description="Deposits and balances come from quotes by themselves. Use this for a progress payment or anything else." />
      <form onSubmit={submit} noValidate className="flex flex-col gap-6" aria-label="New invoice">
        {serverError && <ErrorNote title="The invoice was not saved">{serverError}</ErrorNote>}
        <Card>
          <div className="grid gap-4 sm:grid-cols-2">
            <SelectField label="Commission" value={commissionId} onChange={(e) => setCommissionId(e.target.value)} error={errors.commissionId}>
              <option value="">Choose a commission</option>
              {commissions.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.title} — {c.clientName}
                </option>
              ))}
            </SelectField>
            <SelectField label="Kind" value={kind} onChange={(e) => setKind(e.target.value as 'progress' | 'custom')}>
              <option value="progress">Progress payment</option>
              <option value="custom">Other invoice</option>
            </SelectField>
          </div>
        </Card>
        <Card title="Lines" description={`Prices in ${currency}, ${defaults.inclusive ? `including ${defaults.taxLabel}` : `before ${defaults.taxLabel}`}. Leave the rate empty for your usual ${formatBasisPoints(defaults.rateBp)}.`}>
          <ul className="flex flex-col gap-4">
            {lines.map((l, i) => (
              <li key={i} className="grid grid-cols-2 gap-3 border-b border-primer-300 pb-4 last:border-b-0 sm:grid-cols-12 sm:items-start">
                <TextField label="Description" className="col-span-2 sm:col-span-5" autoComplete="off" value={l.description} onChange={(e) => setLine(i, { description: e.target.value })} error={errors[`lines.${i}.description`]} />
                <TextField label="Qty" className="figures sm:col-span-1" inputMode="numeric" value={l.quantity} onChange={(e) => setLine(i, { quantity: e.target.value })} error={errors[`lines.${i}.quantity`]} />
                <TextField label={`Each (${currency})`} className="figures sm:col-span-2" inputMode="decimal" value={l.unit} onChange={(e) => setLine(i, { unit: e.target.value })} error={errors[`lines.${i}.unitMinor`]} />
                <TextField label={`${defaults.taxLabel} (%)`} optional className="figures sm:col-span-2" inputMode="decimal" value={l.tax} onChange={(e) => setLine(i, { tax: e.target.value })} error={errors[`lines.${i}.taxBp`]} />
                <div className="col-span-2 sm:col-span-2 sm:pt-6">
                  <Button variant="ghost" size="sm" disabled={lines.length === 1} onClick={() => setLines(lines.filter((_, k) => k !== i))} aria-label={`Remove line ${i + 1}`}>
                    <Trash2 aria-hidden="true" className="size-4" />
                    Remove
                  </Button>
                </div>
              </li>
            ))}
          </ul>
          <div className="mt-4 flex flex-wrap items-center justify-between gap-3">
            <Button variant="secondary" size="sm" onClick={() => setLines([...lines, { ...emptyLine }])}>
              <Plus aria-hidden="true" className="size-4" />
              Add a line
            </Button>
            {totals && (
              <p className="figures text-sm" aria-live="polite">
                {defaults.taxLabel} {formatMoney(totals.tax, currency)} · Total <span className="font-semibold">{formatMoney(totals.total, currency)}</span>
              </p>
            )}
          </div>
        </Card>
        <Card>
          <div className="grid gap-4 sm:grid-cols-2">
            <TextField label="Due on" type="date" optional min={todayIn(timezone)} value={dueDate} onChange={(e) => setDueDate(e.target.value)} hint="Empty: the usual term from the day you issue it." error={errors.dueDate} />
            <TextArea label="Note for the client" optional rows={3} value={note} onChange={(e) => setNote(e.target.value)} error={errors.note} />
          </div>
        </Card>
        <div>
          <Button type="submit" loading={create.isPending}>
            Save as draft
          </Button>
        </div>
      </form>
    </>
  );
}
