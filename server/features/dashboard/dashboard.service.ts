import { addDays, isoWeek, localDateOf, parseInstant, parseLocalDate } from '../../../shared/dates';
import { workingIntervals, type WorkBlock } from '../../../shared/schedule';
import type {
  AtRiskCommission,
  BenchSummary,
  ClientDashboard,
  Dashboard,
  OwnerDashboard,
  PlannedStage,
  UtilisationWeek,
} from '../../../shared/schemas/dashboard';
import type { Clock } from '../../lib/clock';
import { errors } from '../../lib/errors';
import { keptReads } from '../../lib/version-cache';
import type { Actor } from '../capacity/capacity.service';
import type { ReportsService } from '../reports/reports.service';
import { timelineWeeks, type ScheduleService, type StudioForecast } from '../schedule/schedule.service';
import type { DashboardRepository } from './dashboard.repository';

const HOUR_MS = 3_600_000;
const MINUTE_MS = 60_000;
const round2 = (x: number) => Math.round(x * 100) / 100;

/**
 * localDateOf for the many block starts of one forecast: zone offsets (and their changes) fall on quarter
 * hours, so every instant of a quarter hour has the same local date, and each quarter hour is looked up once.
 */
function localDates(tz: string) {
  const memo = new Map<number, string>();
  return (ms: number) => {
    const quarter = Math.floor(ms / 900_000);
    let date = memo.get(quarter);
    if (date === undefined) {
      date = localDateOf(quarter * 900_000, tz);
      memo.set(quarter, date);
    }
    return date;
  };
}

/** Working hours of one painter between two local dates, from `nowMs` on. */
function capacityHours(sf: StudioForecast, painterId: number, from: string, to: string, nowMs: number, into: (date: string, hours: number) => void) {
  const p = sf.input.painters.find((x) => x.id === painterId);
  if (!p) return;
  for (const i of workingIntervals(p, sf.input.timeZone, from, to, sf.input.closedDays ?? [])) {
    const s = Math.max(parseInstant(i.start), nowMs);
    const e = parseInstant(i.end);
    if (e > s) into(i.date, (e - s) / HOUR_MS);
  }
}

/** Rows a home holds, for the cache's bound: its lists' entries and one for the rest. */
const weigh = (d: Dashboard) => (d.role === 'owner' ? weighOwner(d) : d.role === 'client' ? 1 + d.commissions.length : 1 + d.todayStages.length + d.weekStages.length);
const weighOwner = (d: OwnerDashboard) =>
  1 +
  d.byStatus.length +
  d.utilisation.length +
  d.overdueStages.items.length +
  d.invoices.items.length +
  d.revenue.length +
  d.atRisk.length +
  (d.myBench ? d.myBench.todayStages.length + d.myBench.weekStages.length : 0);

/**
 * The home page of each role, kept in memory (`cacheRows`: rows of their lists held across studios and
 * people, default 20,000; 0: no cache) per studio, person (the client record for a client) and minute under
 * the books version (server/lib/version-cache.ts `booksVersion`: schedule_version + books_version, moved by
 * database triggers with every write to a row they read: the commissions, figures and stages through the
 * schedule version's triggers, the money tables and running timers through the books version's,
 * migrations/20270205120000-books-version.ts). Everything in them that depends on the clock follows from the
 * minute: the forecast is worked out as of the start of the minute (schedule.service.ts), and "today" and
 * "this month" are that minute's in the studio's zone. While neither moves, a request reads only the version.
 */
