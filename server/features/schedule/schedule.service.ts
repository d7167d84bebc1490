import { minutesToHours } from '../../../shared/commission-lifecycle';
import { addDays, isoWeek, localDateOf, parseLocalDate } from '../../../shared/dates';
import {
  earliestDelivery,
  forecast,
  weeklyHours,
  type CommissionForecast,
  type CommissionWork,
  type Forecast,
  type ForecastInput,
  type StageWork,
} from '../../../shared/schedule';
import {
  forecastInput,
  type EarliestDeliveryQuery,
  type EarliestDeliveryView,
  type QueueOrderInput,
  type ScheduleQuery,
  type ScheduledCommission,
  type ScheduledFigure,
  type ScheduleView,
  type TimelineWeek,
} from '../../../shared/schemas/schedule';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { Actor, CapacityService } from '../capacity/capacity.service';
import { deepFreeze } from '../../lib/deep-freeze';
import { forecastCache } from './forecast-cache';
import type { QueueRow, ScheduleRepository, WorkFigureRow, WorkStageRow } from './schedule.repository';
import { groupBy } from '../../lib/group-by';

const HOUR_MIN = 60;

/** `count` ISO 8601 weeks, the first holding `from`: week-numbering year, number, Monday and Sunday. */
export function timelineWeeks(from: string, count: number): TimelineWeek[] {
  const monday = addDays(from, 1 - isoWeek(from).weekday);
  return Array.from({ length: count }, (_, i) => {
    const start = addDays(monday, 7 * i);
    const w = isoWeek(start);
    return { year: w.year, week: w.week, label: `W${String(w.week).padStart(2, '0')}`, start, end: addDays(start, 6) };
  });
}

const daysBetween = (from: string, to: string) => parseLocalDate(to) - parseLocalDate(from);

/** A stage as the forecast sees it: bench time left is the estimate less the time logged on it. */
function stageWork(s: WorkStageRow, loggedMinutes: number, now: string): StageWork {
  const waitHoursAfter = s.wait_minutes / HOUR_MIN;
  if (s.status === 'skipped') return { id: s.id, remainingHours: 0 };
  if (s.status === 'done') return { id: s.id, remainingHours: 0, waitHoursAfter, finishedAt: s.done_at };
  const remaining = Math.max(0, s.estimate_minutes - loggedMinutes);
  // Not done but no time left on the estimate: treat it as finishing now, so its wait still counts.
  return remaining > 0 ? { id: s.id, remainingHours: remaining / HOUR_MIN, waitHoursAfter } : { id: s.id, remainingHours: 0, waitHoursAfter, finishedAt: now };
}

type Work = { figures: WorkFigureRow[]; stages: WorkStageRow[]; logged: ReadonlyMap<number, number> };

function workOf(cs: Pick<QueueRow, 'id' | 'due_date'>[], work: Work, now: string): CommissionWork[] {
  const figuresOf = groupBy(work.figures, (f) => f.commission_id);
  const stagesOf = groupBy(work.stages, (s) => s.figure_id);
  return cs.map((c) => ({
    id: c.id,
    dueDate: c.due_date,
    figures: (figuresOf.get(c.id) ?? []).map((f) => ({
      id: f.id,
      painterId: f.painter_id,
      stages: (stagesOf.get(f.id) ?? []).map((s) => stageWork(s, work.logged.get(s.id) ?? 0, now)),
    })),
  }));
}

const commissionWork = (c: Pick<QueueRow, 'id' | 'due_date'>, work: Work, now: string) => workOf([c], work, now)[0];

export type StudioForecast = {
  input: ForecastInput;
  forecast: Forecast;
  today: string;
  queue: QueueRow[];
  work: Work;
  painters: { id: number; name: string; weeklyHours: number }[];
  names: ReadonlyMap<number, string>;
};

type RunResult = StudioForecast & { queueLength: number };
/** A run as the cache keeps it: the whole queue (for `through`) beside the forecast of its first places. */
type Kept = { whole: QueueRow[]; result: RunResult };

const MINUTE_MS = 60_000;
/** The forecast's "now": the start of the clock's minute, so one worked-out forecast answers for the whole minute. */
const minuteOf = (d: Date) => new Date(Math.floor(d.getTime() / MINUTE_MS) * MINUTE_MS);

/** Prefixes of each kept run worked out so far, by length: a run's first n places are the same object every time. */
const prefixes = new WeakMap<Kept, Map<number, RunResult>>();

