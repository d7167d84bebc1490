import {
  HOUR_MS,
  type LocalDate,
  ZoneDays,
  formatDayNumber,
  formatInstant,
  isoWeekdayOfDay,
  parseClock,
  parseInstant,
  parseLocalDate,
} from './dates';

// The timeline labels its weeks with ISO 8601 numbers; callers of the schedule get them from here too.
export { isoWeek } from './dates';

/*
 * Capacity forecast: when will each booked commission really be finished?
 *
 * Rules (the owner sees the results, so each one is deliberate):
 * - Working time. Each painter has wall-clock ranges per ISO weekday in the studio's zone
 *   (`{1: [{start: '09:00', end: '15:00'}], ...}`; several ranges a day allowed, e.g. a lunch break;
 *   `end` may be '24:00'; ranges do not cross midnight). Days off of the painter and studio closed days
 *   (local dates) have no working time. 09:00 stays 09:00 local across daylight-saving changes.
 * - Queue order is priority. Commissions are walked in queue order and their figures in the order given;
 *   each figure's stages are booked in order into the earliest free working time of its painter at or
 *   after the moment the stage may start. Work already booked is never moved, so a commission's forecast
 *   depends only on the commissions ahead of it, and moving one up can only bring it forward.
 * - Waits pass in real time: a stage's `waitHoursAfter` (drying, curing) counts wall-clock hours,
 *   nights, weekends and days off included; the figure's next stage may start when the wait is over.
 *   While a figure waits its painter's hours stay free, and later figures fill them ("B starts while A's
 *   varnish cures"). A figure ahead in the queue takes back its painter's time when its wait ends.
 * - Partial hours. Hours are fractional (1.5 = 90 minutes, kept to the millisecond); a stage is split
 *   across working ranges, days and free gaps as needed, giving one work block per piece.
 * - A figure is finished when its last stage's work ends PLUS that stage's wait: the wait after varnish
 *   is curing before the figure can be packed and shipped. A commission is finished when its last figure
 *   is; `late` when that moment's local date is after the due date (finishing on the due date is on time).
 * - Unassigned figures (`painterId: null`) go to the painter whose earliest free working moment (from
 *   `now`, given everything booked so far) comes first; a tie goes to the painter listed first. Painters
 *   without any weekly hours are never chosen. The choice is made when the walk reaches the figure.
 * - Done work. A stage with `remainingHours: 0` needs no time. If it carries `finishedAt` (from its done
 *   record) its wait is counted from then; without a record its wait is taken as already passed. A figure
 *   with no work left is finished at its latest record plus wait (possibly before `now`), or at `now`
 *   when there is no record; its `start` is null.
 * - A figure that cannot be placed (unknown painter, a painter without weekly hours, more work than the
 *   ten-year horizon holds) gets null dates and an `unscheduled` reason, and so does its commission.
 *
 * Cost: working ranges are worked out once per painter-day (zone conversion and day-off lookup), laid end
 * to end as a "working-time axis" with prefix sums; booking and lookups are binary searches on that axis
 * and on a short sorted list of free gaps, so the walk is O(stages · log days).
 */

export type Id = string | number;
/** An ISO 8601 instant with `Z` or an offset (output instants are always UTC, `...Z`). */
export type Instant = string;

export interface TimeRange {
  start: string; // 'HH:mm', local wall time
  end: string; // 'HH:mm', after start, up to '24:00'
}
/** Keys are ISO weekdays, 1 = Monday .. 7 = Sunday (as numbers, or as the strings JSON gives). */
export interface WeeklyHours {
  readonly [isoWeekday: number]: readonly TimeRange[] | undefined;
}

export interface PainterCapacity {
  id: Id;
  hours: WeeklyHours;
  daysOff?: readonly LocalDate[];
}

export interface StageWork {
  id: Id;
  /** Hours of bench work still to do; 0 when the stage is done. */
  remainingHours: number;
  /** Real (wall-clock) hours the figure must rest after this stage before the next one, or before shipping. */
  waitHoursAfter?: number;
  /** When a done stage was finished (its done record); its wait counts from here. */
  finishedAt?: Instant | null;
}

export interface FigureWork {
  id: Id;
  painterId: Id | null;
  stages: readonly StageWork[];
}

