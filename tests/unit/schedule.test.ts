import { describe, expect, it } from 'vitest';
import {
  earliestDelivery,
  forecast,
  intervalHours,
  isoWeek,
  weeklyHours,
  workingIntervals,
  type CommissionWork,
  type ForecastInput,
  type PainterCapacity,
  type StageWork,
  type TimeRange,
  type WeeklyHours,
} from '../../shared/schedule';

// Every expected instant below is worked out by hand in the comment beside it. Tokyo (UTC+9 all year, no
// daylight saving) is the "fixed zone": 09:00 JST = 00:00Z and 15:00 JST = 06:00Z, so a Mon–Fri
// 09:00–15:00 painter works 00:00Z–06:00Z. 2025-03-03 is a Monday.
const TOKYO = 'Asia/Tokyo';

function weekdays(start: string, end: string, days = [1, 2, 3, 4, 5]): WeeklyHours {
  const hours: Record<number, TimeRange[]> = {};
  for (const d of days) hours[d] = [{ start, end }];
  return hours;
}

const ana: PainterCapacity = { id: 'ana', hours: weekdays('09:00', '15:00') };

function stage(id: string, remainingHours: number, waitHoursAfter = 0, finishedAt?: string): StageWork {
  return { id, remainingHours, waitHoursAfter, ...(finishedAt ? { finishedAt } : {}) };
}

function commission(id: string, painterId: string | null, stages: StageWork[], dueDate?: string): CommissionWork {
  return { id, dueDate, figures: [{ id: `${id}1`, painterId, stages }] };
}

// A: 10 h of work, the last stage varnish (2 h) followed by 24 h of curing. B: 4 h.
const A = (due?: string) => commission('A', 'ana', [stage('paint', 8), stage('varnish', 2, 24)], due);
const B = (due?: string) => commission('B', 'ana', [stage('paint', 4)], due);

function input(queue: CommissionWork[], painters: PainterCapacity[] = [ana], extra: Partial<ForecastInput> = {}): ForecastInput {
  return { timeZone: TOKYO, now: '2025-03-03T00:00:00Z', painters, queue, ...extra }; // Mon 09:00 JST
}

const blocksOf = (c: { figures: { blocks: { stageId: unknown; start: string; end: string }[] }[] }) =>
  c.figures.flatMap((f) => f.blocks.map((b) => [b.stageId, b.start, b.end]));