export function dashboardService(deps: { repo: DashboardRepository; schedule: ScheduleService; reports: ReportsService; clock: Clock; cacheRows?: number }) {
  const { repo, schedule, reports, clock } = deps;
  const keptHome = keptReads<Dashboard, { version: number }>({ version: repo.version, maxWeight: deps.cacheRows ?? 20_000, weigh });

  function blocksOf(sf: StudioForecast): WorkBlock[] {
    return sf.forecast.commissions.flatMap((c) => c.figures.flatMap((f) => f.blocks));
  }

  /** What the forecast plans for one person: stages today and this week, their hours, their running timer. */
  async function bench(studioId: number, userId: number, sf: StudioForecast): Promise<BenchSummary> {
    const timer = await repo.runningTimer(studioId, userId);
    return {
      ...schedule.derived(sf, `bench:${userId}`, () => planned(userId, sf)),
      timer: timer
        ? {
            entryId: timer.id,
            startedAt: timer.started_at,
            stage: { id: timer.stage_id, name: timer.stage_name },
            figure: { id: timer.figure_id, name: timer.figure_name },
            commission: { id: timer.commission_id, title: timer.title },
          }
        : null,
    };
  }

  /** The forecast's part of a person's bench: the same for every request answered from one run. */
  function planned(userId: number, sf: StudioForecast): Omit<BenchSummary, 'timer'> {
    const tz = sf.input.timeZone;
    const nowMs = parseInstant(sf.input.now);
    const w = isoWeek(sf.today);
    const weekStart = addDays(sf.today, 1 - w.weekday);
    const weekEnd = addDays(weekStart, 6);
    const stages = new Map(sf.work.stages.map((s) => [s.id, s]));
    const figures = new Map(sf.work.figures.map((f) => [f.id, f]));
    const commissions = new Map(sf.queue.map((c) => [c.id, c]));

    const group = (blocks: WorkBlock[]): PlannedStage[] => {
      const out = new Map<number, PlannedStage>();
      for (const b of blocks) {
        const id = Number(b.stageId);
        const hours = (parseInstant(b.end) - parseInstant(b.start)) / HOUR_MS;
        const e = out.get(id);
        if (e) {
          e.hours += hours;
          e.end = b.end;
          continue;
        }
        const s = stages.get(id)!;
        const f = figures.get(s.figure_id)!;
        const c = commissions.get(f.commission_id)!;
        out.set(id, {
          stageId: id,
          stageName: s.name,
          figure: { id: f.id, name: f.name, quantity: f.quantity },
          commission: { id: c.id, title: c.title, dueDate: c.due_date },
          hours,
          start: b.start,
          end: b.end,
        });
      }
      return [...out.values()].sort((a, b) => a.start.localeCompare(b.start)).map((p) => ({ ...p, hours: round2(p.hours) }));
    };

    const mine = blocksOf(sf).filter((b) => Number(b.painterId) === userId);
    const dateOf = localDates(tz);
    const dated = mine.map((b) => ({ b, date: dateOf(parseInstant(b.start)) }));
    const week = dated.filter((x) => x.date >= weekStart && x.date <= weekEnd).map((x) => x.b);
    let capacity = 0;
    capacityHours(sf, userId, weekStart, weekEnd, nowMs, (_d, hrs) => (capacity += hrs));
    return {
      today: sf.today,
      timeZone: tz,
      week: { year: w.year, week: w.week, start: weekStart, end: weekEnd },
      todayStages: group(dated.filter((x) => x.date === sf.today).map((x) => x.b)),
      weekStages: group(week),
      weekHours: { capacity: round2(capacity), planned: round2(week.reduce((n, b) => n + (parseInstant(b.end) - parseInstant(b.start)) / HOUR_MS, 0)) },
    };
  }

  /** The owner's home parts that come from the forecast alone: the same for every request answered from one run. */
  function studioOutlook(sf: StudioForecast): { utilisation: UtilisationWeek[]; atRisk: AtRiskCommission[] } {
    const tz = sf.input.timeZone;
    const nowMs = parseInstant(sf.input.now);
    const weeks = timelineWeeks(sf.today, 8);
    const first = parseLocalDate(weeks[0].start);
    const util: UtilisationWeek[] = weeks.map((w) => ({ year: w.year, week: w.week, label: w.label, start: w.start, capacityHours: 0, bookedHours: 0, share: 0 }));
    const weekIndex = (date: string) => Math.floor((parseLocalDate(date) - first) / 7);
    for (const p of sf.painters) {
      capacityHours(sf, p.id, weeks[0].start, weeks[7].end, nowMs, (date, hrs) => {
        const i = weekIndex(date);
        if (i >= 0 && i < 8) util[i].capacityHours += hrs;
      });
    }
    const dateOf = localDates(tz);
    for (const b of blocksOf(sf)) {
      const i = weekIndex(dateOf(parseInstant(b.start)));
      if (i >= 0 && i < 8) util[i].bookedHours += (parseInstant(b.end) - parseInstant(b.start)) / HOUR_MS;
    }
    for (const u of util) {
      u.capacityHours = round2(u.capacityHours);
      u.bookedHours = round2(u.bookedHours);
      u.share = u.capacityHours > 0 ? Math.round((u.bookedHours / u.capacityHours) * 1000) / 1000 : 0;
    }

    const described = schedule.describe(sf, false);
    const atRisk: AtRiskCommission[] = described
      .filter((c) => c.dueDate !== null)
      .sort((a, b) => (a.slackDays ?? -Infinity) - (b.slackDays ?? -Infinity) || a.queuePosition! - b.queuePosition!)
      .slice(0, 5)
      .map((c) => ({ id: c.id, title: c.title, client: c.client, dueDate: c.dueDate!, finishDate: c.finishDate, slackDays: c.slackDays, late: c.late, unscheduled: c.unscheduled !== null }));
    return { utilisation: util, atRisk };
  }

  async function owner(actor: Actor, sf: StudioForecast): Promise<OwnerDashboard> {
    const tz = sf.input.timeZone;
    const { utilisation, atRisk } = schedule.derived(sf, 'owner-outlook', () => studioOutlook(sf));
    const [statusRows, overdue, unpaid, earnings, myBench] = await Promise.all([
      repo.byStatus(actor.studioId),
      repo.overdueStages(actor.studioId, sf.today, 10),
      reports.unpaidInvoices(actor.studioId),
      reports.earnings(actor.studioId, {}),
      bench(actor.studioId, actor.userId, sf),
    ]);
    const overdueInvoices = unpaid.filter((i) => i.dueDate !== null && i.dueDate < sf.today && i.due > 0);
    const inCurrency = (list: typeof unpaid) => list.filter((i) => i.currency === earnings.currency).reduce((n, i) => n + i.due, 0);
    return {
      role: 'owner',
      today: sf.today,
      timeZone: tz,
      currency: earnings.currency,
      byStatus: statusRows.map((r) => ({ status: r.status, count: Number(r.n) })),
      utilisation,
      overdueStages: {
        total: overdue.total,
        items: overdue.items.map((o) => ({
          stageId: o.stage_id,
          stageName: o.stage_name,
          figure: { id: o.figure_id, name: o.figure_name },
          commission: { id: o.commission_id, title: o.title, dueDate: o.due_date },
          painter: o.painter_id !== null && o.painter_name !== null ? { id: o.painter_id, name: o.painter_name } : null,
          daysOverdue: parseLocalDate(sf.today) - parseLocalDate(o.due_date),
        })),
      },
      invoices: {
        unpaid: { count: unpaid.length, amount: inCurrency(unpaid) },
        overdue: { count: overdueInvoices.length, amount: inCurrency(overdueInvoices) },
        items: unpaid.slice(0, 8).map((i) => ({ ...i, overdue: overdueInvoices.includes(i) })),
      },
      revenue: earnings.months.map((m) => ({ month: m.month, paid: m.paid, net: m.net })),
      atRisk,
      myBench: myBench.weekStages.length || myBench.timer ? myBench : null,
    };
  }

  async function client(actor: Actor, sf: StudioForecast): Promise<ClientDashboard> {
    if (actor.clientId === null) return { role: 'client', today: sf.today, timeZone: sf.input.timeZone, commissions: [] };
    const rows = await repo.clientCommissions(actor.studioId, actor.clientId);
    const projected = new Map(sf.forecast.commissions.map((c) => [Number(c.id), c]));
    return {
      role: 'client',
      today: sf.today,
      timeZone: sf.input.timeZone,
      commissions: rows.map((r) => {
        const f = projected.get(r.id);
        return { id: r.id, title: r.title, status: r.status, dueDate: r.due_date, projectedDate: f?.finishDate ?? null, late: f?.late ?? false };
      }),
    };
  }

  return {
    async get(actor: Actor): Promise<Dashboard> {
      const minute = Math.floor(clock.now().getTime() / MINUTE_MS);
      const home = (key: string, read: (sf: StudioForecast) => Promise<Dashboard>) =>
        keptHome(actor.studioId, `${key}|${minute}`, async () => read(await schedule.run(actor.studioId)));
      if (actor.role === 'owner') return home(`owner|${actor.userId}`, (sf) => owner(actor, sf));
      if (actor.role === 'painter') return home(`painter|${actor.userId}`, async (sf) => ({ role: 'painter', ...(await bench(actor.studioId, actor.userId, sf)) }));
      if (actor.role === 'client') return home(`client|${actor.clientId}`, (sf) => client(actor, sf));
      throw errors.forbidden();
    },
  };
}

export type DashboardService = ReturnType<typeof dashboardService>;
