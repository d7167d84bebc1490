// Commissions, figures, stages, time, the bench board and the studio's lists: requests (zod) and responses.
// Hours in the API are numbers of hours (two decimals); the database keeps whole minutes.
import { z } from 'zod';
import { commissionStatuses, priorities, stageStatuses, type CommissionStatus, type Priority, type Progress, type StageStatus } from '../commission-lifecycle';
import { hazardKeys, type HazardKey } from '../hazards';
import { id, optionalText, pageParams, pageQuery } from './common';

export const sizeClasses = ['25', '28', '32', '40', '50', '60', '80', '100', '120', '160', 'large'] as const;
export type SizeClass = (typeof sizeClasses)[number];
export const sizeClassLabels: Record<SizeClass, string> = {
  '25': '25 mm',
  '28': '28 mm',
  '32': '32 mm',
  '40': '40 mm',
  '50': '50 mm',
  '60': '60 mm',
  '80': '80 mm',
  '100': '100 mm',
  '120': '120 mm',
  '160': '160 mm',
  large: 'Large or vehicle',
};

/** Defaults a new studio starts with (keys match the price table's). */
export const defaultTiers = [
  { key: 'tabletop', label: 'Tabletop' },
  { key: 'enhanced', label: 'Enhanced' },
  { key: 'display', label: 'Display' },
];
export const defaultExtras = [
  { key: 'assembly', label: 'Assembly' },
  { key: 'conversion', label: 'Conversion' },
  { key: 'magnetising', label: 'Magnetising' },
  { key: 'freehand', label: 'Freehand' },
  { key: 'nmm', label: 'Non-metallic metal' },
  { key: 'light-effects', label: 'Light effects' },
  { key: 'weathering', label: 'Weathering' },
  { key: 'display-base', label: 'Display base' },
];

// --- building blocks ---------------------------------------------------------------------------

/** Stable machine keys of stages, tiers and extras: what figures refer to; labels can change. */
export const listKey = z
  .string({ error: 'Choose one from the list.' })
  .regex(/^[a-z][a-z0-9-]{0,31}$/, 'Use 1–32 lower-case letters, digits and dashes, starting with a letter.');

/** A key made from a label, for list items and stages added without one: "Layer & highlight" → "layer-highlight". */
export function keyFromLabel(label: string): string {
  const k = label
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 30)
    .replace(/-+$/, '');
  return /^[a-z]/.test(k) ? k : `x-${k}`.replace(/-+$/, '') || 'x';
}

const dateOnly = z.iso.date({ error: 'Use a date such as 2026-05-31.' });

/** Text that can be cleared: null or '' clear it, undefined leaves it. */
const clearableText = (max: number) =>
  z
    .union([z.null(), z.string().trim().max(max, `Use at most ${max} characters.`)])
    .transform((v) => (v === '' ? null : v))
    .optional();

const hours = (min: number, max: number, what = 'hours') =>
  z
    .number({ error: `Enter ${what} as a number.` })
    .min(min, min > 0 ? `Use at least ${min} ${what}.` : `${what[0].toUpperCase()}${what.slice(1)} cannot be negative.`)
    .max(max, `Use at most ${max} ${what}.`);

const label = z.string({ error: 'Enter a name.' }).trim().min(1, 'Enter a name.').max(80, 'Use at most 80 characters.');

// --- figures ---------------------------------------------------------------------------------

const figureFields = z.object({
  name: z.string({ error: 'Enter a name for the figure.' }).trim().min(1, 'Enter a name for the figure.').max(120, 'Use at most 120 characters.'),
  quantity: z
    .number({ error: 'Enter how many identical figures.' })
    .int('Use a whole number.')
    .min(1, 'At least 1.')
    .max(500, 'At most 500 in one batch.'),
  sizeClass: z.enum(sizeClasses, { error: 'Choose a base size, or large/vehicle.' }),
  footprint: clearableText(80),
  tier: listKey,
  extras: z.array(listKey).max(20, 'At most 20 extras.').optional(),
  subAssemblies: z
    .array(z.string({ error: 'Name the part.' }).trim().min(1, 'Name the part.').max(60, 'Use at most 60 characters.'))
    .max(20, 'At most 20 parts.')
    .optional(),
  lightSource: clearableText(200),
  painterId: z.number({ error: 'Choose a painter.' }).int().positive().nullable().optional(),
});