describe('forecast: one painter, 6 h a day Monday to Friday', () => {
  it('books A then B in queue order; A is finished when its varnish has cured', () => {
    const [a, b] = forecast(input([A(), B()])).commissions;
    // A paint 8 h: Mon 09-15 (6 h) + Tue 09-11 (2 h); varnish Tue 11-13 JST; cured 24 h later, Wed 13:00 JST.
    expect(blocksOf(a)).toEqual([
      ['paint', '2025-03-03T00:00:00.000Z', '2025-03-03T06:00:00.000Z'],
      ['paint', '2025-03-04T00:00:00.000Z', '2025-03-04T02:00:00.000Z'],
      ['varnish', '2025-03-04T02:00:00.000Z', '2025-03-04T04:00:00.000Z'],
    ]);
    expect(a.start).toBe('2025-03-03T00:00:00.000Z');
    expect(a.startDate).toBe('2025-03-03');
    expect(a.figures[0].workEnd).toBe('2025-03-04T04:00:00.000Z');
    expect(a.finish).toBe('2025-03-05T04:00:00.000Z');
    expect(a.finishDate).toBe('2025-03-05');
    // B works while A cures: Tue 13-15 JST (2 h) + Wed 09-11 JST (2 h) -> done Wed 11:00 JST, before A.
    expect(blocksOf(b)).toEqual([
      ['paint', '2025-03-04T04:00:00.000Z', '2025-03-04T06:00:00.000Z'],
      ['paint', '2025-03-05T00:00:00.000Z', '2025-03-05T02:00:00.000Z'],
    ]);
    expect(b.finish).toBe('2025-03-05T02:00:00.000Z');
    expect(b.finish! < a.finish!).toBe(true);
  });

  it('a day off on Tuesday moves both A and B one working day later', () => {
    const off = { ...ana, daysOff: ['2025-03-04'] };
    const [a, b] = forecast(input([A(), B()], [off])).commissions;
    // A paint Mon 09-15 + Wed 09-11, varnish Wed 11-13, cured Thu 13:00 JST = Thu 04:00Z.
    expect(blocksOf(a)).toEqual([
      ['paint', '2025-03-03T00:00:00.000Z', '2025-03-03T06:00:00.000Z'],
      ['paint', '2025-03-05T00:00:00.000Z', '2025-03-05T02:00:00.000Z'],
      ['varnish', '2025-03-05T02:00:00.000Z', '2025-03-05T04:00:00.000Z'],
    ]);
    expect(a.finish).toBe('2025-03-06T04:00:00.000Z');
    // B Wed 13-15 + Thu 09-11 JST.
    expect(b.finish).toBe('2025-03-06T02:00:00.000Z');
    expect(b.finishDate).toBe('2025-03-06');
  });

  it('a studio closed day has the same effect as the painter taking it off', () => {
    const closed = forecast(input([A(), B()], [ana], { closedDays: ['2025-03-04'] }));
    const off = forecast(input([A(), B()], [{ ...ana, daysOff: ['2025-03-04'] }]));
    expect(closed.commissions).toEqual(off.commissions);
    expect(closed.commissions[0].finish).toBe('2025-03-06T04:00:00.000Z');
  });

  it('reordering the queue changes the forecast', () => {
    const [b, a] = forecast(input([B(), A()])).commissions;
    // B first: Mon 09-13 JST. A paint Mon 13-15 (2 h) + Tue 09-15 (6 h); varnish Wed 09-11; cured Thu 11:00 JST.
    expect(b.finish).toBe('2025-03-03T04:00:00.000Z');
    expect(blocksOf(a)).toEqual([
      ['paint', '2025-03-03T04:00:00.000Z', '2025-03-03T06:00:00.000Z'],
      ['paint', '2025-03-04T00:00:00.000Z', '2025-03-04T06:00:00.000Z'],
      ['varnish', '2025-03-05T00:00:00.000Z', '2025-03-05T02:00:00.000Z'],
    ]);
    expect(a.finish).toBe('2025-03-06T02:00:00.000Z');
  });

  it('flags a commission late only when it finishes after its due date', () => {
    const off = { ...ana, daysOff: ['2025-03-04'] };
    // With Tuesday off A is cured Thu 2025-03-06 (due Wed: late); B ends Thu 2025-03-06 (due Thu: on time).
    const [a, b] = forecast(input([A('2025-03-05'), B('2025-03-06')], [off])).commissions;
    expect([a.finishDate, a.late, a.figures[0].late]).toEqual(['2025-03-06', true, true]);
    expect([b.finishDate, b.late]).toEqual(['2025-03-06', false]);
    // Without the day off A is cured Wed 2025-03-05: on time.
    expect(forecast(input([A('2025-03-05')])).commissions[0].late).toBe(false);
  });

  it('fills a wait in the middle of a figure with later work, and takes the time back when the wait ends', () => {
    // A: prime 1 h (Mon 09-10 JST), 24 h wait -> paint may start Tue 10:00 JST, takes 3 h (Tue 10-13).
    // B: 8 h fills Mon 10-15 (5 h) and Tue 09-10 (1 h) while A's primer dries, then Tue 13-15 (2 h).
    const a = commission('A', 'ana', [stage('prime', 1, 24), stage('paint', 3)]);
    const b = commission('B', 'ana', [stage('paint', 8)]);
    const [fa, fb] = forecast(input([a, b])).commissions;
    expect(blocksOf(fa)).toEqual([
      ['prime', '2025-03-03T00:00:00.000Z', '2025-03-03T01:00:00.000Z'],
      ['paint', '2025-03-04T01:00:00.000Z', '2025-03-04T04:00:00.000Z'],
    ]);
    expect(fa.finish).toBe('2025-03-04T04:00:00.000Z');
    expect(blocksOf(fb)).toEqual([
      ['paint', '2025-03-03T01:00:00.000Z', '2025-03-03T06:00:00.000Z'],
      ['paint', '2025-03-04T00:00:00.000Z', '2025-03-04T01:00:00.000Z'],
      ['paint', '2025-03-04T04:00:00.000Z', '2025-03-04T06:00:00.000Z'],
    ]);
    expect(fb.start).toBe('2025-03-03T01:00:00.000Z');
    expect(fb.finish).toBe('2025-03-04T06:00:00.000Z');
  });

  it('keeps partial hours to the minute and splits a stage around a lunch break', () => {
    const split: PainterCapacity = {
      id: 'ana',
      hours: { 1: [{ start: '13:00', end: '17:00' }, { start: '09:00', end: '12:00' }] },
    };
    // 1.5 h from Mon 09:00 JST = 00:00Z-01:30Z; 2.75 h = 01:30Z-03:00Z (to 12:00 JST) + 04:00Z-05:15Z.
    const c = commission('C', 'ana', [stage('prep', 1.5), stage('basecoat', 2.75)]);
    const [fc] = forecast(input([c], [split])).commissions;
    expect(blocksOf(fc)).toEqual([
      ['prep', '2025-03-03T00:00:00.000Z', '2025-03-03T01:30:00.000Z'],
      ['basecoat', '2025-03-03T01:30:00.000Z', '2025-03-03T03:00:00.000Z'],
      ['basecoat', '2025-03-03T04:00:00.000Z', '2025-03-03T05:15:00.000Z'],
    ]);
    expect(weeklyHours(split)).toBe(7);
  });

  it('starts at now when now falls inside working hours, and skips a weekend when it does not', () => {
    // Mon 10:30 JST = 01:30Z: 1 h -> 01:30Z-02:30Z.
    const mid = forecast(input([commission('C', 'ana', [stage('x', 1)])], [ana], { now: '2025-03-03T01:30:00Z' }));
    expect(blocksOf(mid.commissions[0])).toEqual([['x', '2025-03-03T01:30:00.000Z', '2025-03-03T02:30:00.000Z']]);
    // Sat 2025-03-08 10:00 JST -> first working moment Mon 2025-03-10 09:00 JST = 00:00Z.
    const sat = forecast(input([commission('C', 'ana', [stage('x', 1)])], [ana], { now: '2025-03-08T01:00:00Z' }));
    expect(sat.commissions[0].start).toBe('2025-03-10T00:00:00.000Z');
  });
});

