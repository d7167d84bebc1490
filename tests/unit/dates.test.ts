import { readFileSync } from 'node:fs';
import { TZDate } from '@date-fns/tz';
import { getISODay, getISOWeek, getISOWeekYear } from 'date-fns';
import { describe, expect, it } from 'vitest';
import {
  DAY_MS,
  ZoneDays,
  addDays,
  civilDate,
  dayNumber,
  formatDayNumber,
  formatInstant,
  isoWeek,
  isoWeekdayOfDay,
  localDateOf,
  localDayOf,
  parseClock,
  parseInstant,
  parseLocalDate,
  zonedInstant,
} from '../../shared/dates';

// Published reference data; the test fails if the file is missing.
const TSV = new URL('../../../shared/reference/iso8601_week_dates.tsv', import.meta.url);

function readReference() {
  const lines = readFileSync(TSV, 'utf8').split(/\r?\n/).filter((l) => l.trim() !== '');
  const source = lines.filter((l) => l.startsWith('#')).join(' ');
  const [header, ...rows] = lines.filter((l) => !l.startsWith('#'));
  const cols = header.split('\t');
  return {
    source,
    rows: rows.map((r) => {
      const cells = r.split('\t');
      expect(cells).toHaveLength(cols.length);
      return Object.fromEntries(cols.map((c, i) => [c, cells[i]])) as Record<string, string>;
    }),
  };
}

const WEEKDAY_NAMES = ['', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];

describe('isoWeek against ../shared/reference/iso8601_week_dates.tsv', () => {
  // Source (from the file's header): ISO 8601 week-date worked examples as tabulated in Wikipedia
  // "ISO week date" (Examples section), reproduced in github reconhub/aweek tests/testthat/test-examples.R,
  // plus the 1-January table for 2001-2019 in tests/testthat/test-date2week.R (commit 12785ec3),
  // re-checked there against Python's date.isocalendar().
  const { source, rows } = readReference();

  it('reads the reference file and its source line', () => {
    expect(source).toContain('ISO week date');
    expect(rows.length).toBeGreaterThan(20);
  });

  it.each(rows.map((r) => [r.date, r] as const))('%s matches its ISO week date', (date, row) => {
    const w = isoWeek(date);
    expect(w).toEqual({ year: Number(row.iso_week_year), week: Number(row.iso_week), weekday: Number(row.iso_weekday) });
    expect(`${w.year}-W${String(w.week).padStart(2, '0')}-${w.weekday}`).toBe(row.iso_week_date);
    expect(WEEKDAY_NAMES[isoWeekdayOfDay(parseLocalDate(date))]).toBe(row.weekday);
    expect(w.year !== Number(date.slice(0, 4)) ? 'yes' : 'no').toBe(row.week_year_differs_from_calendar_year);
  });
});

describe('isoWeek against date-fns for every day of 1990-2040', () => {
  it('agrees with getISOWeek, getISOWeekYear and getISODay', () => {
    const mismatches: string[] = [];
    for (let n = dayNumber(1990, 1, 1); n <= dayNumber(2040, 12, 31); n++) {
      const { year, month, day } = civilDate(n);
      const d = new Date(year, month - 1, day, 12); // date-fns reads the local fields of a Date
      const ours = isoWeek({ year, month, day });
      if (ours.year !== getISOWeekYear(d) || ours.week !== getISOWeek(d) || ours.weekday !== getISODay(d)) {
        mismatches.push(formatDayNumber(n));
      }
    }
    expect(mismatches).toEqual([]);
  });
});

describe('civil dates', () => {
  it('numbers days from 1970-01-01, a Thursday', () => {
    expect(dayNumber(1970, 1, 1)).toBe(0);
    expect(isoWeekdayOfDay(0)).toBe(4);
    expect(dayNumber(2000, 3, 1)).toBe(11017); // 30 years incl. 7 leap days + Jan and Feb 2000: 10957 + 31 + 29
    expect(isoWeekdayOfDay(-1)).toBe(3);
    expect(formatDayNumber(-1)).toBe('1969-12-31');
  });

  it('round-trips every day from 1600 to 2400 and checks real dates', () => {
    for (let n = dayNumber(1600, 1, 1); n <= dayNumber(2400, 12, 31); n += 1) {
      const c = civilDate(n);
      if (dayNumber(c.year, c.month, c.day) !== n) throw new Error(`round trip failed at ${n}`);
    }
    expect(parseLocalDate('2024-02-29')).toBe(dayNumber(2024, 2, 29));
    expect(() => parseLocalDate('2023-02-29')).toThrow(RangeError);
    expect(() => parseLocalDate('2025-02-30')).toThrow(RangeError);
    expect(() => parseLocalDate('2025-13-01')).toThrow(RangeError);
    expect(() => parseLocalDate('2025-1-01')).toThrow(RangeError);
    expect(addDays('2024-12-30', 3)).toBe('2025-01-02');
    expect(() => isoWeek({ year: 2025, month: 2, day: 30 })).toThrow(RangeError);
  });

  it('parses clock times and instants strictly', () => {
    expect(parseClock('09:00')).toBe(540);
    expect(parseClock('24:00')).toBe(1440);
    expect(() => parseClock('24:30')).toThrow(RangeError);
    expect(() => parseClock('9:00')).toThrow(RangeError);
    expect(parseInstant('2025-03-03T09:00:00+09:00')).toBe(Date.UTC(2025, 2, 3, 0));
    expect(parseInstant('2025-03-03T00:00Z')).toBe(Date.UTC(2025, 2, 3, 0));
    expect(() => parseInstant('2025-03-03T09:00:00')).toThrow(RangeError); // would depend on the machine's zone
  });

  it('formats instants exactly like toISOString', () => {
    const samples = [0, 1, 999, -1, Date.UTC(1969, 6, 20, 20, 17), Date.UTC(2100, 1, 28, 23, 59, 59, 999), 1.5, 8.64e15];
    for (let i = 0; i < 2000; i++) samples.push(Math.floor(Math.sin(i + 1) * 4e12) + 1e12);
    for (const ms of samples) expect(formatInstant(ms)).toBe(new Date(ms).toISOString());
  });
});

