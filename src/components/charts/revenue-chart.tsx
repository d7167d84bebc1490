import { Bar, BarChart, CartesianGrid, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { cn } from '../../lib/cn';
import { formatMoney } from '../../lib/format';

/** One month of money in: `month` is 'YYYY-MM', amounts in minor units. */
export type RevenueMonth = { month: string; paid: number; net: number };

/** The colours of look.md; recharts draws with attributes, so the hex values stand here beside their token names. */
const VERDIGRIS_600 = '#286B5E';
const GLAZE_500 = '#4C5FA3';
const PRIMER_300 = '#D6D2CC';
const SABLE_600 = '#6B4F3F';
const VERDIGRIS_100 = '#DCEFEA';

/** 'Nov' or, with the year, 'Nov 2026' — months are calendar months, so the label is read in UTC. */
export function monthLabel(month: string, withYear = false): string {
  const [y, m] = month.split('-').map(Number);
  return new Intl.DateTimeFormat(undefined, { month: 'short', ...(withYear ? { year: 'numeric' } : {}), timeZone: 'UTC' }).format(new Date(Date.UTC(y, m - 1, 15)));
}

/**
 * Received and net per month as bars, with the same numbers in a table for screen readers.
 * `size` is 'compact' on the home page and 'tall' in the books, where the months carry their year.
 */
export function RevenueChart({ months, currency, size = 'compact' }: { months: RevenueMonth[]; currency: string; size?: 'compact' | 'tall' }) {
  const tall = size === 'tall';
  const data = months.map((m) => ({ month: m.month, label: monthLabel(m.month, tall), paid: m.paid, net: m.net }));
  const money = (v: number) => formatMoney(v, currency);
  return (
    <figure className="flex flex-col gap-1">
      <div aria-hidden="true" className={cn('w-full', tall ? 'h-64' : 'h-52')}>
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={data} margin={{ top: 8, right: 8, bottom: 0, left: 8 }} barGap={1} accessibilityLayer={false}>
            <CartesianGrid stroke={PRIMER_300} vertical={false} />
            <XAxis dataKey="label" tick={{ fill: SABLE_600, fontSize: 12 }} tickLine={false} axisLine={{ stroke: PRIMER_300 }} interval="preserveStartEnd" />
            <YAxis tickFormatter={(v: number) => money(v).replace(/[.,]00(?!\d)/, '')} tick={{ fill: SABLE_600, fontSize: 12 }} width={72} tickLine={false} axisLine={false} />
            <Tooltip formatter={(v) => money(Number(v))} cursor={{ fill: VERDIGRIS_100 }} contentStyle={{ borderRadius: 6, borderColor: PRIMER_300, fontSize: 14 }} />
            <Bar dataKey="paid" name="Received" fill={VERDIGRIS_600} radius={[3, 3, 0, 0]} />
            <Bar dataKey="net" name="Net of tax, fees and costs" fill={GLAZE_500} radius={[3, 3, 0, 0]} />
          </BarChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="flex flex-wrap gap-4 text-xs text-sable-600">
        <span className="flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-block size-3 rounded-sm bg-verdigris-600" /> Received
        </span>
        <span className="flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-block size-3 rounded-sm bg-glaze-500" /> Net of tax, card fees and pass-through costs
        </span>
      </figcaption>
      <table className="sr-only">
        <caption>Received and net by month</caption>
        <thead>
          <tr>
            <th scope="col">Month</th>
            <th scope="col">Received</th>
            <th scope="col">Net</th>
          </tr>
        </thead>
        <tbody>
          {data.map((m) => (
            <tr key={m.month}>
              <th scope="row">{monthLabel(m.month, true)}</th>
              <td>{money(m.paid)}</td>
              <td>{money(m.net)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </figure>
  );
}
