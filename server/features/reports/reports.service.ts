import { minutesToHours } from '../../../shared/commission-lifecycle';
import { dayNumber, localDateOf, zonedInstant } from '../../../shared/dates';
import { cellActuals, fitLearningRate, suggestCells, type BatchPoint, type DoneStageSample } from '../../../shared/learning';
import { mulDiv } from '../../../shared/money';
import { sizeClassLabels, type PriceTable, type SizeClass } from '../../../shared/schemas/price-table';
import type { ActualsReport, BooksSettings, BooksSettingsInput, CommissionEarnings, EarningsQuery, EarningsReport, MonthEarnings, StageActual } from '../../../shared/schemas/reports';
import { iso, type Clock } from '../../lib/clock';
import { errors } from '../../lib/errors';
import { keptReads, type VersionInZone } from '../../lib/version-cache';
import type { MoneyMove, ReportsRepository } from './reports.repository';

/** Where the books read the studio's price table (the price-table feature's service in the app). */
export type PriceTableSource = { get(studioId: number): Promise<PriceTable> };

const h = (minutes: number) => minutesToHours(minutes);
const ratio = (logged: number, estimated: number) => (estimated > 0 ? Math.round((logged / estimated - 1) * 1000) / 1000 : null);
const parseList = (json: string): string[] => {
  try {
    const v = JSON.parse(json);
    return Array.isArray(v) ? v.map(String) : [];
  } catch {
    return [];
  }
};

/** Hours of the table's hour-extras that a figure's extras add to one stage of ONE figure. */
function extraHours(table: PriceTable, extras: string[], stage: string): number {
  let sum = 0;
  for (const e of table.extras) if (e.kind === 'hours' && e.stage === stage && extras.includes(e.key)) sum += e.hours;
  return sum;
}

/** What a commission's accepted quote passes through at cost: materials, models bought in, shipping, insurance. */
function quotedCosts(result: unknown): number {
  const lines = (result as { lines?: unknown[] } | null)?.lines;
  if (!Array.isArray(lines)) return 0;
  let sum = 0;
  for (const l of lines as Record<string, unknown>[]) {
    if (l.type === 'figure' && typeof l.materials === 'number') sum += l.materials;
    if (l.type === 'extra' && ['models', 'shipping', 'insurance'].includes(String(l.kind)) && typeof l.amount === 'number') sum += l.amount;
  }
  return sum;
}

const monthOf = (instant: string, timeZone: string) => localDateOf(Date.parse(instant), timeZone).slice(0, 7);
const monthStart = (month: string, timeZone: string) => {
  const [y, m] = month.split('-').map(Number);
  return new Date(zonedInstant(dayNumber(y, m, 1), 0, timeZone)).toISOString();
};
const nextMonth = (month: string) => {
  const [y, m] = month.split('-').map(Number);
  return m === 12 ? `${y + 1}-01` : `${y}-${String(m + 1).padStart(2, '0')}`;
};
const addMonths = (month: string, k: number) => {
  const [y, m] = month.split('-').map(Number);
  const t = y * 12 + (m - 1) + k;
  return `${Math.floor(t / 12)}-${String((t % 12) + 1).padStart(2, '0')}`;
};
const emptyMonth = (month: string): MonthEarnings => ({ month, paid: 0, tax: 0, fees: 0, costs: 0, net: 0 });

/** Rows an answer holds, for the cache's bound: its lists' entries and one for the rest. */
const weigh = (r: ActualsReport | EarningsReport) =>
  'months' in r ? 1 + r.months.length + r.commissions.length : 1 + r.byStage.length + r.recent.length + r.cells.length + r.suggestions.length;

/**
 * The books: actuals (done stages against the table) and earnings (money in, split).
 *
 * Both answers are kept in memory (`cacheRows`: rows of their lists held across studios and queries,
 * default 20,000; 0: no cache) under the studio's books version (server/lib/version-cache.ts
 * `booksVersion`: schedule_version + books_version, which database triggers move with every write to a
 * row either answer reads: migrations/20270205120000-books-version.ts lists them). The actuals do not
 * depend on the clock; the earnings do only through "this month" in the studio's zone when the query
 * leaves out its last month, so that month is in their key, worked out from the zone the version read gives.
 */
