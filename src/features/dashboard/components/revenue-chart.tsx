import { Bar, BarChart, CartesianGrid, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { formatMoney } from '../../../lib/format';
import { monthLabel } from './dates';

/** Received and net per month, last twelve months; the same numbers in a table for screen readers. */
export function RevenueChart({ months, currency }: { months: { month: string; paid: number; net: number }[]; currency: string }) {
  const data = months.map((m) => ({ ...m, label: monthLabel(m.month) }));
  const money = (v: number) => formatMoney(v, currency);
  return (
    <figure>
      <div aria-hidden="true" className="h-52 w-full">
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={data} margin={{ top: 4, right: 4, bottom: 0, left: 4 }} barGap={1}>
            <CartesianGrid stroke="#D6D2CC" vertical={false} />
            <XAxis dataKey="label" tick={{ fill: '#6B4F3F', fontSize: 12 }} tickLine={false} axisLine={{ stroke: '#D6D2CC' }} interval="preserveStartEnd" />
            <YAxis tickFormatter={(v: number) => money(v).replace(/[.,]00(?!\d)/, '')} tick={{ fill: '#6B4F3F', fontSize: 12 }} width={64} tickLine={false} axisLine={false} />
            <Tooltip formatter={(v) => money(Number(v))} cursor={{ fill: '#DCEFEA' }} contentStyle={{ borderRadius: 6, borderColor: '#D6D2CC', fontSize: 14 }} />
            <Bar dataKey="paid" name="Received" fill="#286B5E" radius={[3, 3, 0, 0]} />
            <Bar dataKey="net" name="Net" fill="#4C5FA3" radius={[3, 3, 0, 0]} />
          </BarChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-1 flex flex-wrap gap-4 text-xs text-sable-600">
        <span className="flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-block size-3 rounded-sm bg-verdigris-600" /> Received
        </span>
        <span className="flex items-center gap-1.5">
          <span aria-hidden="true" className="inline-block size-3 rounded-sm bg-glaze-500" /> Net of tax, card fees and pass-through costs
        </span>
      </figcaption>
      <table className="sr-only">
        <caption>Revenue by month</caption>
        <thead>
          <tr>
            <th scope="col">Month</th>
            <th scope="col">Received</th>
            <th scope="col">Net</th>
          </tr>
        </thead>
        <tbody>
          {months.map((m) => (
            <tr key={m.month}>
              <th scope="row">{m.month}</th>
              <td>{money(m.paid)}</td>
              <td>{money(m.net)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </figure>
  );
}
