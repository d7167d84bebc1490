// The schedule: the forecast's input (zod, mirroring shared/schedule.ts), the queue order, "earliest
// delivery if booked today", the timeline and the calendar feed. Requests (zod) and responses.
import { z } from 'zod';
import type { CommissionStatus } from '../commission-lifecycle';
import { id, pageParams, timeZone } from './common';
import { timeRangeInput, weeklyHoursInput } from './capacity';

const localDate = z.iso.date({ error: 'Use a date such as 2026-05-31.' });
const instant = z.iso.datetime({ offset: true, error: 'Use an ISO 8601 instant with Z or an offset.' });
const workId = z.union([z.string().min(1).max(64), z.number().int()]);
const hoursValue = z.number({ error: 'Enter hours as a number.' }).min(0, 'Hours cannot be negative.').max(100_000);

// --- the forecast's input, as shared/schedule.ts reads it ------------------------------------

export const stageWorkInput = z.object({
  id: workId,
  remainingHours: hoursValue,
  waitHoursAfter: hoursValue.optional(),
  finishedAt: instant.nullable().optional(),
});
export const figureWorkInput = z.object({ id: workId, painterId: workId.nullable(), stages: z.array(stageWorkInput).max(100) });
export const commissionWorkInput = z.object({ id: workId, dueDate: localDate.nullable().optional(), figures: z.array(figureWorkInput).max(1000) });
export const painterCapacityInput = z.object({ id: workId, hours: weeklyHoursInput, daysOff: z.array(localDate).max(5000).optional() });
export const forecastInput = z.object({
  timeZone,
  now: instant,
  painters: z.array(painterCapacityInput).max(100),
  closedDays: z.array(localDate).max(5000).optional(),
  queue: z.array(commissionWorkInput).max(10_000),
});
export type ForecastInputParsed = z.infer<typeof forecastInput>;
export { timeRangeInput };

// --- requests ----------------------------------------------------------------------------------

/** The timeline's window: `weeks` ISO weeks starting with the week that holds `from` (default today). */
/**
 * And one page of the queue: `limit` commissions from `offset` (a client's page counts their own only).
 * 25 by default, about what eight weeks of a small studio's bench hold.
 */
export const scheduleQuery = pageParams(25).extend({
  from: localDate.optional(),
  weeks: z.coerce.number().int().min(1, 'Show at least one week.').max(52, 'Show at most 52 weeks.').default(8),
});
export type ScheduleQuery = z.infer<typeof scheduleQuery>;

/** The whole queue in its new order: every booked and on-the-bench commission, each once. */
export const queueOrderInput = z.object({
  commissionIds: z
    .array(z.number({ error: 'Commission ids are numbers.' }).int().positive(), { error: 'Send the commissions in their new order.' })
    .max(2000)
    .refine((ids) => new Set(ids).size === ids.length, 'Each commission may appear only once.'),
});
export type QueueOrderInput = z.infer<typeof queueOrderInput>;

/**
 * "Earliest delivery if booked today": either an existing commission (its figures and stage estimates,
 * e.g. one being quoted), or a number of bench hours with an optional wait at the end (a quote not yet
 * saved). `painterId` puts the work on one painter; without it the first free painter takes it.
 */
export const earliestDeliveryQuery = z
  .object({
    commissionId: id.optional(),
    hours: z.coerce.number({ error: 'Enter hours as a number.' }).min(0.05, 'Use at least 0.05 hours.').max(10_000, 'Use at most 10000 hours.').optional(),
    waitHours: z.coerce.number().min(0).max(720, 'Use at most 720 hours.').optional(),
    painterId: id.optional(),
  })
  .refine((q) => q.commissionId !== undefined || q.hours !== undefined, { path: ['hours'], message: 'Give a commission or the hours of work.' });
export type EarliestDeliveryQuery = z.infer<typeof earliestDeliveryQuery>;

// --- responses ---------------------------------------------------------------------------------

export type UnscheduledReason = 'unknown-painter' | 'no-working-hours' | 'beyond-horizon';
export const unscheduledLabels: Record<UnscheduledReason, string> = {
  'unknown-painter': 'Its painter is no longer in the studio',
  'no-working-hours': 'Its painter has no working hours set',
  'beyond-horizon': 'More work than fits in ten years of the painters’ hours',
};

/** One ISO 8601 week of the timeline's axis: week-numbering year, week number, Monday and Sunday. */
export type TimelineWeek = { year: number; week: number; label: string; start: string; end: string };

export type ScheduleBlock = { stageId: number; stageName: string; start: string; end: string };

export type ScheduledFigure = {
  id: number;
  name: string;
  quantity: number;
  painter: { id: number; name: string } | null;
  /** true when no painter is assigned and the forecast chose the first free one */
  painterChosen: boolean;
  remainingHours: number;
  start: string | null;
  finish: string | null;
  startDate: string | null;
  finishDate: string | null;
  late: boolean;
  unscheduled: UnscheduledReason | null;
  /** work blocks; left out for clients */
  blocks?: ScheduleBlock[];
};

export type ScheduledCommission = {
  id: number;
  title: string;
  status: CommissionStatus;
  client: { id: number; name: string };
  dueDate: string | null;
  /** 1-based place in the queue; null for clients */
  queuePosition: number | null;
  remainingHours: number;
  start: string | null;
  finish: string | null;
  startDate: string | null;
  finishDate: string | null;
  late: boolean;
  /** days between the projected finish and the due date (negative: late); null without either */
  slackDays: number | null;
  unscheduled: UnscheduledReason | null;
  figures: ScheduledFigure[];
};

export type ScheduleView = {
  timeZone: string;
  now: string;
  today: string;
  /** the timeline's axis */
  weeks: TimelineWeek[];
  painters: { id: number; name: string; weeklyHours: number }[];
  /** one page of the queue, in queue order */
  commissions: ScheduledCommission[];
  /** commissions in the whole queue (a client's: their own) */
  total: number;
  limit: number;
  offset: number;
};

export type EarliestDeliveryView = {
  timeZone: string;
  today: string;
  /** the date the studio can promise: the projected finish if booked now, at the end of the queue */
  date: string | null;
  start: string | null;
  finish: string | null;
  hours: number;
  unscheduled: UnscheduledReason | null;
  /** commissions ahead of it in the queue */
  queueLength: number;
};

export type CalendarFeedView = {
  active: boolean;
  createdAt: string | null;
  lastUsedAt: string | null;
  /** the secret address; only in the answer that creates it (it is stored as a hash) */
  url?: string;
};