describe('forecast across daylight-saving changes', () => {
  it('Europe/Berlin spring forward: 09:00 stays 09:00 local, a 66 h wait is 66 real hours', () => {
    // Fri 2025-03-28 09:00 CET = 08:00Z. Clocks go 02:00 -> 03:00 on Sun 30 March (01:00Z); from then
    // 09:00-15:00 CEST = 07:00Z-13:00Z.
    const painter: PainterCapacity = { id: 'ana', hours: weekdays('09:00', '15:00') };
    const a = commission('A', 'ana', [stage('prime', 6, 66), stage('paint', 2), stage('varnish', 1, 24)]);
    const b = commission('B', 'ana', [stage('paint', 4)]);
    const [fa, fb] = forecast({
      timeZone: 'Europe/Berlin',
      now: '2025-03-28T08:00:00Z',
      painters: [painter],
      queue: [a, b],
    }).commissions;
    // prime Fri 09-15 CET (08:00Z-14:00Z); + 66 real hours = Mon 31 March 08:00Z = 10:00 CEST
    // (counting wall-clock hours instead would give 09:00). paint Mon 10-12, varnish 12-13 CEST;
    // cured 24 h later, Tue 1 April 13:00 CEST = 11:00Z.
    expect(blocksOf(fa)).toEqual([
      ['prime', '2025-03-28T08:00:00.000Z', '2025-03-28T14:00:00.000Z'],
      ['paint', '2025-03-31T08:00:00.000Z', '2025-03-31T10:00:00.000Z'],
      ['varnish', '2025-03-31T10:00:00.000Z', '2025-03-31T11:00:00.000Z'],
    ]);
    expect(fa.finish).toBe('2025-04-01T11:00:00.000Z');
    expect(fa.finishDate).toBe('2025-04-01');
    // B fills Mon 09-10 CEST (07:00Z-08:00Z) while A's primer still dries, then Mon 13-15 CEST and Tue 09-10 CEST.
    expect(blocksOf(fb)).toEqual([
      ['paint', '2025-03-31T07:00:00.000Z', '2025-03-31T08:00:00.000Z'],
      ['paint', '2025-03-31T11:00:00.000Z', '2025-03-31T13:00:00.000Z'],
      ['paint', '2025-04-01T07:00:00.000Z', '2025-04-01T08:00:00.000Z'],
    ]);
    expect(fb.finish).toBe('2025-04-01T08:00:00.000Z');
  });

  it('America/New_York fall back: the 24 h varnish wait is 24 real hours, Sunday starts at 09:00 EST', () => {
    // Sat 2025-11-01 09:00 EDT = 13:00Z. Clocks go 02:00 EDT -> 01:00 EST on Sun 2 Nov (06:00Z).
    // Saturday 09:00-15:00 EDT = 13:00Z-19:00Z; Sunday 09:00-15:00 EST = 14:00Z-20:00Z.
    const painter: PainterCapacity = { id: 'ana', hours: weekdays('09:00', '15:00', [6, 7, 1]) };
    const a: CommissionWork = {
      id: 'A',
      dueDate: '2025-11-02',
      figures: [
        { id: 'A1', painterId: 'ana', stages: [stage('varnish', 5, 24)] },
        { id: 'A2', painterId: 'ana', stages: [stage('paint', 4)] },
      ],
    };
    const [fa] = forecast({ timeZone: 'America/New_York', now: '2025-11-01T13:00:00Z', painters: [painter], queue: [a] })
      .commissions;
    // A1 varnish Sat 13:00Z-18:00Z (09-14 EDT); cured 24 h later Sun 18:00Z = 13:00 EST (not 14:00).
    expect(fa.figures[0].finish).toBe('2025-11-02T18:00:00.000Z');
    // A2: Sat 14-15 EDT (18:00Z-19:00Z) + Sun 09-12 EST (14:00Z-17:00Z).
    expect(blocksOf({ figures: [fa.figures[1]] })).toEqual([
      ['paint', '2025-11-01T18:00:00.000Z', '2025-11-01T19:00:00.000Z'],
      ['paint', '2025-11-02T14:00:00.000Z', '2025-11-02T17:00:00.000Z'],
    ]);
    // The commission is finished when its last figure is: A1's curing, Sun 2 Nov, on its due date.
    expect([fa.finish, fa.finishDate, fa.late]).toEqual(['2025-11-02T18:00:00.000Z', '2025-11-02', false]);
  });

  it('reports working intervals at local 09:00-15:00 on both sides of the change', () => {
    const days = workingIntervals(ana, 'Europe/Berlin', '2025-03-28', '2025-03-31');
    // Fri (CET) and Mon (CEST); the weekend has no hours.
    expect(days).toEqual([
      { date: '2025-03-28', start: '2025-03-28T08:00:00.000Z', end: '2025-03-28T14:00:00.000Z' },
      { date: '2025-03-31', start: '2025-03-31T07:00:00.000Z', end: '2025-03-31T13:00:00.000Z' },
    ]);
    expect(intervalHours(days)).toBe(12);
    // A painter up at night on the change itself: 00:00-06:00 on Sun 30 March is only 5 real hours.
    const night: PainterCapacity = { id: 'owl', hours: { 7: [{ start: '00:00', end: '06:00' }] } };
    expect(intervalHours(workingIntervals(night, 'Europe/Berlin', '2025-03-30', '2025-03-30'))).toBe(5);
  });
});

