// The books: actual against estimated hours, medians per price-table cell, suggested changes, the fitted
// batch learning rate, and earnings net of materials, fees and tax. Requests (zod) and responses.
// Money is integers in minor units of `currency`; hours are numbers of hours (two decimals).
import { z } from 'zod';
import type { CellSuggestion, LearningFit } from '../learning';

const month = z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'Use a month such as 2026-03.');

/** Months in the studio's timezone, inclusive; the default is the twelve months up to this one. */
export const earningsQuery = z
  .object({ from: month.optional(), to: month.optional() })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { path: ['to'], message: 'The last month cannot be before the first.' });
export type EarningsQuery = z.infer<typeof earningsQuery>;

export const booksSettingsInput = z.object({
  cardFeeBp: z.number({ error: 'Enter the fee as basis points.' }).int('Use basis points: 1 bp = 0.01 %, so 1.5 % = 150.').min(0, 'Fees cannot be negative.').max(2000, 'Use at most 20 %.'),
  cardFeeFixedMinor: z.number({ error: 'Enter the fixed fee.' }).int('Use whole minor units (cents).').min(0, 'Fees cannot be negative.').max(100_000, 'That fixed fee is too large.'),
});
export type BooksSettingsInput = z.infer<typeof booksSettingsInput>;
export type BooksSettings = BooksSettingsInput;

// --- actuals ---------------------------------------------------------------------------------

export type StageActual = {
  /** stage key (the template's and the price table's) */
  key: string;
  name: string;
  /** done stages with time logged */
  count: number;
  estimatedHours: number;
  loggedHours: number;
  /** logged / estimated − 1; null when nothing was estimated */
  difference: number | null;
};

export type DoneStageRow = {
  stageId: number;
  stageName: string;
  figure: { id: number; name: string; quantity: number; sizeClass: string; tier: string };
  commission: { id: number; title: string };
  doneAt: string | null;
  estimatedHours: number;
  loggedHours: number;
};

export type ActualsReport = {
  /** done stages with time logged, and those without (left out of the numbers below) */
  doneStages: number;
  doneWithoutTime: number;
  totals: { estimatedHours: number; loggedHours: number; difference: number | null };
  byStage: StageActual[];
  /** the latest done stages, newest first */
  recent: DoneStageRow[];
  /** per size class, tier and stage: median logged hours for one figure, with the count */
  cells: { sizeClass: string; tier: string; stage: string; stageLabel: string; tierLabel: string; sizeLabel: string; medianHours: number; count: number; tableHours: number | null }[];
  suggestions: (CellSuggestion & { stageLabel: string; tierLabel: string; sizeLabel: string })[];
  learningRate: { table: number; fitted: LearningFit | null; batches: number };
};

// --- earnings --------------------------------------------------------------------------------

export type CommissionEarnings = {
  id: number;
  title: string;
  client: { id: number; name: string };
  status: string;
  /** received, net of refunds */
  paid: number;
  tax: number;
  fees: number;
  /** materials, models bought in, shipping and insurance as quoted, in proportion to what is paid */
  costs: number;
  net: number;
  loggedHours: number;
  /** paid / hours logged, minor units per hour; null without hours */
  hourlyGross: number | null;
  hourlyNet: number | null;
};

export type MonthEarnings = { month: string; paid: number; tax: number; fees: number; costs: number; net: number };

export type EarningsReport = {
  currency: string;
  from: string;
  to: string;
  settings: BooksSettings;
  totals: MonthEarnings & { loggedHours: number; hourlyGross: number | null; hourlyNet: number | null };
  months: MonthEarnings[];
  commissions: CommissionEarnings[];
  /** the price table's hourly rate, to compare */
  tableHourlyRate: number;
};
