// The studio's price table and the input of the quote engine (shared/pricing.ts).
// Money fields are integers in the table currency's minor units (ISO 4217 digits, shared/money.ts);
// percentages are basis points (bp: 1 bp = 0.01 %, 10 000 bp = 100 %) so they stay integers too.
import { z } from 'zod';
import { defaultStageTemplate } from '../hazards';
import { isCurrencyCode, minorUnits, mulDiv } from '../money';
import { defaultExtras, defaultTiers, sizeClasses, sizeClassLabels, type SizeClass } from './commissions';

// Size classes, tiers and stages come from one place each: the figures API's size classes and default
// tiers (./commissions) and the default stage template (../hazards), so a figure's keys are the table's keys.
export { sizeClasses, sizeClassLabels, defaultTiers, type SizeClass };

/** The default stages as {key, label}: the default stage template's keys and names. */
export const defaultStages: { key: string; label: string }[] = defaultStageTemplate.map((s) => ({ key: s.key, label: s.name }));

export const extraLineKinds = ['shipping', 'insurance', 'models', 'custom'] as const;
export type ExtraLineKind = (typeof extraLineKinds)[number];

// --- building blocks ---------------------------------------------------------------------------

/** Stable machine keys for stages, tiers, extras: what stored quotes and figures refer to; labels can change. */
export const tableKey = z
  .string({ error: 'Enter a key.' })
  .regex(/^[a-z][a-z0-9-]{0,31}$/, 'Use 1–32 lower-case letters, digits and dashes, starting with a letter.');

const label = z.string({ error: 'Enter a label.' }).trim().min(1, 'Enter a label.').max(80, 'Use at most 80 characters.');

/** A non-negative amount in minor units. 10^12 keeps every product the engine forms far below 2^53. */
export const minorAmount = z
  .number({ error: 'Enter an amount.' })
  .int('Amounts are whole minor units (cents, not dollars).')
  .min(0, 'Amounts cannot be negative.')
  .max(1e12, 'That amount is too large.');

/** Decimal hours as the owner types them (1.25 = 1 h 15 min); the engine rounds each value to whole minutes. */
export const hours = z
  .number({ error: 'Enter hours.' })
  .min(0, 'Hours cannot be negative.')
  .max(1000, 'Use at most 1000 hours.')
  .refine((h) => Number.isFinite(h), 'Enter hours.');

const basisPoints = (max: number) =>
  z
    .number({ error: 'Enter a percentage.' })
    .int('Use basis points: 1 bp = 0.01 %, so 12.5 % = 1250.')
    .min(0, 'Percentages cannot be negative.')
    .max(max, `Use at most ${max / 100} %.`);

export const currency = z
  .string({ error: 'Choose a currency.' })
  .trim()
  .toUpperCase()
  .refine(isCurrencyCode, 'Use an ISO 4217 currency code such as EUR, USD or JPY.');

const stage = z.object({ key: tableKey, label });
const tier = z.object({ key: tableKey, label });

const flatExtra = z.object({
  key: tableKey,
  label,
  kind: z.literal('flat'),
  /** price per figure (each unit of a line), minor units */
  amount: minorAmount,
});
const hoursExtra = z.object({
  key: tableKey,
  label,
  kind: z.literal('hours'),
  /** hours added to one unit; they follow the batch learning curve with the stage hours */
  hours,
  /** the stage these hours are worked in, so the accepted quote's stage estimates include them */
  stage: tableKey,
});
export const extra = z.discriminatedUnion('kind', [flatExtra, hoursExtra]);
export type Extra = z.infer<typeof extra>;

/** A ready-made line the owner can drop into a quote (shipping, insurance, models bought for the client). */
export const presetLine = z.object({
  key: tableKey,
  label,
  kind: z.enum(extraLineKinds),
  amount: minorAmount,
  taxable: z.boolean().default(true),
});

export const discountStep = z.object({
  /** applies when the figures' subtotal is at least this (minor units) */
  minTotal: minorAmount,
  bp: basisPoints(10_000),
});

export const rushRule = z.object({
  /** due dates sooner than this many weeks from the quote date are rush; 0 turns rush off */
  weeks: z.number().int().min(0).max(104),
  surchargeBp: basisPoints(20_000),
});

export const taxSettings = z.object({
  rateBp: basisPoints(10_000),
  label: z.string().trim().min(1, 'Enter a label such as VAT, GST or Sales tax.').max(30),
  /** true: the table's prices already contain the tax (gross); false: tax is added on top */
  pricesIncludeTax: z.boolean(),
  /** the studio's tax registration number, printed on invoices */
  taxId: z.string().trim().max(60).default(''),
});