export interface CommissionWork {
  id: Id;
  dueDate?: LocalDate | null;
  figures: readonly FigureWork[];
}

export interface ForecastInput {
  /** IANA zone of the studio, e.g. 'Europe/Berlin'. */
  timeZone: string;
  now: Instant;
  painters: readonly PainterCapacity[];
  /** Studio closed days (public holidays): no painter works. */
  closedDays?: readonly LocalDate[];
  /** Booked and on-the-bench commissions in queue order. */
  queue: readonly CommissionWork[];
}

export interface WorkBlock {
  painterId: Id;
  commissionId: Id;
  figureId: Id;
  stageId: Id;
  start: Instant;
  end: Instant;
}

export type UnscheduledReason = 'unknown-painter' | 'no-working-hours' | 'beyond-horizon';

export interface FigureForecast {
  id: Id;
  /** The given painter, or the one chosen for an unassigned figure (null if none was needed or possible). */
  painterId: Id | null;
  painterChosen: boolean;
  /** First work block; null when no work is left. */
  start: Instant | null;
  startDate: LocalDate | null;
  /** End of the last work block, before the final wait. */
  workEnd: Instant | null;
  /** Ready to ship: last work plus its wait (see the rules above). */
  finish: Instant | null;
  finishDate: LocalDate | null;
  late: boolean;
  unscheduled: UnscheduledReason | null;
  blocks: WorkBlock[];
}

export interface CommissionForecast {
  id: Id;
  dueDate: LocalDate | null;
  start: Instant | null;
  startDate: LocalDate | null;
  finish: Instant | null;
  finishDate: LocalDate | null;
  late: boolean;
  figures: FigureForecast[];
}

export interface Forecast {
  timeZone: string;
  now: Instant;
  commissions: CommissionForecast[];
}

/** Bookings stop this many days after `now`; work beyond it is reported as `beyond-horizon`. */
export const HORIZON_DAYS = 3660;

type DayRanges = Array<readonly [number, number]>; // minutes after local midnight, sorted, disjoint

interface PainterPlan {
  id: Id;
  byWeekday: DayRanges[]; // index 1..7
  off: Set<number>; // day numbers
  weeklyMinutes: number;
}

function planPainter(p: PainterCapacity, closed: ReadonlySet<number>): PainterPlan {
  const byWeekday: DayRanges[] = [[], [], [], [], [], [], [], []];
  const entries = Object.entries(p.hours ?? {}) as Array<[string, readonly TimeRange[] | undefined]>;
  for (const [key, ranges] of entries) {
    const wd = Number(key);
    if (!Number.isInteger(wd) || wd < 1 || wd > 7) {
      throw new RangeError(`Painter ${p.id}: weekday keys are ISO weekdays 1 (Monday) to 7 (Sunday), got ${key}`);
    }
    const parsed = (ranges ?? []).map((r) => {
      const s = parseClock(r.start);
      const e = parseClock(r.end);
      if (e <= s) throw new RangeError(`Painter ${p.id}: range ${r.start}-${r.end} must end after it starts`);
      return [s, e] as [number, number];
    });
    parsed.sort((a, b) => a[0] - b[0]);
    const merged: Array<[number, number]> = [];
    for (const r of parsed) {
      const last = merged[merged.length - 1];
      if (last && r[0] <= last[1]) last[1] = Math.max(last[1], r[1]);
      else merged.push([r[0], r[1]]);
    }
    byWeekday[wd] = merged;
  }
  const off = new Set(closed);
  for (const d of p.daysOff ?? []) off.add(parseLocalDate(d));
  let weeklyMinutes = 0;
  for (const day of byWeekday) for (const [s, e] of day) weeklyMinutes += e - s;
  return { id: p.id, byWeekday, off, weeklyMinutes };
}

/**
 * One painter's working time laid out as an axis of working milliseconds counted from `now`
 * (coordinate 0 = the first working moment at or after now), built lazily one local day at a time.
 * Booked time is everything before `frontier` except the free `gaps` left while figures waited.
 */