export const figureInput = figureFields.superRefine((f, ctx) => {
  if (f.sizeClass === 'large' && !f.footprint) ctx.addIssue({ code: 'custom', path: ['footprint'], message: 'Give the footprint of a large figure, e.g. 180 × 110 mm.' });
});
export type FigureInput = z.infer<typeof figureInput>;

/** Partial: the merged figure is checked again by the server (a large figure still needs a footprint). */
export const updateFigureInput = figureFields.partial();
export type UpdateFigureInput = z.infer<typeof updateFigureInput>;

// --- commissions -----------------------------------------------------------------------------

const title = z.string({ error: 'Enter a title.' }).trim().min(1, 'Enter a title.').max(120, 'Use at most 120 characters.');
const priority = z.enum(priorities, { error: 'Choose low, normal or high.' });

export const createCommissionInput = z.object({
  clientId: z.number({ error: 'Choose a client.' }).int('Choose a client.').positive('Choose a client.'),
  title,
  brief: optionalText(10000),
  dueDate: z
    .union([z.literal(''), dateOnly])
    .transform((v) => (v === '' ? undefined : v))
    .optional(),
  priority: priority.optional(),
  figures: z.array(figureInput).max(100, 'At most 100 figures at once.').optional(),
});
export type CreateCommissionInput = z.infer<typeof createCommissionInput>;

export const updateCommissionInput = z.object({
  title: title.optional(),
  brief: clearableText(10000),
  dueDate: z
    .union([z.literal(''), z.null(), dateOnly])
    .transform((v) => (v === '' ? null : v))
    .optional(),
  priority: priority.optional(),
});
export type UpdateCommissionInput = z.infer<typeof updateCommissionInput>;

export const schemeNotesInput = z.object({
  schemeNotes: z.string({ error: 'Write the notes, or send an empty text to clear them.' }).trim().max(10000, 'Use at most 10000 characters.'),
});
export type SchemeNotesInput = z.infer<typeof schemeNotesInput>;

export const transitionInput = z
  .object({
    to: z.enum(commissionStatuses, { error: 'Choose the status to move to.' }),
    reason: optionalText(1000),
  })
  .superRefine((t, ctx) => {
    if (t.to === 'cancelled' && !t.reason) ctx.addIssue({ code: 'custom', path: ['reason'], message: 'Give a reason for cancelling.' });
  });
export type TransitionInput = z.infer<typeof transitionInput>;

/** `status` may list several, comma-separated: `?status=booked,on_bench`. */
export const commissionListQuery = pageQuery.extend({
  status: z
    .string()
    .optional()
    .transform((s) => (s ? s.split(',').map((x) => x.trim()).filter(Boolean) : undefined))
    .pipe(z.array(z.enum(commissionStatuses, { error: 'Unknown status.' })).optional()),
  clientId: id.optional(),
});
export type CommissionListQuery = z.infer<typeof commissionListQuery>;

// --- stages and time -----------------------------------------------------------------------

export const updateStageInput = z.object({
  status: z.enum(stageStatuses, { error: 'Choose to do, working, done or skipped.' }).optional(),
  estimateHours: hours(0, 1000).optional(),
  waitHours: hours(0, 720).optional(),
});
export type UpdateStageInput = z.infer<typeof updateStageInput>;

export const manualTimeInput = z.object({
  hours: hours(0.01, 24),
  date: dateOnly.optional(),
  note: optionalText(500),
});
export type ManualTimeInput = z.infer<typeof manualTimeInput>;

export const updateTimeInput = z.object({
  hours: hours(0.01, 24).optional(),
  note: clearableText(500),
});
export type UpdateTimeInput = z.infer<typeof updateTimeInput>;

/** The board holds one page of figures (soonest due first), `limit` of them from `offset`. */
export const boardQuery = pageParams(100).extend({
  painterId: id.optional(),
  commissionId: id.optional(),
  dueBefore: dateOnly.optional(),
});
export type BoardQuery = z.infer<typeof boardQuery>;
/** What the board is filtered by, without the page. */
export type BoardFilter = Omit<BoardQuery, 'limit' | 'offset'>;

// --- studio setup ---------------------------------------------------------------------------

const hazardList = z.array(z.enum(hazardKeys, { error: 'Unknown hazard.' })).max(hazardKeys.length);