describe('local wall time <-> instant', () => {
  const day = parseLocalDate;

  it('keeps 09:00 local across the Berlin and New York spring changes', () => {
    expect(zonedInstant(day('2025-03-28'), 540, 'Europe/Berlin')).toBe(Date.UTC(2025, 2, 28, 8)); // CET, UTC+1
    expect(zonedInstant(day('2025-03-31'), 540, 'Europe/Berlin')).toBe(Date.UTC(2025, 2, 31, 7)); // CEST, UTC+2
    expect(zonedInstant(day('2025-03-07'), 540, 'America/New_York')).toBe(Date.UTC(2025, 2, 7, 14)); // EST, UTC-5
    expect(zonedInstant(day('2025-03-10'), 540, 'America/New_York')).toBe(Date.UTC(2025, 2, 10, 13)); // EDT, UTC-4
  });

  it('moves a skipped wall time on by the jump, and takes the first of a repeated one', () => {
    // Berlin 2025-03-30: 02:00 CET -> 03:00 CEST, so 02:30 does not exist; it becomes 03:30 CEST = 01:30Z.
    expect(zonedInstant(day('2025-03-30'), 150, 'Europe/Berlin')).toBe(Date.UTC(2025, 2, 30, 1, 30));
    // Berlin 2025-10-26: 03:00 CEST -> 02:00 CET, so 02:30 happens twice; first (CEST) = 00:30Z.
    expect(zonedInstant(day('2025-10-26'), 150, 'Europe/Berlin')).toBe(Date.UTC(2025, 9, 26, 0, 30));
    // New York 2025-03-09 02:30 does not exist -> 03:30 EDT = 07:30Z; 2025-11-02 01:30 first as EDT = 05:30Z.
    expect(zonedInstant(day('2025-03-09'), 150, 'America/New_York')).toBe(Date.UTC(2025, 2, 9, 7, 30));
    expect(zonedInstant(day('2025-11-02'), 90, 'America/New_York')).toBe(Date.UTC(2025, 10, 2, 5, 30));
    // Lord Howe Island moves 30 minutes: 2025-10-05 02:00 +10:30 -> 02:30 +11:00; 02:15 -> 02:45 +11:00.
    expect(zonedInstant(day('2025-10-05'), 135, 'Australia/Lord_Howe')).toBe(Date.UTC(2025, 9, 4, 15, 45));
    // (values checked with Python zoneinfo)
  });

  it('agrees with TZDate at ordinary wall times in several zones', () => {
    for (const tz of ['Europe/Berlin', 'America/New_York', 'Australia/Sydney', 'Asia/Kolkata', 'America/Sao_Paulo']) {
      for (let n = day('2024-01-01'); n <= day('2026-12-31'); n += 3) {
        const { year, month, day: d } = civilDate(n);
        for (const minutes of [540, 900, 1200]) {
          const expected = new TZDate(year, month - 1, d, Math.floor(minutes / 60), minutes % 60, tz).getTime();
          if (zonedInstant(n, minutes, tz) !== expected) throw new Error(`${tz} ${formatDayNumber(n)} ${minutes}`);
        }
      }
    }
  });

  it('ZoneDays gives the same answers as the careful functions, change days included', () => {
    for (const tz of ['Europe/Berlin', 'America/New_York', 'Australia/Lord_Howe', 'Pacific/Kiritimati', 'Pacific/Pago_Pago', 'UTC']) {
      const z = ZoneDays.of(tz);
      for (let n = day('2025-01-01'); n <= day('2025-12-31'); n++) {
        for (const minutes of [0, 90, 135, 150, 540, 1440]) {
          if (z.instantAt(n, minutes) !== zonedInstant(n, minutes, tz)) throw new Error(`instantAt ${tz} ${n} ${minutes}`);
        }
      }
      for (let ms = Date.UTC(2025, 0, 1); ms < Date.UTC(2026, 0, 1); ms += 3_600_000 + 60_000) {
        if (z.dayOf(ms) !== localDayOf(ms, tz)) throw new Error(`dayOf ${tz} ${ms}`);
      }
    }
  });

  it('finds the local date of an instant', () => {
    // 2025-03-03T15:30Z is already Tuesday 00:30 in Tokyo, still Monday in New York.
    expect(localDateOf(Date.UTC(2025, 2, 3, 15, 30), 'Asia/Tokyo')).toBe('2025-03-04');
    expect(localDateOf(Date.UTC(2025, 2, 3, 15, 30), 'America/New_York')).toBe('2025-03-03');
    expect(localDayOf(DAY_MS - 1, 'UTC')).toBe(0);
  });

  it('refuses an unknown zone', () => {
    expect(() => new ZoneDays('Mars/Olympus')).toThrow(RangeError);
  });
});