/** The first `n` places of a kept run (the forecast of a place depends only on the places before it). */
function prefix(kept: Kept, n: number): RunResult {
  const r = kept.result;
  if (n >= r.queue.length) return r;
  let byLength = prefixes.get(kept);
  if (!byLength) prefixes.set(kept, (byLength = new Map()));
  let p = byLength.get(n);
  if (!p) {
    p = deepFreeze({
      ...r,
      queue: r.queue.slice(0, n),
      input: { ...r.input, queue: r.input.queue.slice(0, n) },
      forecast: { ...r.forecast, commissions: r.forecast.commissions.slice(0, n) },
    });
    byLength.set(n, p);
  }
  return p;
}

/**
 * `cacheStages`: how many stages the in-memory forecast cache may hold across studios (0: no cache, every
 * run reads the database; default 200,000).
 */
export function scheduleService(deps: { db: Db; repo: ScheduleRepository; capacity: CapacityService; clock: Clock; cacheStages?: number }) {
  const { db, repo, capacity, clock } = deps;
  const maxStages = deps.cacheStages ?? 200_000;
  const cache = maxStages > 0 ? forecastCache<Kept>({ maxWeight: maxStages, weigh: (k) => k.result.work.stages.length + k.whole.length + 1 }) : null;

  /**
   * Reads the queue, the work left and the painters' time from the database and runs the forecast, as of
   * the start of the current minute. `through` (a count) stops the queue there: the forecast books
   * commissions in queue order, so those after a place never change where the ones before it land, and a
   * page of the timeline needs only the work up to its last commission. `queueLength` is the whole
   * queue's length either way.
   *
   * The answer is kept per studio, under the studio's schedule version and the minute, and frozen: while
   * neither moves, a run reads only the version. A kept run of the first n places answers any `through`
   * up to n, by the rule above; one that needs more places works them out afresh.
   */
  async function run(studioId: number, opts: { through?: (queue: QueueRow[]) => number } = {}): Promise<RunResult> {
    const nowDate = minuteOf(clock.now());
    const fresh = async () => deepFreeze(await compute(studioId, nowDate, opts.through));
    if (!cache) return (await fresh()).result;
    const version = await repo.version(studioId);
    if (version === undefined) return (await fresh()).result;
    const key = { studioId, version, minute: nowDate.getTime() };
    const kept = cache.get(key);
    if (kept) {
      const k = await kept;
      const n = opts.through ? opts.through(k.whole) : k.whole.length;
      if (n <= k.result.queue.length) return prefix(k, n);
    }
    return (await cache.set(key, fresh())).result;
  }

  async function compute(studioId: number, nowDate: Date, through?: (queue: QueueRow[]) => number): Promise<Kept> {
    const now = iso(nowDate);
    const [whole, cap] = await Promise.all([repo.queue(studioId), capacity.forForecast(studioId)]);
    const queue = through ? whole.slice(0, through(whole)) : whole;
    const work = await repo.work(studioId, queue.map((c) => c.id));
    const input: ForecastInput = {
      timeZone: cap.timeZone,
      now,
      painters: cap.painters.map(({ id, hours, daysOff }) => ({ id, hours, daysOff })),
      closedDays: cap.closedDays,
      queue: workOf(queue, work, now),
    };
    // The database is ours, but a bad row (a malformed date) should fail here with a clear cause.
    const checked = forecastInput.safeParse(input);
    if (!checked.success) throw new Error(`Forecast input from the database is not valid: ${checked.error.message}`);
    const names = new Map(cap.painters.map((p) => [p.id, p.name]));
    const strangers = [...new Set(work.figures.map((f) => f.painter_id).filter((id): id is number => id !== null && !names.has(id)))];
    for (const u of await repo.userNames(strangers)) names.set(u.id, u.name);
    const result: RunResult = {
      input,
      forecast: forecast(input),
      today: localDateOf(nowDate.getTime(), cap.timeZone),
      queue,
      work,
      painters: cap.painters.map((p) => ({ id: p.id, name: p.name, weeklyHours: Math.round(weeklyHours(p) * 100) / 100 })),
      names,
      queueLength: whole.length,
    };
    return { whole, result };
  }

  /** Values worked out from a run, kept beside it: a run never changes, so they hold for as long as it is used. */
  const derivedOf = new WeakMap<StudioForecast, Map<string, unknown>>();

  /**
   * `compute()`'s value for this run and `key`, worked out once per run and frozen (a kept run is answered
   * to every request of its minute and version, and so is what is derived from it).
   */
  function derived<T>(sf: StudioForecast, key: string, compute: () => T): T {
    let values = derivedOf.get(sf);
    if (!values) derivedOf.set(sf, (values = new Map()));
    if (!values.has(key)) values.set(key, deepFreeze(compute()));
    return values.get(key) as T;
  }

  function remainingOf(stages: StageWork[]) {
    return minutesToHours(Math.round(stages.reduce((n, s) => n + s.remainingHours * HOUR_MIN, 0)));
  }

  /**
   * The forecast of each commission (of those at the places `only`, if given) joined with its title,
   * client, figures and place in the queue. The whole queue for the team is worked out once per run.
   */
  function describe(sf: StudioForecast, forClient: boolean, only?: number[]): ScheduledCommission[] {
    if (forClient) return describeAt(sf, true, only);
    const all = derived(sf, 'describe', () => describeAt(sf, false));
    return only ? only.map((i) => all[i]) : all;
  }

  function describeAt(sf: StudioForecast, forClient: boolean, only?: number[]): ScheduledCommission[] {
    const stageNames = new Map(sf.work.stages.map((s) => [s.id, s.name]));
    const figureRows = new Map(sf.work.figures.map((f) => [f.id, f]));
    const places = only ?? sf.forecast.commissions.map((_, i) => i);
    return places.map((i) => {
      const fc = sf.forecast.commissions[i];
      const row = sf.queue[i];
      const work = sf.input.queue[i];
      const figures: ScheduledFigure[] = fc.figures.map((ff, j) => {
        const f = figureRows.get(Number(ff.id))!;
        const painterId = ff.painterId === null ? null : Number(ff.painterId);
        return {
          id: f.id,
          name: f.name,
          quantity: f.quantity,
          painter: forClient || painterId === null ? null : { id: painterId, name: sf.names.get(painterId) ?? 'Former member' },
          painterChosen: forClient ? false : ff.painterChosen,
          remainingHours: remainingOf(work.figures[j].stages as StageWork[]),
          start: ff.start,
          finish: ff.finish,
          startDate: ff.startDate,
          finishDate: ff.finishDate,
          late: ff.late,
          unscheduled: ff.unscheduled,
          ...(forClient ? {} : { blocks: ff.blocks.map((b) => ({ stageId: Number(b.stageId), stageName: stageNames.get(Number(b.stageId)) ?? '', start: b.start, end: b.end })) }),
        };
      });
      return {
        id: row.id,
        title: row.title,
        status: row.status,
        client: { id: row.client_id, name: row.client_name },
        dueDate: row.due_date,
        queuePosition: i + 1,
        remainingHours: remainingOf(work.figures.flatMap((f) => f.stages as StageWork[])),
        start: fc.start,
        finish: fc.finish,
        startDate: fc.startDate,
        finishDate: fc.finishDate,
        late: fc.late,
        slackDays: row.due_date && fc.finishDate ? daysBetween(fc.finishDate, row.due_date) : null,
        unscheduled: fc.figures.find((f) => f.unscheduled)?.unscheduled ?? null,
        figures,
      };
    });
  }

  /**
   * One page of the timeline: the studio's queue from `offset`, or for a client their own commissions
   * from `offset` (nothing of anyone else's). The forecast runs up to the page's last commission only.
   */
  async function view(actor: Actor, q: ScheduleQuery): Promise<ScheduleView> {
    return (await viewOf(actor, q)).answer();
  }

  /** The run a page of the timeline is read from, and the page's answer worked out from it. */
  async function viewOf(actor: Actor, q: ScheduleQuery): Promise<{ sf: StudioForecast; answer: () => ScheduleView }> {
    const forClient = actor.role === 'client';
    const mine = (queue: QueueRow[]) => queue.flatMap((c, i) => (!forClient || c.client_id === actor.clientId ? [i] : []));
    let places: number[] = [];
    let total = 0;
    const sf = await run(actor.studioId, {
      through: (queue) => {
        const all = mine(queue);
        total = all.length;
        places = all.slice(q.offset, q.offset + q.limit);
        return places.length ? places[places.length - 1] + 1 : 0;
      },
    });
    const answer = (): ScheduleView => {
      const commissions = describe(sf, forClient, places);
      return {
        timeZone: sf.input.timeZone,
        now: sf.input.now,
        today: sf.today,
        weeks: timelineWeeks(q.from ?? sf.today, q.weeks),
        painters: forClient ? [] : sf.painters,
        commissions: forClient ? commissions.map((c) => ({ ...c, queuePosition: null })) : commissions,
        total,
        limit: q.limit,
        offset: q.offset,
      };
    };
    return { sf, answer };
  }

  /** The last answers of the team's timeline as JSON, per run (a run of a version and minute is frozen). */
  const teamJson = new WeakMap<StudioForecast, Map<string, string>>();
  const TEAM_JSON_KEPT = 2;

  /**
   * The timeline's answer as JSON text. The team's answer of a run is the same for the same query, so its
   * text is kept beside the run (the last two queries); a client's is written out each time.
   */
  async function viewJson(actor: Actor, q: ScheduleQuery): Promise<string> {
    if (actor.role === 'client') return JSON.stringify(await view(actor, q));
    const key = JSON.stringify([q.from ?? null, q.weeks, q.limit, q.offset]);
    const { sf, answer } = await viewOf(actor, q);
    let kept = teamJson.get(sf);
    if (!kept) teamJson.set(sf, (kept = new Map()));
    let text = kept.get(key);
    if (text === undefined) {
      text = JSON.stringify(answer());
      if (kept.size >= TEAM_JSON_KEPT) kept.delete(kept.keys().next().value!);
      kept.set(key, text);
    }
    return text;
  }

  function deliveryView(sf: StudioForecast, fc: CommissionForecast, hours: number, ahead: number): EarliestDeliveryView {
    return {
      timeZone: sf.input.timeZone,
      today: sf.today,
      date: fc.finishDate,
      start: fc.start,
      finish: fc.finish,
      hours: minutesToHours(Math.round(hours * HOUR_MIN)),
      unscheduled: fc.figures.find((f) => f.unscheduled)?.unscheduled ?? null,
      queueLength: ahead,
    };
  }

  return {
    run,
    describe,
    derived,
    view,
    viewJson,

    /** Puts the queue in a new order; the list must hold exactly the commissions in the queue now. */
    async reorder(actor: Actor, input: QueueOrderInput) {
      await db.transaction(async (trx) => {
        const current = await repo.queue(actor.studioId, trx);
        const ids = new Set(current.map((c) => c.id));
        const same = input.commissionIds.length === ids.size && input.commissionIds.every((id) => ids.has(id));
        if (!same) {
          throw errors.conflict('The queue changed while you were arranging it (a commission was booked, started or finished). Reload the queue and try again.', 'queue_changed', {
            queue: current.map((c) => c.id),
          });
        }
        await repo.setOrder(trx, actor.studioId, input.commissionIds);
      });
      return view(actor, { weeks: 8, limit: 25, offset: 0 });
    },

    /** "If booked today": the projected finish of this work added at the end of the queue now. */
    async earliestDelivery(actor: Actor, q: EarliestDeliveryQuery): Promise<EarliestDeliveryView> {
      const sf = await run(actor.studioId);
      if (q.painterId !== undefined && !sf.painters.some((p) => p.id === q.painterId)) throw errors.field('painterId', 'Choose a painter or owner of this studio.');
      if (q.commissionId !== undefined) {
        const c = await repo.commission(actor.studioId, q.commissionId);
        if (!c) throw errors.notFound('That commission');
        const inQueue = sf.queue.findIndex((x) => x.id === c.id);
        const work = inQueue >= 0 ? sf.input.queue[inQueue] : commissionWork(c, await repo.work(actor.studioId, [c.id]), sf.input.now);
        const hours = work.figures.flatMap((f) => f.stages).reduce((n, s) => n + s.remainingHours, 0);
        // Already booked: it has its place; otherwise it joins the end of the queue.
        if (inQueue >= 0) return deliveryView(sf, sf.forecast.commissions[inQueue], hours, inQueue);
        const placed = q.painterId === undefined ? work : { ...work, figures: work.figures.map((f) => ({ ...f, painterId: q.painterId! })) };
        return deliveryView(sf, earliestDelivery(sf.input, placed), hours, sf.queue.length);
      }
      const hours = q.hours!;
      const work: CommissionWork = {
        id: 'new',
        figures: [{ id: 'new', painterId: q.painterId ?? null, stages: [{ id: 'work', remainingHours: hours, waitHoursAfter: q.waitHours ?? 0 }] }],
      };
      return deliveryView(sf, earliestDelivery(sf.input, work), hours, sf.queue.length);
    },
  };
}

export type ScheduleService = ReturnType<typeof scheduleService>;