class PainterLine {
  readonly plan: PainterPlan;
  private readonly zone: ZoneDays;
  private readonly nowMs: number;
  private readonly lastDay: number;
  private nextDay: number;
  private nextDayStart: number; // instant of local midnight of nextDay
  // Working ranges as instants, with prefix sums of their lengths.
  private readonly starts: number[] = [];
  private readonly ends: number[] = [];
  private readonly cumStart: number[] = []; // working ms before range i
  private readonly cumEnd: number[] = []; // working ms up to the end of range i
  private total = 0;
  // Free working time before the frontier, as sorted disjoint [gapA[j], gapB[j]) coordinates.
  private readonly gapA: number[] = [];
  private readonly gapB: number[] = [];
  private frontier = 0;

  constructor(plan: PainterPlan, zone: ZoneDays, nowMs: number, firstDay: number) {
    this.plan = plan;
    this.zone = zone;
    this.nowMs = nowMs;
    this.nextDay = firstDay;
    this.nextDayStart = zone.instantAt(firstDay, 0);
    this.lastDay = firstDay + HORIZON_DAYS;
  }

  private addDay(): boolean {
    const day = this.nextDay;
    if (day > this.lastDay) return false;
    if (!this.plan.off.has(day)) {
      for (const [sm, em] of this.plan.byWeekday[isoWeekdayOfDay(day)]) {
        const s = Math.max(this.zone.instantAt(day, sm), this.nowMs);
        const e = this.zone.instantAt(day, em);
        if (e <= s) continue; // already past, or squeezed out by a clock change
        this.starts.push(s);
        this.ends.push(e);
        this.cumStart.push(this.total);
        this.total += e - s;
        this.cumEnd.push(this.total);
      }
    }
    this.nextDay = day + 1;
    this.nextDayStart = this.zone.instantAt(day + 1, 0);
    return true;
  }

  /** Makes sure the axis holds at least `w` working ms; false past the horizon. */
  private ensureTotal(w: number): boolean {
    while (this.total < w) if (!this.addDay()) return false;
    return true;
  }

  /** Working ms between now and instant t (t in non-working time maps to the next working moment). */
  toWork(t: number): number {
    while (this.nextDayStart <= t) if (!this.addDay()) break;
    const ends = this.ends;
    let lo = 0;
    let hi = ends.length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (ends[mid] > t) hi = mid;
      else lo = mid + 1;
    }
    if (lo === ends.length) return this.total;
    return this.cumStart[lo] + Math.max(0, t - this.starts[lo]);
  }

  /** Index of the range in which working coordinate w begins (cumStart[i] <= w < cumEnd[i]). */
  private rangeStarting(w: number): number {
    const cum = this.cumStart;
    let lo = 0;
    let hi = cum.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >>> 1;
      if (cum[mid] <= w) lo = mid;
      else hi = mid - 1;
    }
    return lo;
  }

  /** Instant at which work at coordinate w starts, or Infinity past the horizon. */
  startAt(w: number): number {
    if (!this.ensureTotal(w + 1)) return Infinity;
    const i = this.rangeStarting(w);
    return this.starts[i] + (w - this.cumStart[i]);
  }

  /** Earliest free working moment, as an instant (Infinity if none within the horizon). */
  earliestFree(): number {
    return this.startAt(this.gapA.length > 0 ? this.gapA[0] : this.frontier);
  }

  /**
   * Books `need` working ms at or after coordinate r into free time, earliest first. Pushes the booked
   * pieces as instant pairs onto `out` and returns the end coordinate, or -1 past the horizon.
   */
  book(r: number, need: number, out: number[]): number {
    const gapA = this.gapA;
    const gapB = this.gapB;
    let lo = 0;
    let hi = gapB.length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (gapB[mid] > r) hi = mid;
      else lo = mid + 1;
    }
    let j = lo;
    let end = -1;
    while (need > 0 && j < gapA.length) {
      const a = Math.max(gapA[j], r);
      const b = gapB[j];
      const take = Math.min(b - a, need);
      this.emit(a, a + take, out);
      end = a + take;
      need -= take;
      if (a > gapA[j] && a + take < b) {
        gapB[j] = a;
        gapA.splice(j + 1, 0, a + take);
        gapB.splice(j + 1, 0, b);
        j += 2;
      } else if (a > gapA[j]) {
        gapB[j] = a;
        j += 1;
      } else if (a + take < b) {
        gapA[j] = a + take;
      } else {
        gapA.splice(j, 1);
        gapB.splice(j, 1);
      }
    }
    if (need > 0) {
      const a = Math.max(this.frontier, r);
      if (!this.ensureTotal(a + need)) return -1;
      if (a > this.frontier) {
        gapA.push(this.frontier);
        gapB.push(a);
      }
      this.emit(a, a + need, out);
      end = a + need;
      this.frontier = end;
    }
    return end;
  }

  private emit(a: number, b: number, out: number[]): void {
    this.ensureTotal(b);
    let i = this.rangeStarting(a);
    let s = this.starts[i] + (a - this.cumStart[i]);
    for (;;) {
      if (this.cumEnd[i] >= b) {
        out.push(s, this.starts[i] + (b - this.cumStart[i]));
        return;
      }
      out.push(s, this.ends[i]);
      i += 1;
      s = this.starts[i];
    }
  }
}