describe('unassigned figures', () => {
  // ana 09-15 JST (00:00Z-06:00Z); ben 12-18 JST (03:00Z-09:00Z).
  const ben: PainterCapacity = { id: 'ben', hours: weekdays('12:00', '18:00') };

  it('go to the painter whose earliest free working moment comes first', () => {
    const a = commission('A', 'ana', [stage('paint', 4)]); // ana Mon 00:00Z-04:00Z
    const c: CommissionWork = {
      id: 'C',
      figures: [
        { id: 'C1', painterId: null, stages: [stage('paint', 2)] }, // ana free 04:00Z, ben 03:00Z -> ben 03-05Z
        { id: 'C2', painterId: null, stages: [stage('paint', 2)] }, // ana free 04:00Z, ben 05:00Z -> ana 04-06Z
        { id: 'C3', painterId: null, stages: [stage('paint', 1)] }, // ana next Tue 00:00Z, ben 05:00Z -> ben 05-06Z
      ],
    };
    const [, fc] = forecast(input([a, c], [ana, ben])).commissions;
    expect(fc.figures.map((f) => [f.id, f.painterId, f.painterChosen, f.start, f.finish])).toEqual([
      ['C1', 'ben', true, '2025-03-03T03:00:00.000Z', '2025-03-03T05:00:00.000Z'],
      ['C2', 'ana', true, '2025-03-03T04:00:00.000Z', '2025-03-03T06:00:00.000Z'],
      ['C3', 'ben', true, '2025-03-03T05:00:00.000Z', '2025-03-03T06:00:00.000Z'],
    ]);
  });

  it('break a tie by the order painters are listed in, and never go to a painter without hours', () => {
    const x: PainterCapacity = { id: 'x', hours: ana.hours };
    const y: PainterCapacity = { id: 'y', hours: ana.hours };
    const idle: PainterCapacity = { id: 'idle', hours: {} };
    const c = commission('C', null, [stage('paint', 1)]);
    expect(forecast(input([c], [x, y])).commissions[0].figures[0].painterId).toBe('x');
    expect(forecast(input([c], [y, x])).commissions[0].figures[0].painterId).toBe('y');
    expect(forecast(input([c], [idle, y])).commissions[0].figures[0].painterId).toBe('y');
    const none = forecast(input([c], [idle])).commissions[0];
    expect([none.finish, none.figures[0].unscheduled]).toEqual([null, 'no-working-hours']);
  });

  it('report a figure for an unknown painter as unscheduled, without blocking the rest of the queue', () => {
    const [lost, b] = forecast(input([commission('L', 'nobody', [stage('paint', 3)]), B()])).commissions;
    expect([lost.start, lost.finish, lost.late, lost.figures[0].unscheduled]).toEqual([null, null, false, 'unknown-painter']);
    expect(b.finish).toBe('2025-03-03T04:00:00.000Z'); // Mon 09-13 JST
  });
});