export const stageTemplateInput = z.object({
  stages: z
    .array(
      z.object({
        key: listKey.optional(),
        name: label,
        defaultHours: hours(0, 100),
        waitHours: hours(0, 720),
        hazards: hazardList,
      }),
    )
    .min(1, 'Keep at least one stage.')
    .max(30, 'At most 30 stages.'),
});
export type StageTemplateInput = z.infer<typeof stageTemplateInput>;

const listItem = z.object({ key: listKey.optional(), label });
export const listsInput = z.object({
  tiers: z.array(listItem).min(1, 'Keep at least one tier.').max(20, 'At most 20 tiers.'),
  extras: z.array(listItem).max(40, 'At most 40 extras.'),
});
export type ListsInput = z.infer<typeof listsInput>;

/** The same array GET /hazards answers (any subset of the keys); the footer is added by the server. */
export const hazardsInput = z
  .array(
    z.object({
      key: z.enum(hazardKeys, { error: 'Unknown hazard.' }),
      title: label,
      text: z.string({ error: 'Enter the caution.' }).trim().min(1, 'Enter the caution.').max(2000, 'Use at most 2000 characters.'),
    }),
    { error: 'Send the list of hazards.' },
  )
  .min(1, 'Send at least one hazard.')
  .max(hazardKeys.length);
export type HazardsInput = z.infer<typeof hazardsInput>;

// --- responses ------------------------------------------------------------------------------

export type PersonRef = { id: number; name: string };

export type Stage = {
  id: number;
  figureId: number;
  key: string;
  name: string;
  position: number;
  status: StageStatus;
  estimateHours: number;
  waitHours: number;
  hazards: HazardKey[];
  doneBy: PersonRef | null;
  doneAt: string | null;
  /** hours of closed time entries; null for clients (time is studio-only) */
  loggedHours: number | null;
  waitUntil: string | null;
};

export type Figure = {
  id: number;
  commissionId: number;
  name: string;
  quantity: number;
  sizeClass: SizeClass;
  footprint: string | null;
  tier: string;
  extras: string[];
  subAssemblies: string[];
  lightSource: string | null;
  painter: PersonRef | null;
  stages: Stage[];
  progress: Progress;
  currentStageId: number | null;
  /** null for clients */
  loggedHours: number | null;
};

export type CommissionSummary = {
  id: number;
  title: string;
  status: CommissionStatus;
  priority: Priority;
  dueDate: string | null;
  client: { id: number; name: string };
  /** figure lines (a line may hold several identical figures) */
  figureCount: number;
  /** figures counting quantities */
  modelCount: number;
  progress: Progress;
  createdAt: string;
  updatedAt: string;
};

export type CommissionDetail = CommissionSummary & {
  brief: string | null;
  schemeNotes: string | null;
  cancelReason: string | null;
  /** the status it was put on hold from, while on hold */
  statusBeforeHold: CommissionStatus | null;
  allowedTransitions: CommissionStatus[];
  figures: Figure[];
  /** null for clients */
  loggedHours: number | null;
};

export type ActivityEntry = {
  id: number;
  at: string;
  user: PersonRef | null;
  action: string;
  detail: Record<string, unknown>;
  summary: string;
};

export type TimeEntry = {
  id: number;
  stageId: number;
  user: PersonRef;
  source: 'timer' | 'manual';
  startedAt: string;
  endedAt: string | null;
  /** null while the timer runs */
  hours: number | null;
  note: string | null;
};

export type RunningTimer = TimeEntry & {
  stage: { id: number; name: string };
  figure: { id: number; name: string };
  commission: { id: number; title: string };
};

export type BoardCard = {
  figureId: number;
  figureName: string;
  quantity: number;
  commission: { id: number; title: string; dueDate: string | null };
  painter: PersonRef | null;
  /** the current stage (null in the done column); waitUntil there is the end of the wait before it, while it lasts */
  stage: { id: number; name: string; status: StageStatus; hazards: HazardKey[]; waitUntil: string | null } | null;
  progress: Progress;
};
/** One page of the board's figures in their columns; `total` counts the figures of every page. */
export type Board = { columns: { key: string; name: string; cards: BoardCard[] }[]; total: number; limit: number; offset: number };

export type TemplateStageView = { key: string; name: string; position: number; defaultHours: number; waitHours: number; hazards: HazardKey[] };
export type ListItem = { key: string; label: string };
export type StudioLists = { tiers: ListItem[]; extras: ListItem[] };
export type Hazard = { key: HazardKey; title: string; text: string };
