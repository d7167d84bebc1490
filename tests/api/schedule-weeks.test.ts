import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signUp, startTestApp, type Caller, type TestApp } from '../support/app';

// The timeline's axis: ISO 8601 week numbers and week-numbering years, checked against the published
// table ../shared/reference/iso8601_week_dates.tsv (ISO 8601 week-date examples from Wikipedia
// "ISO week date", as tabulated in reconhub/aweek's tests; see the file's own source line).
const tsvUrl = new URL('../../../shared/reference/iso8601_week_dates.tsv', import.meta.url);

type Row = { date: string; isoYear: number; isoWeek: number; isoWeekday: number };
function readRows(): Row[] {
  // No skip when the file is missing: readFileSync throws and the test fails.
  const lines = fs.readFileSync(tsvUrl, 'utf8').split('\n').filter((l) => l && !l.startsWith('#'));
  const [header, ...rows] = lines.map((l) => l.split('\t'));
  const col = (name: string) => {
    const i = header.indexOf(name);
    if (i < 0) throw new Error(`column ${name} missing from the reference table`);
    return i;
  };
  return rows.map((r) => ({ date: r[col('date')], isoYear: Number(r[col('iso_week_year')]), isoWeek: Number(r[col('iso_week')]), isoWeekday: Number(r[col('iso_weekday')]) }));
}

const addDays = (date: string, n: number) => new Date(Date.parse(`${date}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

let sw: TestApp;
let owner: Caller;
let base: string;
beforeAll(async () => {
  sw = await startTestApp();
  const s = await signUp(sw, { email: 'weeks@studio.test' });
  owner = s.caller;
  base = `/api/studios/${s.studioId}`;
});
afterAll(() => sw.stop());

describe('timeline weeks follow ISO 8601', () => {
  const rows = readRows();

  it('reads the reference table', () => {
    expect(rows.length).toBeGreaterThanOrEqual(30);
  });

  it('labels the week holding every date of the table as the table does (iso8601_week_dates.tsv)', async () => {
    for (const row of rows) {
      const res = await owner.get(`${base}/schedule?from=${row.date}&weeks=1`);
      expect(res.status).toBe(200);
      const [week] = res.body.weeks;
      // Source: iso8601_week_dates.tsv columns iso_week_year, iso_week, iso_weekday for this date.
      const monday = addDays(row.date, 1 - row.isoWeekday);
      expect({ date: row.date, year: week.year, week: week.week, start: week.start, end: week.end }).toEqual({
        date: row.date,
        year: row.isoYear,
        week: row.isoWeek,
        start: monday,
        end: addDays(monday, 6),
      });
      expect(week.label).toBe(`W${String(row.isoWeek).padStart(2, '0')}`);
    }
  });

  it('runs the axis on week by week across a year end (2008-W52 → 2009-W01, table rows 2008-12-28 and 2008-12-29)', async () => {
    const res = await owner.get(`${base}/schedule?from=2008-12-22&weeks=3`);
    expect(res.body.weeks.map((w: { year: number; week: number; start: string }) => [w.year, w.week, w.start])).toEqual([
      [2008, 52, '2008-12-22'],
      [2009, 1, '2008-12-29'],
      [2009, 2, '2009-01-05'],
    ]);
  });

  it('defaults to eight weeks from the week of today', async () => {
    sw.clock.set('2026-03-04T12:00:00.000Z'); // a Wednesday
    const res = await owner.get(`${base}/schedule`);
    expect(res.body.today).toBe('2026-03-04');
    expect(res.body.weeks).toHaveLength(8);
    expect(res.body.weeks[0]).toMatchObject({ year: 2026, week: 10, start: '2026-03-02' });
    expect((await owner.get(`${base}/schedule?weeks=0`)).status).toBe(400);
    expect((await owner.get(`${base}/schedule?from=2026-02-30`)).status).toBe(400);
  });
});