// --- the table -------------------------------------------------------------------------------

const priceTableObject = z.object({
  currency,
  /** minor units per hour of bench time */
  hourlyRate: minorAmount,
  stages: z.array(stage).min(1, 'Keep at least one stage.').max(30),
  tiers: z.array(tier).min(1, 'Keep at least one tier.').max(10),
  /** stageHours[sizeClass][tierKey][stageKey] = hours for ONE figure; every cell present */
  stageHours: z.record(z.string(), z.record(z.string(), z.record(z.string(), hours))),
  extras: z.array(extra).max(100).default([]),
  presetLines: z.array(presetLine).max(50).default([]),
  materialsPerFigure: minorAmount.default(0),
  minimumOrder: minorAmount.default(0),
  rush: rushRule.default({ weeks: 0, surchargeBp: 0 }),
  discounts: z.array(discountStep).max(20).default([]),
  tax: taxSettings,
  /** 5000 = 50 %; 20–50 % is common practice */
  depositBp: basisPoints(10_000).default(5000),
  /** Wright's learning rate for identical figures in one line, 0.5–1 (1 = no batch saving) */
  learningRate: z.number().min(0.5, 'Use a learning rate from 0.5 to 1.').max(1, 'Use a learning rate from 0.5 to 1.').default(0.9),
  quoteValidityDays: z.number().int().min(1).max(365).default(30),
  terms: z.string().max(20_000).default(''),
  showHoursToClient: z.boolean().default(false),
});

function duplicates(keys: string[]): string[] {
  return keys.filter((k, i) => keys.indexOf(k) !== i);
}

export const priceTable = priceTableObject.superRefine((t, ctx) => {
  for (const [list, name] of [
    [t.stages, 'stages'],
    [t.tiers, 'tiers'],
    [t.extras, 'extras'],
    [t.presetLines, 'presetLines'],
  ] as const) {
    for (const d of new Set(duplicates(list.map((x) => x.key)))) {
      ctx.addIssue({ code: 'custom', path: [name], message: `The key "${d}" is used twice.` });
    }
  }
  for (const d of new Set(duplicates(t.discounts.map((x) => String(x.minTotal))))) {
    ctx.addIssue({ code: 'custom', path: ['discounts'], message: `Two discounts start at the same total (${d}).` });
  }
  const stageKeys = new Set(t.stages.map((s) => s.key));
  const tierKeys = new Set(t.tiers.map((s) => s.key));
  t.extras.forEach((e, i) => {
    if (e.kind === 'hours' && !stageKeys.has(e.stage)) {
      ctx.addIssue({ code: 'custom', path: ['extras', i, 'stage'], message: `There is no stage "${e.stage}".` });
    }
  });
  for (const size of Object.keys(t.stageHours)) {
    if (!(sizeClasses as readonly string[]).includes(size)) {
      ctx.addIssue({ code: 'custom', path: ['stageHours', size], message: `There is no size class "${size}".` });
    }
  }
  for (const size of sizeClasses) {
    const row = t.stageHours[size];
    if (!row) {
      ctx.addIssue({ code: 'custom', path: ['stageHours', size], message: `Enter the hours for ${sizeClassLabels[size]}.` });
      continue;
    }
    for (const tk of Object.keys(row)) {
      if (!tierKeys.has(tk)) ctx.addIssue({ code: 'custom', path: ['stageHours', size, tk], message: `There is no tier "${tk}".` });
    }
    for (const tr of t.tiers) {
      const cell = row[tr.key];
      if (!cell) {
        ctx.addIssue({ code: 'custom', path: ['stageHours', size, tr.key], message: `Enter the hours for ${tr.label}, ${sizeClassLabels[size]}.` });
        continue;
      }
      for (const sk of Object.keys(cell)) {
        if (!stageKeys.has(sk)) ctx.addIssue({ code: 'custom', path: ['stageHours', size, tr.key, sk], message: `There is no stage "${sk}".` });
      }
      for (const st of t.stages) {
        if (cell[st.key] === undefined) {
          ctx.addIssue({
            code: 'custom',
            path: ['stageHours', size, tr.key, st.key],
            message: `Enter the ${st.label} hours for ${tr.label}, ${sizeClassLabels[size]}.`,
          });
        }
      }
    }
  }
});
export type PriceTable = z.infer<typeof priceTable>;
export type PriceTableInput = z.input<typeof priceTable>;

// --- quote engine input ------------------------------------------------------------------------

const lineId = z.union([z.string().max(64), z.number().int()]).nullable().default(null);