const hoursToMs = (h: number, what: string): number => {
  if (typeof h !== 'number' || !Number.isFinite(h) || h < 0) {
    throw new RangeError(`${what} must be a number of hours >= 0, got ${String(h)}`);
  }
  return Math.round(h * HOUR_MS);
};

export function forecast(input: ForecastInput): Forecast {
  const zone = ZoneDays.of(input.timeZone);
  const nowMs = parseInstant(input.now);
  const firstDay = zone.dayOf(nowMs);
  const closed = new Set((input.closedDays ?? []).map(parseLocalDate));

  const lines = new Map<Id, PainterLine>();
  const capable: PainterLine[] = [];
  for (const p of input.painters) {
    if (lines.has(p.id)) throw new RangeError(`Painter ${p.id} is listed twice`);
    const line = new PainterLine(planPainter(p, closed), zone, nowMs, firstDay);
    lines.set(p.id, line);
    if (line.plan.weeklyMinutes > 0) capable.push(line);
  }

  const dateOf = (ms: number | null): LocalDate | null => (ms === null ? null : zone.dateOf(ms));
  const iso = (ms: number | null): Instant | null => (ms === null ? null : formatInstant(ms));
  const pieces: number[] = [];

  const commissions: CommissionForecast[] = input.queue.map((c) => {
    const due = c.dueDate ?? null;
    if (due !== null) parseLocalDate(due);
    let cStart = Infinity;
    let cFinish = -Infinity;
    let cUnscheduled = false;

    const figures: FigureForecast[] = c.figures.map((f) => {
      const stages = f.stages.map((s) => ({
        id: s.id,
        need: hoursToMs(s.remainingHours, `Stage ${s.id} remainingHours`),
        wait: hoursToMs(s.waitHoursAfter ?? 0, `Stage ${s.id} waitHoursAfter`),
        finishedAt: s.finishedAt ? parseInstant(s.finishedAt) : null,
      }));
      const hasWork = stages.some((s) => s.need > 0);

      let line: PainterLine | undefined;
      let unscheduled: UnscheduledReason | null = null;
      let chosen = false;
      if (hasWork) {
        if (f.painterId === null || f.painterId === undefined) {
          let best = Infinity;
          for (const l of capable) {
            const t = l.earliestFree();
            if (t < best) {
              best = t;
              line = l;
            }
          }
          chosen = line !== undefined;
          if (!line) unscheduled = capable.length > 0 ? 'beyond-horizon' : 'no-working-hours';
        } else {
          line = lines.get(f.painterId);
          if (!line) unscheduled = 'unknown-painter';
          else if (line.plan.weeklyMinutes === 0) unscheduled = 'no-working-hours';
        }
      }
      const painterId = line ? line.plan.id : (f.painterId ?? null);

      const blocks: WorkBlock[] = [];
      let start: number | null = null;
      let workEnd: number | null = null;
      let done = -Infinity; // latest known "stage work + wait" moment
      // The next stage may start at readyMs; readyW is its working coordinate when already known exactly.
      let readyMs = nowMs;
      let readyW = -1;
      for (const s of stages) {
        if (unscheduled) break;
        if (s.need === 0) {
          if (s.finishedAt !== null) {
            const t = s.finishedAt + s.wait;
            if (t > done) done = t;
            if (t > readyMs) {
              readyMs = t;
              readyW = -1;
            }
          }
          continue;
        }
        const l = line as PainterLine;
        const r = readyW >= 0 ? readyW : l.toWork(readyMs);
        pieces.length = 0;
        const endW = l.book(r, s.need, pieces);
        if (endW < 0) {
          unscheduled = 'beyond-horizon';
          break;
        }
        for (let k = 0; k < pieces.length; k += 2) {
          blocks.push({
            painterId: l.plan.id,
            commissionId: c.id,
            figureId: f.id,
            stageId: s.id,
            start: formatInstant(pieces[k]),
            end: formatInstant(pieces[k + 1]),
          });
        }
        if (start === null) start = pieces[0];
        const endMs = pieces[pieces.length - 1];
        workEnd = endMs;
        if (endMs + s.wait > done) done = endMs + s.wait;
        if (s.wait === 0) {
          readyMs = endMs;
          readyW = endW;
        } else {
          readyMs = endMs + s.wait;
          readyW = -1;
        }
      }

      let finish: number | null = null;
      if (unscheduled) {
        cUnscheduled = true;
        start = null;
        workEnd = null;
        blocks.length = 0;
      } else {
        finish = done === -Infinity ? nowMs : done;
        if (start !== null && start < cStart) cStart = start;
        if (finish > cFinish) cFinish = finish;
      }
      const finishDate = dateOf(finish);
      return {
        id: f.id,
        painterId,
        painterChosen: chosen,
        start: iso(start),
        startDate: dateOf(start),
        workEnd: iso(workEnd),
        finish: iso(finish),
        finishDate,
        late: due !== null && finishDate !== null && finishDate > due,
        unscheduled,
        blocks,
      };
    });

    const start = cStart === Infinity || cUnscheduled ? null : cStart;
    const finish = cUnscheduled ? null : cFinish === -Infinity ? nowMs : cFinish;
    const finishDate = dateOf(finish);
    return {
      id: c.id,
      dueDate: due,
      start: iso(start),
      startDate: dateOf(start),
      finish: iso(finish),
      finishDate,
      late: due !== null && finishDate !== null && finishDate > due,
      figures,
    };
  });

  return { timeZone: input.timeZone, now: formatInstant(nowMs), commissions };
}