export function reportsService(deps: { repo: ReportsRepository; priceTables: PriceTableSource; clock: Clock; cacheRows?: number }) {
  const { repo, priceTables, clock } = deps;
  const kept = keptReads<ActualsReport | EarningsReport, VersionInZone>({ version: repo.version, maxWeight: deps.cacheRows ?? 20_000, weigh });

  async function studio(studioId: number) {
    const s = await repo.studio(studioId);
    if (!s) throw errors.notFound('That studio');
    return s;
  }

  async function settings(studioId: number): Promise<BooksSettings> {
    const s = await repo.settings(studioId);
    return { cardFeeBp: s?.card_fee_bp ?? 0, cardFeeFixedMinor: s?.card_fee_fixed ?? 0 };
  }

  /**
   * Each payment split into tax, fees, costs and what is left. Tax is the invoice's share of tax in the
   * amount; the card fee (the owner's figures) is charged on card payments and not given back on refunds
   * (common practice of payment services); costs are the accepted quote's pass-through lines in
   * proportion to the amount against the quote's total. Each share is rounded once, half away from zero.
   */
  function split(m: MoneyMove, fee: BooksSettings, costs: { costs: number; total: number } | undefined) {
    const tax = m.invoice_total > 0 ? mulDiv(m.amount, m.invoice_tax, m.invoice_total) : 0;
    const fees = m.method === 'card' && m.amount > 0 ? mulDiv(m.amount, fee.cardFeeBp, 10_000) + fee.cardFeeFixedMinor : 0;
    const cost = costs && costs.total > 0 ? mulDiv(m.amount, costs.costs, costs.total) : 0;
    return { paid: m.amount, tax, fees, costs: cost, net: m.amount - tax - fees - cost };
  }

  async function actuals(studioId: number): Promise<ActualsReport> {
    const [done, table] = await Promise.all([repo.doneStages(studioId), priceTables.get(studioId)]);
    const withTime = done.rows;
    const stageLabel = new Map(table.stages.map((s) => [s.key, s.label]));
    const tierLabel = new Map(table.tiers.map((t) => [t.key, t.label]));
    const sizeLabel = (k: string) => sizeClassLabels[k as SizeClass] ?? k;
    const cell = (c: { sizeClass: string; tier: string; stage: string }) => table.stageHours[c.sizeClass]?.[c.tier]?.[c.stage];

    const byKey = new Map<string, StageActual & { est: number; log: number }>();
    for (const r of withTime) {
      const a = byKey.get(r.template_key) ?? { key: r.template_key, name: stageLabel.get(r.template_key) ?? r.stage_name, count: 0, estimatedHours: 0, loggedHours: 0, difference: null, est: 0, log: 0 };
      a.count++;
      a.est += r.estimate_minutes;
      a.log += r.logged_minutes;
      byKey.set(r.template_key, a);
    }
    const order = table.stages.map((s) => s.key);
    const rank = (k: string) => (order.indexOf(k) < 0 ? order.length : order.indexOf(k));
    const byStage = [...byKey.values()]
      .sort((a, b) => rank(a.key) - rank(b.key) || a.key.localeCompare(b.key))
      .map(({ est, log, ...a }) => ({ ...a, estimatedHours: h(est), loggedHours: h(log), difference: ratio(log, est) }));
    const est = withTime.reduce((n, r) => n + r.estimate_minutes, 0);
    const log = withTime.reduce((n, r) => n + r.logged_minutes, 0);

    const samples: DoneStageSample[] = withTime.map((r) => ({
      sizeClass: r.size_class,
      tier: r.tier,
      stage: r.template_key,
      quantity: r.quantity,
      loggedHours: r.logged_minutes / 60,
      extraUnitHours: extraHours(table, parseList(r.extras), r.template_key),
    }));
    const cells = cellActuals(samples, table.learningRate, { sizeClasses: Object.keys(table.stageHours), tiers: table.tiers.map((t) => t.key), stages: order });
    const labels = (c: { sizeClass: string; tier: string; stage: string }) => ({
      stageLabel: stageLabel.get(c.stage) ?? c.stage,
      tierLabel: tierLabel.get(c.tier) ?? c.tier,
      sizeLabel: sizeLabel(c.sizeClass),
    });

    // One point per figure: its logged hours on the done stages against the table's hours for one such
    // figure on the same stages (extras included), so the fit sees only the batch effect. Large figures
    // (vehicles, monsters) are quoted apart, so the table's one "large" cell is no yardstick for them.
    const figures = new Map<number, { quantity: number; hours: number; unitHours: number; ok: boolean }>();
    for (const r of withTime) {
      if (r.size_class === 'large') continue;
      const f = figures.get(r.figure_id) ?? { quantity: r.quantity, hours: 0, unitHours: 0, ok: true };
      const base = cell({ sizeClass: r.size_class, tier: r.tier, stage: r.template_key });
      if (base === undefined) f.ok = false;
      else f.unitHours += base + extraHours(table, parseList(r.extras), r.template_key);
      f.hours += r.logged_minutes / 60;
      figures.set(r.figure_id, f);
    }
    const points: BatchPoint[] = [...figures.values()].filter((f) => f.ok && f.unitHours > 0).map(({ quantity, hours, unitHours }) => ({ quantity, hours, unitHours }));

    return {
      doneStages: withTime.length,
      doneWithoutTime: done.withoutTime,
      totals: { estimatedHours: h(est), loggedHours: h(log), difference: ratio(log, est) },
      byStage,
      recent: withTime.slice(0, 30).map((r) => ({
        stageId: r.stage_id,
        stageName: r.stage_name,
        figure: { id: r.figure_id, name: r.figure_name, quantity: r.quantity, sizeClass: r.size_class, tier: r.tier },
        commission: { id: r.commission_id, title: r.commission_title },
        doneAt: r.done_at,
        estimatedHours: h(r.estimate_minutes),
        loggedHours: h(r.logged_minutes),
      })),
      cells: cells.map((c) => ({ ...c, ...labels(c), medianHours: Math.round(c.medianHours * 100) / 100, tableHours: cell(c) ?? null })),
      suggestions: suggestCells(
        cells.filter((c) => c.sizeClass !== 'large'),
        cell,
      ).map((s) => ({ ...s, ...labels(s), medianHours: Math.round(s.medianHours * 100) / 100 })),
      learningRate: { table: table.learningRate, fitted: fitLearningRate(points), batches: points.length },
    };
  }

  /** The earnings as of `now` (ms): the default window ends in its month in the studio's zone. */
  async function earnings(studioId: number, q: EarningsQuery, now: number): Promise<EarningsReport> {
    const [s, table, fee] = await Promise.all([studio(studioId), priceTables.get(studioId), settings(studioId)]);
    const thisMonth = localDateOf(now, s.timezone).slice(0, 7);
    const to = q.to ?? (q.from && q.from > thisMonth ? q.from : thisMonth);
    const from = q.from ?? addMonths(to, -11);
    if (addMonths(from, 119) < to) throw errors.field('from', 'Ask for ten years at most.');
    const moves = await repo.moneyMoves(studioId, table.currency, { from: monthStart(from, s.timezone), to: monthStart(nextMonth(to), s.timezone) });
    // Commissions with money in the window, each with everything it was ever paid: a deposit taken last
    // year still belongs to its hourly rate.
    const ids = [...new Set(moves.map((m) => m.commission_id))];
    const [quotes, info, logged, allMoves] = await Promise.all([
      repo.acceptedQuotes(studioId, ids),
      repo.commissions(studioId, ids),
      repo.loggedMinutes(studioId, ids),
      repo.moneyMoves(studioId, table.currency, { commissionIds: ids }),
    ]);
    const costsOf = new Map([...quotes].map(([id, q]) => [id, { costs: quotedCosts(q.result), total: q.total }]));

    const months = new Map<string, MonthEarnings>();
    for (let m = from; m <= to; m = nextMonth(m)) months.set(m, emptyMonth(m));
    const byCommission = new Map<number, MonthEarnings>();
    const add = (into: MonthEarnings, p: Omit<MonthEarnings, 'month'>) => {
      into.paid += p.paid;
      into.tax += p.tax;
      into.fees += p.fees;
      into.costs += p.costs;
      into.net += p.net;
    };
    for (const m of moves) {
      const month = months.get(monthOf(m.at, s.timezone));
      if (month) add(month, split(m, fee, costsOf.get(m.commission_id)));
    }
    for (const m of allMoves) {
      const c = byCommission.get(m.commission_id) ?? emptyMonth('');
      add(c, split(m, fee, costsOf.get(m.commission_id)));
      byCommission.set(m.commission_id, c);
    }
    const perHour = (amount: number, minutes: number) => (minutes > 0 ? mulDiv(amount, 60, minutes) : null);
    const commissions: CommissionEarnings[] = info
      .map((c) => {
        const e = byCommission.get(c.id)!;
        const minutes = logged.get(c.id) ?? 0;
        return {
          id: c.id,
          title: c.title,
          client: { id: c.client_id, name: c.client_name },
          status: c.status,
          paid: e.paid,
          tax: e.tax,
          fees: e.fees,
          costs: e.costs,
          net: e.net,
          loggedHours: h(minutes),
          hourlyGross: perHour(e.paid, minutes),
          hourlyNet: perHour(e.net, minutes),
        };
      })
      .sort((a, b) => b.paid - a.paid || a.id - b.id);
    const total = emptyMonth('');
    for (const m of months.values()) add(total, m);
    // The window's own rate: what came in over the hours logged on the commissions it came for.
    const minutes = [...logged.values()].reduce((a, b) => a + b, 0);
    return {
      currency: table.currency,
      from,
      to,
      settings: fee,
      totals: { ...total, month: `${from}..${to}`, loggedHours: h(minutes), hourlyGross: perHour(total.paid, minutes), hourlyNet: perHour(total.net, minutes) },
      months: [...months.values()],
      commissions,
      tableHourlyRate: table.hourlyRate,
    };
  }

  return {
    settings,

    async saveSettings(studioId: number, input: BooksSettingsInput) {
      await repo.saveSettings(studioId, { card_fee_bp: input.cardFeeBp, card_fee_fixed: input.cardFeeFixedMinor }, iso(clock.now()));
      return settings(studioId);
    },

    actuals: (studioId: number) => kept(studioId, 'actuals', () => actuals(studioId)) as Promise<ActualsReport>,

    earnings(studioId: number, q: EarningsQuery): Promise<EarningsReport> {
      const now = clock.now().getTime();
      // "This month" counts only when the query leaves out its last month.
      const key = (at: { timeZone: string }) => `earnings|${q.from ?? ''}|${q.to ?? `now ${localDateOf(now, at.timeZone).slice(0, 7)}`}`;
      return kept(studioId, key, () => earnings(studioId, q, now)) as Promise<EarningsReport>;
    },

    unpaidInvoices: (studioId: number) => repo.unpaidInvoices(studioId),
  };
}

export type ReportsService = ReturnType<typeof reportsService>;