export const quoteFigure = z.object({
  id: lineId,
  name: z.string().trim().min(1, 'Name the figure.').max(120),
  /** identical figures painted together as one batch */
  quantity: z.number().int().min(1, 'Use at least 1.').max(10_000),
  sizeClass: z.enum(sizeClasses, { error: 'Choose a size class.' }),
  tier: tableKey,
  /** keys of the table's extras, each applied to every unit of the line */
  extras: z.array(tableKey).max(50).default([]),
  /** per-unit hours replacing the table's for these stages (vehicles and monsters are often quoted apart) */
  stageHours: z.record(z.string(), hours).default({}),
  /** stages not needed for this figure (e.g. it arrives assembled) */
  omitStages: z.array(tableKey).default([]),
});
export type QuoteFigure = z.infer<typeof quoteFigure>;

export const quoteExtraLine = z.object({
  id: lineId,
  kind: z.enum(extraLineKinds),
  label,
  quantity: z.number().int().min(1).max(10_000).default(1),
  unitAmount: minorAmount,
  taxable: z.boolean().default(true),
});
export type QuoteExtraLine = z.infer<typeof quoteExtraLine>;

const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date as yyyy-mm-dd.').refine((s) => {
  const [y, m, d] = s.split('-').map(Number);
  const t = new Date(Date.UTC(y, m - 1, d));
  return t.getUTCFullYear() === y && t.getUTCMonth() === m - 1 && t.getUTCDate() === d;
}, 'That date does not exist.');

export const quoteEngineInput = z
  .object({
    priceTable,
    figures: z.array(quoteFigure).max(500).default([]),
    extraLines: z.array(quoteExtraLine).max(100).default([]),
    /** when the client wants the work back; null = no date, never rush */
    dueDate: isoDate.nullable().default(null),
    /** the quote's date, passed in (never read from a clock) so preview and server agree */
    today: isoDate,
  })
  .superRefine((q, ctx) => {
    const t = q.priceTable;
    const stageKeys = new Set(t.stages.map((s) => s.key));
    const tierKeys = new Set(t.tiers.map((s) => s.key));
    const extraKeys = new Set(t.extras.map((s) => s.key));
    q.figures.forEach((f, i) => {
      if (!tierKeys.has(f.tier)) ctx.addIssue({ code: 'custom', path: ['figures', i, 'tier'], message: `There is no tier "${f.tier}".` });
      for (const e of f.extras) {
        if (!extraKeys.has(e)) ctx.addIssue({ code: 'custom', path: ['figures', i, 'extras'], message: `There is no extra "${e}".` });
      }
      for (const d of new Set(duplicates(f.extras))) {
        ctx.addIssue({ code: 'custom', path: ['figures', i, 'extras'], message: `The extra "${d}" is listed twice.` });
      }
      for (const s of [...Object.keys(f.stageHours), ...f.omitStages]) {
        if (!stageKeys.has(s)) ctx.addIssue({ code: 'custom', path: ['figures', i, 'stageHours'], message: `There is no stage "${s}".` });
      }
    });
    if (q.dueDate !== null && q.dueDate < q.today) {
      ctx.addIssue({ code: 'custom', path: ['dueDate'], message: 'The due date is before the quote date.' });
    }
  });
export type QuoteEngineInput = z.input<typeof quoteEngineInput>;
export type ParsedQuoteEngineInput = z.infer<typeof quoteEngineInput>;

// --- defaults --------------------------------------------------------------------------------

// Invented defaults, not a survey of prices: hours per stage for one 28 mm figure in each tier, scaled
// by an invented factor per size class and rounded to 0.05 h. A new studio edits them before quoting.
// Keyed by the default tiers' and stages' keys; a key missing here would price that cell at 0 h.
const baseMinutes28: Record<string, Record<string, number>> = {
  tabletop: { prep: 15, assembly: 15, prime: 6, basecoat: 30, shade: 9, layer: 30, glaze: 0, details: 15, basing: 15, weathering: 0, varnish: 6 },
  enhanced: { prep: 21, assembly: 21, prime: 6, basecoat: 45, shade: 15, layer: 75, glaze: 30, details: 45, basing: 30, weathering: 15, varnish: 6 },
  display: { prep: 45, assembly: 45, prime: 9, basecoat: 90, shade: 30, layer: 240, glaze: 120, details: 180, basing: 90, weathering: 60, varnish: 9 },
};
// percent of the 28 mm hours (invented)
const sizeFactorPct: Record<SizeClass, number> = {
  '25': 90, '28': 100, '32': 115, '40': 160, '50': 220, '60': 300,
  '80': 450, '100': 600, '120': 800, '160': 1100, large: 1400,
};

