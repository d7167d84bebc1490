import { tzOffset } from '@date-fns/tz';

/**
 * Calendar helpers for the schedule: civil (time-zone-free) dates as day numbers, ISO 8601 week dates,
 * and conversion between a studio's local wall time and instants.
 *
 * A "day number" counts days since 1970-01-01 in the proleptic Gregorian calendar, so date arithmetic is
 * integer arithmetic and never touches the machine's own time zone. Only the wall-time <-> instant
 * conversions need the IANA zone database, which we read through @date-fns/tz (Intl under the hood, so it
 * works the same in the browser and in Node).
 */

/** A calendar date in the studio's zone, `yyyy-mm-dd`. */
export type LocalDate = string;
export type IsoWeekday = 1 | 2 | 3 | 4 | 5 | 6 | 7;
export interface CivilDate {
  year: number;
  month: number; // 1..12
  day: number; // 1..31
}
export interface IsoWeek {
  /** ISO week-numbering year; differs from the calendar year around 1 January. */
  year: number;
  week: number; // 1..53
  weekday: IsoWeekday; // Monday = 1 .. Sunday = 7
}

export const MINUTE_MS = 60_000;
export const HOUR_MS = 3_600_000;
export const DAY_MS = 86_400_000;

// Days-from-civil after Howard Hinnant's public-domain date algorithms (eras of 400 years).
export function dayNumber(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const mp = (month + 9) % 12;
  const doy = Math.floor((153 * mp + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

export function civilDate(n: number): CivilDate {
  const z = n + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  return { year: yoe + era * 400 + (month <= 2 ? 1 : 0), month, day };
}

const LOCAL_DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Parses `yyyy-mm-dd` to a day number; throws a RangeError for malformed or impossible dates (2025-02-30). */
export function parseLocalDate(s: LocalDate): number {
  const m = LOCAL_DATE_RE.exec(s);
  if (!m) throw new RangeError(`Not a yyyy-mm-dd date: ${JSON.stringify(s)}`);
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  const n = dayNumber(year, month, day);
  const back = civilDate(n);
  if (month < 1 || month > 12 || back.month !== month || back.day !== day) {
    throw new RangeError(`No such date: ${s}`);
  }
  return n;
}

export function formatDayNumber(n: number): LocalDate {
  const { year, month, day } = civilDate(n);
  return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
}

export function addDays(date: LocalDate, days: number): LocalDate {
  return formatDayNumber(parseLocalDate(date) + days);
}

/** Monday = 1 .. Sunday = 7. Day 0 (1970-01-01) was a Thursday. */
export function isoWeekdayOfDay(n: number): IsoWeekday {
  return ((((((n + 3) % 7) + 7) % 7) + 1) as IsoWeekday);
}

/**
 * ISO 8601 week date of a calendar date: weeks run Monday..Sunday and week 1 is the week holding the
 * year's first Thursday, so the week belongs to the year its Thursday falls in.
 */
export function isoWeek(date: LocalDate | CivilDate): IsoWeek {
  const n = typeof date === 'string' ? parseLocalDate(date) : dayNumberChecked(date);
  const weekday = isoWeekdayOfDay(n);
  const thursday = n - weekday + 4;
  const year = civilDate(thursday).year;
  const week = Math.floor((thursday - dayNumber(year, 1, 1)) / 7) + 1;
  return { year, week, weekday };
}

function dayNumberChecked(d: CivilDate): number {
  return parseLocalDate(
    `${String(d.year).padStart(4, '0')}-${String(d.month).padStart(2, '0')}-${String(d.day).padStart(2, '0')}`,
  );
}

const CLOCK_RE = /^([01]\d|2[0-4]):([0-5]\d)$/;

/** `HH:mm` (00:00..24:00) to minutes after local midnight. */
export function parseClock(s: string): number {
  const m = CLOCK_RE.exec(s);
  const minutes = m ? Number(m[1]) * 60 + Number(m[2]) : NaN;
  if (!m || minutes > 1440) throw new RangeError(`Not an HH:mm time between 00:00 and 24:00: ${JSON.stringify(s)}`);
  return minutes;
}

const INSTANT_RE = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/;

/**
 * Parses an ISO 8601 instant. An explicit `Z` or offset is required: without one, `Date.parse` would read
 * the machine's own zone and the forecast would depend on where it runs.
 */
export function parseInstant(s: string): number {
  const ms = INSTANT_RE.test(s) ? Date.parse(s) : NaN;
  if (Number.isNaN(ms)) throw new RangeError(`Not an ISO 8601 instant with Z or an offset: ${JSON.stringify(s)}`);
  return ms;
}

const dayPrefixes = new Map<number, string>();
const timeSuffixes = new Map<number, string>();
const MAX_FAST_DAY = dayNumber(9999, 12, 31);

/**
 * The same text as `Date.prototype.toISOString` (`2026-03-02T09:00:00.000Z`). A forecast formats some
 * hundred thousand instants; joining a cached date part to a cached time-of-day part makes one small
 * string instead of a dozen, which keeps the garbage collector out of the way.
 */
export function formatInstant(ms: number): string {
  const day = Math.floor(ms / DAY_MS);
  if (!Number.isInteger(ms) || day < 0 || day > MAX_FAST_DAY) return new Date(ms).toISOString();
  let prefix = dayPrefixes.get(day);
  if (prefix === undefined) {
    if (dayPrefixes.size >= 50_000) dayPrefixes.clear();
    prefix = `${formatDayNumber(day)}T`;
    dayPrefixes.set(day, prefix);
  }
  const t = ms - day * DAY_MS;
  let suffix = timeSuffixes.get(t);
  if (suffix === undefined) {
    if (timeSuffixes.size >= 50_000) timeSuffixes.clear();
    suffix = new Date(t).toISOString().slice(11);
    timeSuffixes.set(t, suffix);
  }
  return prefix + suffix;
}

/** UTC offset of `timeZone` at instant `ms`, in minutes east of UTC (Berlin in summer: 120). */
export function offsetMinutes(timeZone: string, ms: number): number {
  return tzOffset(timeZone, new Date(ms));
}

export function assertTimeZone(timeZone: string): void {
  if (typeof timeZone !== 'string' || timeZone.length === 0 || Number.isNaN(offsetMinutes(timeZone, 0))) {
    throw new RangeError(`Unknown time zone: ${JSON.stringify(timeZone)}`);
  }
}

/** The local calendar day (day number) that instant `ms` falls on in `timeZone`. */
export function localDayOf(ms: number, timeZone: string): number {
  return Math.floor((ms + offsetMinutes(timeZone, ms) * MINUTE_MS) / DAY_MS);
}

export function localDateOf(ms: number, timeZone: string): LocalDate {
  return formatDayNumber(localDayOf(ms, timeZone));
}

/**
 * The instant at which local wall time `minutes` after midnight of local day `day` occurs in `timeZone`.
 * Handles the two daylight-saving cases the way clocks do:
 * - a wall time skipped by a spring-forward change (02:30 in Berlin on the last Sunday of March) moves on
 *   by the size of the jump (03:30 summer time);
 * - a wall time that occurs twice at a fall-back change takes its first occurrence (summer time).
 * Assumes at most one offset change within a day either side, true of every zone in current use.
 */
export function zonedInstant(day: number, minutes: number, timeZone: string): number {
  const wall = day * DAY_MS + minutes * MINUTE_MS; // the wall time read as if it were UTC
  const before = offsetMinutes(timeZone, wall - DAY_MS);
  const after = offsetMinutes(timeZone, wall + DAY_MS);
  const tBefore = wall - before * MINUTE_MS;
  const tAfter = wall - after * MINUTE_MS;
  const okBefore = offsetMinutes(timeZone, tBefore) === before;
  const okAfter = offsetMinutes(timeZone, tAfter) === after;
  if (okBefore && okAfter) return Math.min(tBefore, tAfter);
  if (okBefore) return tBefore;
  if (okAfter) return tAfter;
  return Math.max(tBefore, tAfter); // in a gap: the old offset carries the time past the jump
}

/**
 * Fast repeated conversions for one zone. Offsets are sampled once a week and cached; where two samples
 * two weeks apart agree the zone keeps one offset in between, so wall times there convert with
 * arithmetic alone. Only the weeks around a daylight-saving change are sampled daily, and only the day
 * of the change itself takes the careful path of `zonedInstant`. Assumes no zone changes its offset twice
 * within two weeks (true of the zones in use; Morocco's Ramadan pauses last about a month).
 */
export class ZoneDays {
  readonly timeZone: string;
  private readonly samples = new Map<number, number>();

  constructor(timeZone: string) {
    assertTimeZone(timeZone);
    this.timeZone = timeZone;
  }

  // Offset at 14 h before UTC midnight of day k: the earliest instant any zone (UTC+14) is on local day k.
  private sample(k: number): number {
    let o = this.samples.get(k);
    if (o === undefined) {
      o = offsetMinutes(this.timeZone, k * DAY_MS - 14 * HOUR_MS);
      this.samples.set(k, o);
    }
    return o;
  }

  // The one offset in force from sample(first) to sample(last) (first <= last <= first + 11), or NaN.
  private steady(first: number, last: number): number {
    const w = Math.floor(first / 7) * 7; // first..last lies within w..w+14
    const o = this.sample(w);
    if (o === this.sample(w + 14)) return o;
    const o2 = this.sample(first);
    return o2 === this.sample(last) ? o2 : NaN;
  }

  /** Same result as `zonedInstant(day, minutes, zone)`. */
  instantAt(day: number, minutes: number): number {
    // Local day `day` spans instants within [sample(day), sample(day + 3)) for any offset in -12..+14 h.
    const o = this.steady(day, day + 3);
    if (!Number.isNaN(o)) return day * DAY_MS + minutes * MINUTE_MS - o * MINUTE_MS;
    return zonedInstant(day, minutes, this.timeZone);
  }

  /** Same result as `localDayOf(ms, zone)`. */
  dayOf(ms: number): number {
    const k = Math.floor(ms / DAY_MS);
    const o = this.steady(k - 1, k + 2); // the instants of sample(k - 1) and sample(k + 2) bracket ms
    const offset = Number.isNaN(o) ? offsetMinutes(this.timeZone, ms) : o;
    return Math.floor((ms + offset * MINUTE_MS) / DAY_MS);
  }

  dateOf(ms: number): LocalDate {
    return formatDayNumber(this.dayOf(ms));
  }

  private static readonly shared = new Map<string, ZoneDays>();

  /**
   * One table per zone for the whole process: the zone rules do not change while it runs, and reusing
   * the sampled offsets saves most of the Intl calls of repeated forecasts.
   */
  static of(timeZone: string): ZoneDays {
    let z = ZoneDays.shared.get(timeZone);
    if (!z) {
      z = new ZoneDays(timeZone);
      ZoneDays.shared.set(timeZone, z);
    }
    return z;
  }
}
