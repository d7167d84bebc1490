import { Bar, BarChart, CartesianGrid, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { MonthEarnings } from '../../../../shared/schemas/reports';
import { formatMoney } from '../../../lib/format';
import { monthLabel } from './months';

const VERDIGRIS = '#286B5E';
const GLAZE = '#4C5FA3';

/** Received and net per month; the numbers are also in a table for screen readers. */
export function RevenueChart({ months, currency }: { months: MonthEarnings[]; currency: string }) {
  const data = months.map((m) => ({ month: monthLabel(m.month), paid: m.paid, net: m.net }));
  const money = (v: number) => formatMoney(v, currency);
  return (
    <figure className="flex flex-col gap-2">
      <div aria-hidden="true" className="h-64 w-full">
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={data} margin={{ top: 8, right: 8, bottom: 0, left: 8 }}>
            <CartesianGrid stroke="#D6D2CC" vertical={false} />
            <XAxis dataKey="month" tick={{ fill: '#6B4F3F', fontSize: 12 }} tickLine={false} axisLine={{ stroke: '#D6D2CC' }} />
            <YAxis tickFormatter={(v: number) => formatMoney(v, currency).replace(/[.,]00(?!\d)/, '')} tick={{ fill: '#6B4F3F', fontSize: 12 }} width={72} tickLine={false} axisLine={false} />
            <Tooltip formatter={(v) => money(Number(v))} cursor={{ fill: '#DCEFEA' }} contentStyle={{ borderRadius: 6, borderColor: '#D6D2CC', fontSize: 14 }} />
            <Bar dataKey="paid" name="Received" fill={VERDIGRIS} radius={[3, 3, 0, 0]} />
            <Bar dataKey="net" name="Net of tax, fees and costs" fill={GLAZE} radius={[3, 3, 0, 0]} />
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