// Invented hourly rates in whole major units, only to make a new table look plausible in a few
// currencies; they are not exchange rates or market data. Other currencies start at 0 and the owner sets them.
const inventedHourlyMajor: Record<string, number> = {
  USD: 30, EUR: 28, GBP: 25, CAD: 40, AUD: 45, NZD: 48, CHF: 30, SEK: 320, NOK: 330, DKK: 210,
  PLN: 120, CZK: 700, HUF: 11000, JPY: 4200, KRW: 40000, KWD: 9, BHD: 11, JOD: 21,
};

// How the price table prices each of a new studio's default extras (./commissions defaultExtras, the keys
// figures carry), invented: hours added to one figure in a stage, or a flat price as a percentage of the hourly rate.
const defaultExtraPricing: Record<string, { kind: 'hours'; hours: number; stage: string } | { kind: 'flat'; pctOfRate: number }> = {
  assembly: { kind: 'hours', hours: 0.25, stage: 'assembly' },
  conversion: { kind: 'hours', hours: 1.5, stage: 'assembly' },
  magnetising: { kind: 'hours', hours: 0.5, stage: 'assembly' },
  freehand: { kind: 'hours', hours: 1.5, stage: 'details' },
  nmm: { kind: 'hours', hours: 1, stage: 'layer' },
  'light-effects': { kind: 'hours', hours: 1, stage: 'glaze' },
  weathering: { kind: 'hours', hours: 0.5, stage: 'weathering' },
  'display-base': { kind: 'flat', pctOfRate: 100 },
};

/** A complete, valid table for a new studio: the 11 default stages, 3 tiers, invented hours and prices. */
export function defaultPriceTable(currencyCode: string): PriceTable {
  const cur = currencyCode.trim().toUpperCase();
  const digits = minorUnits(cur);
  const rate = (inventedHourlyMajor[cur] ?? 0) * 10 ** digits;
  // derived money defaults: a fraction of the hourly rate, rounded to whole major units
  const ofRate = (pct: number) => mulDiv(mulDiv(rate, pct, 100 * 10 ** digits), 10 ** digits, 1);

  const stageHours: PriceTable['stageHours'] = {};
  for (const size of sizeClasses) {
    stageHours[size] = {};
    for (const tr of defaultTiers) {
      const cell: Record<string, number> = {};
      for (const st of defaultStages) {
        const minutes = mulDiv(baseMinutes28[tr.key]?.[st.key] ?? 0, sizeFactorPct[size], 300) * 3; // to 3 min = 0.05 h
        cell[st.key] = minutes / 60;
      }
      stageHours[size][tr.key] = cell;
    }
  }

  return {
    currency: cur,
    hourlyRate: rate,
    stages: defaultStages.map((s) => ({ ...s })),
    tiers: defaultTiers.map((t) => ({ ...t })),
    stageHours,
    extras: defaultExtras.map((e) => {
      const p = defaultExtraPricing[e.key];
      return p.kind === 'flat' ? { key: e.key, label: e.label, kind: 'flat', amount: ofRate(p.pctOfRate) } : { key: e.key, label: e.label, ...p };
    }),
    presetLines: [
      { key: 'shipping', label: 'Tracked shipping', kind: 'shipping', amount: ofRate(50), taxable: true },
      { key: 'insurance', label: 'Shipping insurance', kind: 'insurance', amount: ofRate(20), taxable: true },
      { key: 'models', label: 'Models bought for you', kind: 'models', amount: 0, taxable: true },
    ],
    materialsPerFigure: ofRate(5),
    minimumOrder: ofRate(300),
    rush: { weeks: 4, surchargeBp: 2500 },
    discounts:
      rate === 0
        ? []
        : [
            { minTotal: ofRate(2000), bp: 500 },
            { minTotal: ofRate(5000), bp: 1000 },
          ],
    tax: { rateBp: 0, label: 'Tax', pricesIncludeTax: false, taxId: '' },
    depositBp: 5000,
    learningRate: 0.9,
    quoteValidityDays: 30,
    terms: [
      'Deposit: due when you accept this quote; your commission joins the queue once it is paid. It is refunded in full if you cancel before work starts; after that, the part that covers work already done is kept.',
      'Balance: due after you approve the photos of the finished figures, before they are shipped.',
      'Changes: one round of changes to the colour scheme is included, agreed on a test figure or on colour blocking before the batch. Later changes are quoted separately.',
      'Delivery dates are estimates; we tell you as soon as one moves.',
    ].join('\n\n'),
    showHoursToClient: false,
  };
}