describe('done work', () => {
  it('a figure with nothing left and no record is finished now', () => {
    const c = commission('D', 'ana', [stage('paint', 0), stage('varnish', 0, 24)]);
    const [fd] = forecast(input([c])).commissions;
    expect([fd.start, fd.finish, fd.finishDate, fd.figures[0].blocks]).toEqual([null, '2025-03-03T00:00:00.000Z', '2025-03-03', []]);
  });

  it('a finished figure with a record is finished when its varnish cured, even before now', () => {
    // varnish done Sat 1 March 03:00Z + 24 h = Sun 2 March 03:00Z (12:00 JST), a day before now.
    const c = commission('D', 'ana', [stage('paint', 0, 0, '2025-02-28T05:00:00Z'), stage('varnish', 0, 24, '2025-03-01T03:00:00Z')], '2025-03-02');
    const [fd] = forecast(input([c])).commissions;
    expect([fd.finish, fd.finishDate, fd.late]).toEqual(['2025-03-02T03:00:00.000Z', '2025-03-02', false]);
  });

  it('counts a done stage\'s wait from its record, and lets later work use the time meanwhile', () => {
    // prime done Sun 2 March 23:00Z (Mon 08:00 JST) with 3 h drying -> paint may start Mon 02:00Z (11:00 JST).
    const a = commission('A', 'ana', [stage('prime', 0, 3, '2025-03-02T23:00:00Z'), stage('paint', 2)]);
    const [fa, fb] = forecast(input([a, commission('B', 'ana', [stage('paint', 3)])])).commissions;
    expect(blocksOf(fa)).toEqual([['paint', '2025-03-03T02:00:00.000Z', '2025-03-03T04:00:00.000Z']]);
    // B: Mon 00:00Z-02:00Z while the primer dries, then 04:00Z-05:00Z.
    expect(blocksOf(fb)).toEqual([
      ['paint', '2025-03-03T00:00:00.000Z', '2025-03-03T02:00:00.000Z'],
      ['paint', '2025-03-03T04:00:00.000Z', '2025-03-03T05:00:00.000Z'],
    ]);
  });
});

