import { Link } from 'react-router-dom';
import { commissionStatuses, commissionStatusLabels } from '../../../../shared/commission-lifecycle';
import type { OwnerDashboard } from '../../../../shared/schemas/dashboard';
import { Badge } from '../../../components/ui/badge';
import { ButtonLink } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { formatMoney } from '../../../lib/format';
import { BenchSummaryCards } from './bench-summary';
import { formatDay, slackWords } from './dates';
import { RevenueChart } from '../../../components/charts/revenue-chart';
import { Utilisation } from './utilisation';

/** The owner's home: what needs a decision today, how full the weeks are, what is owed and earned. */
export function OwnerHome({ studioId, d }: { studioId: number; d: OwnerDashboard }) {
  const base = `/studio/${studioId}`;
  const money = (v: number) => formatMoney(v, d.currency);
  const counts = new Map(d.byStatus.map((s) => [s.status, s.count]));
  const last6 = d.revenue.slice(-6);
  const received6 = last6.reduce((n, m) => n + m.paid, 0);
  const net6 = last6.reduce((n, m) => n + m.net, 0);

  return (
    <div className="flex flex-col gap-6">
      <div className="grid gap-4 lg:grid-cols-2">
        <Card
          title="Most at risk of being late"
          description="By days to spare between the forecast ready-to-ship date and the due date."
          actions={
            <ButtonLink to="calendar" variant="ghost" size="sm">
              Open the calendar
            </ButtonLink>
          }
        >
          {d.atRisk.length === 0 ? (
            <p className="text-sm text-sable-600">No commission in the queue has a due date.</p>
          ) : (
            <ol className="flex flex-col divide-y divide-primer-300">
              {d.atRisk.map((c) => (
                <li key={c.id} className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1 py-2">
                  <span className="min-w-0">
                    <Link to={`${base}/commissions/${c.id}`} className="font-medium">
                      {c.title}
                    </Link>
                    <span className="block text-xs text-sable-600">
                      {c.client.name} · due {formatDay(c.dueDate)} · {c.finishDate ? `ready ${formatDay(c.finishDate)}` : 'not scheduled'}
                    </span>
                  </span>
                  {c.unscheduled ? (
                    <Badge tone="danger">Not scheduled</Badge>
                  ) : c.late ? (
                    <Badge tone="danger">{slackWords(c.slackDays)}</Badge>
                  ) : (
                    <Badge tone={c.slackDays !== null && c.slackDays <= 3 ? 'attention' : 'neutral'}>{slackWords(c.slackDays)}</Badge>
                  )}
                </li>
              ))}
            </ol>
          )}
        </Card>

        <Card title="Booked hours against capacity" description="The next eight weeks: the forecast’s hours in the painters’ working hours, days off taken out.">
          <Utilisation weeks={d.utilisation} />
        </Card>

        <Card
          title="Overdue stages"
          description="Stages still open on commissions past their due date."
          actions={
            d.overdueStages.total > 0 && (
              <ButtonLink to="bench" variant="ghost" size="sm">
                Open the bench
              </ButtonLink>
            )
          }
        >
          {d.overdueStages.total === 0 ? (
            <p className="text-sm text-sable-600">None: every commission past its due date is finished.</p>
          ) : (
            <>
              <ul className="flex flex-col divide-y divide-primer-300">
                {d.overdueStages.items.map((s) => (
                  <li key={s.stageId} className="flex flex-wrap items-baseline justify-between gap-x-3 py-2 text-sm">
                    <span>
                      <span className="font-medium">{s.stageName}</span> · <Link to={`${base}/commissions/${s.commission.id}`}>{s.figure.name}</Link>
                      <span className="block text-xs text-sable-600">
                        {s.commission.title}
                        {s.painter ? ` · ${s.painter.name}` : ' · nobody assigned'}
                      </span>
                    </span>
                    <Badge tone="danger">{s.daysOverdue === 1 ? '1 day overdue' : `${s.daysOverdue} days overdue`}</Badge>
                  </li>
                ))}
              </ul>
              {d.overdueStages.total > d.overdueStages.items.length && (
                <p className="mt-2 text-xs text-sable-600">and {d.overdueStages.total - d.overdueStages.items.length} more</p>
              )}
            </>
          )}
        </Card>

        <Card
          title="Unpaid invoices"
          description={`${d.invoices.unpaid.count} open, ${money(d.invoices.unpaid.amount)} to come in · ${d.invoices.overdue.count} overdue, ${money(d.invoices.overdue.amount)}`}
          actions={
            <ButtonLink to="money" variant="ghost" size="sm">
              Quotes and invoices
            </ButtonLink>
          }
        >
          {d.invoices.items.length === 0 ? (
            <p className="text-sm text-sable-600">Everything invoiced is paid.</p>
          ) : (
            <ul className="flex flex-col divide-y divide-primer-300">
              {d.invoices.items.map((i) => (
                <li key={i.id} className="flex flex-wrap items-baseline justify-between gap-x-3 py-2 text-sm">
                  <span>
                    <Link to={`${base}/invoices/${i.id}`} className="font-medium">
                      {i.number ?? 'Invoice'}
                    </Link>{' '}
                    · {i.clientName}
                    <span className="block text-xs text-sable-600">
                      {i.commission.title}
                      {i.dueDate ? ` · due ${formatDay(i.dueDate)}` : ''}
                    </span>
                  </span>
                  <span className="flex items-center gap-2">
                    <span className="figures">{formatMoney(i.due, i.currency)}</span>
                    {i.overdue && <Badge tone="danger">Overdue</Badge>}
                  </span>
                </li>
              ))}
            </ul>
          )}
        </Card>
      </div>

      <Card
        title="Revenue by month"
        description={`Last six months: ${money(received6)} received, ${money(net6)} net of tax, card fees and pass-through costs.`}
        actions={
          <ButtonLink to="reports" variant="secondary" size="sm">
            The books
          </ButtonLink>
        }
      >
        <RevenueChart months={d.revenue} currency={d.currency} />
      </Card>

      <Card title="Commissions by status">
        <ul className="flex flex-wrap gap-2">
          {commissionStatuses.map((s) => (
            <li key={s}>
              <Link
                to={`${base}/commissions?status=${s}`}
                className="flex min-h-10 items-center gap-2 rounded-control border border-primer-300 bg-white px-3 text-sm text-sable-900 no-underline hover:bg-primer-100"
              >
                {commissionStatusLabels[s]} <span className="figures font-semibold">{counts.get(s) ?? 0}</span>
              </Link>
            </li>
          ))}
        </ul>
      </Card>

      {d.myBench && <BenchSummaryCards studioId={studioId} bench={d.myBench} title="Your own bench" />}
    </div>
  );
}
