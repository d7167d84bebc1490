// Capacity: each painter's working hours per ISO weekday, their days off and holidays, and the days the
// whole studio is closed. Requests (zod) and responses.
import { z } from 'zod';
import { optionalText } from './common';

export const isoWeekdays = [1, 2, 3, 4, 5, 6, 7] as const;
export const weekdayLabels: Record<number, string> = { 1: 'Monday', 2: 'Tuesday', 3: 'Wednesday', 4: 'Thursday', 5: 'Friday', 6: 'Saturday', 7: 'Sunday' };

const clockTime = z
  .string({ error: 'Enter a time such as 09:00.' })
  .regex(/^([01]\d|2[0-3]):[0-5]\d$|^24:00$/, 'Enter a time such as 09:00 (24-hour clock, up to 24:00).');

const minutesOf = (hhmm: string) => Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5));

export const timeRangeInput = z
  .object({ start: clockTime, end: clockTime })
  .refine((r) => minutesOf(r.end) > minutesOf(r.start), { path: ['end'], message: 'End after the start (ranges stay within one day).' });
export type TimeRangeInput = z.infer<typeof timeRangeInput>;

const dayRanges = z
  .array(timeRangeInput)
  .max(4, 'At most four ranges a day.')
  .superRefine((ranges, ctx) => {
    const sorted = ranges.map((r, i) => ({ i, s: minutesOf(r.start), e: minutesOf(r.end) })).sort((a, b) => a.s - b.s);
    for (let k = 1; k < sorted.length; k++) {
      if (sorted[k].s < sorted[k - 1].e) ctx.addIssue({ code: 'custom', path: [sorted[k].i, 'start'], message: 'This range overlaps another on the same day.' });
    }
  });

/** Keys are ISO weekdays as JSON gives them: '1' = Monday .. '7' = Sunday; a missing day has no hours. */
export const weeklyHoursInput = z.partialRecord(z.enum(['1', '2', '3', '4', '5', '6', '7'], { error: 'Weekdays are 1 (Monday) to 7 (Sunday).' }), dayRanges);
export type WeeklyHoursInput = z.infer<typeof weeklyHoursInput>;

export const setHoursInput = z.object({ hours: weeklyHoursInput });
export type SetHoursInput = z.infer<typeof setHoursInput>;

const localDate = z.iso.date({ error: 'Use a date such as 2026-05-31.' });

export const dayOffKinds = ['day_off', 'holiday', 'closed'] as const;
export type DayOffKind = (typeof dayOffKinds)[number];
export const dayOffKindLabels: Record<DayOffKind, string> = { day_off: 'Day off', holiday: 'Holiday', closed: 'Studio closed' };

/** A day off or holiday of one painter (`userId`), or a studio closed day (`userId: null`, kind closed). */
export const dayOffInput = z
  .object({
    userId: z.number({ error: 'Choose a painter, or the whole studio.' }).int().positive().nullable(),
    kind: z.enum(dayOffKinds, { error: 'Choose day off, holiday or studio closed.' }),
    from: localDate,
    to: localDate,
    note: optionalText(120),
  })
  .superRefine((d, ctx) => {
    if (d.to < d.from) ctx.addIssue({ code: 'custom', path: ['to'], message: 'The last day cannot be before the first.' });
    else if ((Date.parse(d.to) - Date.parse(d.from)) / 86_400_000 > 365) ctx.addIssue({ code: 'custom', path: ['to'], message: 'Keep one entry to a year at most.' });
    if ((d.kind === 'closed') !== (d.userId === null)) {
      ctx.addIssue({ code: 'custom', path: ['kind'], message: d.userId === null ? 'A day for the whole studio is a studio closed day.' : 'Choose day off or holiday for one painter.' });
    }
  });
export type DayOffInput = z.infer<typeof dayOffInput>;

// --- responses ------------------------------------------------------------------------------

export type TimeRange = { start: string; end: string };
export type WeeklyHours = Partial<Record<'1' | '2' | '3' | '4' | '5' | '6' | '7', TimeRange[]>>;

export type DayOff = { id: number; userId: number | null; kind: DayOffKind; from: string; to: string; note: string | null };

export type PainterCapacityView = {
  userId: number;
  name: string;
  role: 'owner' | 'painter';
  hours: WeeklyHours;
  /** hours in an ordinary week */
  weeklyHours: number;
  daysOff: DayOff[];
};

export type CapacityView = {
  timeZone: string;
  painters: PainterCapacityView[];
  closedDays: DayOff[];
};