describe('earliestDelivery ("if booked today")', () => {
  it('is the finish of a new commission appended to the queue, leaving the queue as it was', () => {
    const queue = [A(), B()];
    const before = JSON.stringify(queue);
    // After B (done Wed 02:00Z), the new 3 h unassigned figure goes to ana: Wed 02:00Z-05:00Z (11-14 JST).
    const promise = earliestDelivery(input(queue), commission('N', null, [stage('paint', 3)]));
    expect([promise.id, promise.finish, promise.finishDate]).toEqual(['N', '2025-03-05T05:00:00.000Z', '2025-03-05']);
    expect(JSON.stringify(queue)).toBe(before);
    expect(forecast(input(queue)).commissions).toHaveLength(2);
  });
});

describe('forecast is pure and checks its input', () => {
  it('gives the same answer twice and does not touch its input', () => {
    const i = input([A(), B(), commission('C', null, [stage('p', 2.5, 1), stage('q', 1)])]);
    const frozen = structuredClone(i);
    deepFreeze(i);
    expect(forecast(i)).toEqual(forecast(i));
    expect(i).toEqual(frozen);
  });

  it('rejects an instant without an offset, an unknown zone and malformed hours', () => {
    expect(() => forecast(input([A()], [ana], { now: '2025-03-03T09:00' }))).toThrow(RangeError);
    expect(() => forecast(input([A()], [ana], { timeZone: 'Mars/Olympus' }))).toThrow(RangeError);
    expect(() => forecast(input([A()], [{ id: 'ana', hours: { 1: [{ start: '15:00', end: '09:00' }] } }]))).toThrow(RangeError);
    expect(() => forecast(input([commission('A', 'ana', [stage('x', -1)])]))).toThrow(RangeError);
  });
});

describe('isoWeek re-exported for the timeline', () => {
  it('labels a date near the year end with the ISO week-numbering year', () => {
    // 2024-12-30 is the Monday of the week holding Thu 2 January 2025, so it is 2025-W01-1.
    expect(isoWeek('2024-12-30')).toEqual({ year: 2025, week: 1, weekday: 1 });
  });
});

function deepFreeze<T>(o: T): T {
  if (o && typeof o === 'object') {
    for (const v of Object.values(o)) deepFreeze(v);
    Object.freeze(o);
  }
  return o;
}
