import { useState, type FormEvent } from 'react';
import { Link } from 'react-router-dom';
import type { BooksSettings, EarningsReport } from '../../../../shared/schemas/reports';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextField } from '../../../components/ui/field';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { useToast } from '../../../components/ui/toast';
import { currencyDigits, formatMoney } from '../../../lib/format';
import { useSaveBooksSettings } from '../api/save-books-settings';
import { hoursText } from './months';
import { RevenueChart, monthLabel } from '../../../components/charts/revenue-chart';

/** Commissions whose rate is still moving: deposits in, most of the hours not yet logged. */
const IN_PROGRESS = ['quoted', 'booked', 'on_bench', 'on_hold'];

function Stat({ label, value, hint }: { label: string; value: string; hint?: string }) {
  return (
    <div className="rounded-control border border-primer-300 bg-white px-3 py-2">
      <dt className="text-xs text-sable-600">{label}</dt>
      <dd className="figures text-lg font-semibold">{value}</dd>
      {hint && <dd className="text-xs text-sable-600">{hint}</dd>}
    </div>
  );
}

function FeesForm({ studioId, settings, currency }: { studioId: number; settings: BooksSettings; currency: string }) {
  const digits = currencyDigits(currency);
  const [pct, setPct] = useState(String(settings.cardFeeBp / 100));
  const [fixed, setFixed] = useState((settings.cardFeeFixedMinor / 10 ** digits).toFixed(digits));
  const [errors, setErrors] = useState<{ pct?: string; fixed?: string }>({});
  const save = useSaveBooksSettings(studioId);
  const toast = useToast();

  function submit(e: FormEvent) {
    e.preventDefault();
    const p = Number(pct.replace(',', '.'));
    const f = Number(fixed.replace(',', '.'));
    const next: typeof errors = {};
    if (!Number.isFinite(p) || p < 0 || p > 20) next.pct = 'Enter a percentage from 0 to 20, such as 1.5.';
    if (!Number.isFinite(f) || f < 0) next.fixed = `Enter an amount in ${currency}, such as 0.25.`;
    setErrors(next);
    if (next.pct || next.fixed) return;
    save.mutate({ cardFeeBp: Math.round(p * 100), cardFeeFixedMinor: Math.round(f * 10 ** digits) }, { onSuccess: () => toast.show('Card fees saved; the net figures are worked out again.') });
  }

  return (
    <form onSubmit={submit} className="flex flex-wrap items-end gap-3" noValidate aria-label="Card fees">
      <TextField id="fee-pct" label="Card fee, percent of each payment" inputMode="decimal" value={pct} onChange={(e) => setPct(e.target.value)} error={errors.pct} className="w-56" />
      <TextField id="fee-fixed" label={`Plus a fixed fee per payment (${currency})`} inputMode="decimal" value={fixed} onChange={(e) => setFixed(e.target.value)} error={errors.fixed} className="w-56" />
      <Button type="submit" variant="secondary" loading={save.isPending}>
        Save card fees
      </Button>
      {save.error && <ErrorNote className="w-full">{save.error.message}</ErrorNote>}
    </form>
  );
}

/** What came in, and what is left of it once tax, card fees and pass-through costs are taken off. */
export function EarningsSection({ studioId, report, from, to, onPeriod }: { studioId: number; report: EarningsReport; from: string; to: string; onPeriod: (from: string, to: string) => void }) {
  const m = (v: number) => formatMoney(v, report.currency);
  const t = report.totals;
  const perHour = (v: number | null) => (v === null ? '—' : `${m(v)} / h`);
  return (
    <Card title="Earnings" description={`${monthLabel(report.from, true)} to ${monthLabel(report.to, true)}, by the day money came in (studio timezone). Refunds count in the month they were made.`}>
      <div className="flex flex-col gap-6">
        <form className="flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()} aria-label="Period">
          <TextField id="earnings-from" type="month" label="From" value={from} max={to} onChange={(e) => e.target.value && onPeriod(e.target.value, to < e.target.value ? e.target.value : to)} className="w-44" />
          <TextField id="earnings-to" type="month" label="To" value={to} min={from} onChange={(e) => e.target.value && onPeriod(from > e.target.value ? e.target.value : from, e.target.value)} className="w-44" />
        </form>
        <dl className="grid grid-cols-2 gap-2 sm:grid-cols-4 xl:grid-cols-7">
          <Stat label="Received" value={m(t.paid)} />
          <Stat label="Tax in it" value={m(t.tax)} />
          <Stat label="Card fees" value={m(t.fees)} />
          <Stat label="Materials, models, shipping" value={m(t.costs)} hint="as quoted" />
          <Stat label="Net earnings" value={m(t.net)} />
          <Stat label="Received per hour logged" value={perHour(t.hourlyGross)} />
          <Stat label="Net per hour logged" value={perHour(t.hourlyNet)} hint={`price table: ${m(report.tableHourlyRate)} / h`} />
        </dl>
        <RevenueChart months={report.months} currency={report.currency} size="tall" />
        {report.commissions.length === 0 ? (
          <p className="text-sm text-sable-600">No money came in during these months.</p>
        ) : (
          <Table caption="Effective hourly rate per commission: everything it was paid, over the hours logged on it." className="relative">
            <THead>
              <Tr>
                <Th>Commission</Th>
                <Th className="text-right">Received</Th>
                <Th className="text-right">Net</Th>
                <Th className="text-right">Hours logged</Th>
                <Th className="text-right">Received / h</Th>
                <Th className="text-right">Net / h</Th>
              </Tr>
            </THead>
            <TBody>
              {report.commissions.map((c) => (
                <Tr key={c.id}>
                  <Td>
                    <Link to={`/studio/${studioId}/commissions/${c.id}`}>{c.title}</Link>
                    <span className="block text-xs text-sable-600">{c.client.name}</span>
                  </Td>
                  <Td className="figures text-right">{m(c.paid)}</Td>
                  <Td className="figures text-right">{m(c.net)}</Td>
                  <Td className="figures text-right">{hoursText(c.loggedHours)}</Td>
                  <Td className="figures text-right">
                    {c.hourlyGross === null ? 'no time yet' : m(c.hourlyGross)}
                    {c.hourlyGross !== null && IN_PROGRESS.includes(c.status) && <span className="block text-xs text-sable-600">in progress</span>}
                  </Td>
                  <Td className="figures text-right">{c.hourlyNet === null ? '—' : m(c.hourlyNet)}</Td>
                </Tr>
              ))}
            </TBody>
          </Table>
        )}
        <section aria-labelledby="fees-title" className="flex flex-col gap-2">
          <h3 id="fees-title" className="text-base font-semibold">
            Card fees
          </h3>
          <p className="text-sm text-sable-600">
            What your payment service keeps of each card payment; see its fee page for your country and cards. Bank transfers and cash carry none here. Fees are not returned on
            refunds.
          </p>
          <FeesForm studioId={studioId} settings={report.settings} currency={report.currency} />
        </section>
      </div>
    </Card>
  );
}