/**
 * "If booked today": the forecast of `newCommission` appended to the end of the queue now. Its
 * `finishDate` is the earliest delivery date the studio can honestly promise.
 */
export function earliestDelivery(input: ForecastInput, newCommission: CommissionWork): CommissionForecast {
  const result = forecast({ ...input, queue: [...input.queue, newCommission] });
  return result.commissions[result.commissions.length - 1];
}

/** Total working hours in a painter's ordinary week (ignoring days off). */
export function weeklyHours(painter: PainterCapacity): number {
  return planPainter(painter, new Set()).weeklyMinutes / 60;
}

export interface WorkingInterval {
  date: LocalDate;
  start: Instant;
  end: Instant;
}

/**
 * A painter's working intervals on local dates `from`..`to` (inclusive), skipping days off and studio
 * closed days: capacity for utilisation charts. Times follow local wall clocks across clock changes.
 */
export function workingIntervals(
  painter: PainterCapacity,
  timeZone: string,
  from: LocalDate,
  to: LocalDate,
  closedDays: readonly LocalDate[] = [],
): WorkingInterval[] {
  const zone = ZoneDays.of(timeZone);
  const plan = planPainter(painter, new Set(closedDays.map(parseLocalDate)));
  const out: WorkingInterval[] = [];
  const last = parseLocalDate(to);
  for (let day = parseLocalDate(from); day <= last; day++) {
    if (plan.off.has(day)) continue;
    for (const [sm, em] of plan.byWeekday[isoWeekdayOfDay(day)]) {
      const s = zone.instantAt(day, sm);
      const e = zone.instantAt(day, em);
      if (e > s) out.push({ date: formatDayNumber(day), start: formatInstant(s), end: formatInstant(e) });
    }
  }
  return out;
}

/** Sum of working hours in `intervals` (e.g. from `workingIntervals`). */
export function intervalHours(intervals: readonly { start: Instant; end: Instant }[]): number {
  let ms = 0;
  for (const i of intervals) ms += parseInstant(i.end) - parseInstant(i.start);
  return ms / HOUR_MS;
}
