// The price table as the owner types it: every amount, percentage and hour count is kept as the
// text in its box, so "12,50" or "1.234" in a two-digit currency can be shown beside the box
// instead of being silently turned into something else. Paths are the table's own
// ("stageHours.28.tabletop.prime"), so the server's field errors land on the same boxes.
import { fromMinor, toMinor } from '../../../../shared/money';
import { priceTable, type PriceTable, type PriceTableInput } from '../../../../shared/schemas/price-table';
import { keyFromLabel } from '../../../../shared/schemas/commissions';

export type ExtraDraft = { key: string; label: string; kind: 'flat' | 'hours'; amount: string; hours: string; stage: string };
export type PresetDraft = { key: string; label: string; kind: PriceTable['presetLines'][number]['kind']; amount: string; taxable: boolean };

export type PriceDraft = {
  currency: string;
  hourlyRate: string;
  stages: PriceTable['stages'];
  tiers: PriceTable['tiers'];
  stageHours: Record<string, Record<string, Record<string, string>>>;
  extras: ExtraDraft[];
  presetLines: PresetDraft[];
  materialsPerFigure: string;
  minimumOrder: string;
  rush: { weeks: string; surchargeBp: string };
  discounts: { minTotal: string; bp: string }[];
  tax: { rateBp: string; label: string; pricesIncludeTax: 'included' | 'excluded'; taxId: string };
  depositBp: string;
  learningRate: string;
  quoteValidityDays: string;
  terms: string;
  showHoursToClient: boolean;
};

export type DraftIssue = { path: string; message: string };

// --- table → text --------------------------------------------------------------------------------

/** 1250 → "12.5", 500 → "5" */
export function bpToText(bp: number): string {
  const whole = Math.trunc(bp / 100);
  const frac = String(bp % 100).padStart(2, '0').replace(/0+$/, '');
  return frac ? `${whole}.${frac}` : String(whole);
}

export function hoursToText(h: number): string {
  return String(Math.round(h * 10_000) / 10_000);
}

function moneyText(minor: number, currency: string): string {
  try {
    return fromMinor(minor, currency);
  } catch {
    return String(minor);
  }
}

export function toDraft(t: PriceTable): PriceDraft {
  const m = (minor: number) => moneyText(minor, t.currency);
  const stageHours: PriceDraft['stageHours'] = {};
  for (const [size, tiers] of Object.entries(t.stageHours)) {
    stageHours[size] = {};
    for (const [tier, stages] of Object.entries(tiers)) {
      stageHours[size][tier] = {};
      for (const [stage, h] of Object.entries(stages)) stageHours[size][tier][stage] = hoursToText(h);
    }
  }
  return {
    currency: t.currency,
    hourlyRate: m(t.hourlyRate),
    stages: t.stages,
    tiers: t.tiers,
    stageHours,
    extras: t.extras.map((e) =>
      e.kind === 'flat'
        ? { key: e.key, label: e.label, kind: 'flat', amount: m(e.amount), hours: '', stage: t.stages[0]?.key ?? '' }
        : { key: e.key, label: e.label, kind: 'hours', amount: '', hours: hoursToText(e.hours), stage: e.stage },
    ),
    presetLines: t.presetLines.map((p) => ({ key: p.key, label: p.label, kind: p.kind, amount: m(p.amount), taxable: p.taxable })),
    materialsPerFigure: m(t.materialsPerFigure),
    minimumOrder: m(t.minimumOrder),
    rush: { weeks: String(t.rush.weeks), surchargeBp: bpToText(t.rush.surchargeBp) },
    discounts: t.discounts.map((d) => ({ minTotal: m(d.minTotal), bp: bpToText(d.bp) })),
    tax: { rateBp: bpToText(t.tax.rateBp), label: t.tax.label, pricesIncludeTax: t.tax.pricesIncludeTax ? 'included' : 'excluded', taxId: t.tax.taxId },
    depositBp: bpToText(t.depositBp),
    learningRate: String(t.learningRate),
    quoteValidityDays: String(t.quoteValidityDays),
    terms: t.terms,
    showHoursToClient: t.showHoursToClient,
  };
}

// --- text → table --------------------------------------------------------------------------------

/** "12.5" → 1250 basis points, exactly; at most two decimals. */
export function parsePercent(text: string): number | string {
  const s = text.trim().replace(/\s*%$/, '');
  if (s === '') return 'Enter a percentage (0 for none).';
  if (/^\d+,\d+$/.test(s)) return `Write the percentage with a point, such as "${s.replace(',', '.')}".`;
  const m = /^(\d+)(?:\.(\d{1,2}))?$/.exec(s);
  if (!m) return /^\d+\.\d{3,}$/.test(s) ? 'Use at most two decimals, such as 12.75.' : 'Enter a percentage as a number, such as 20 or 12.5.';
  return Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
}

/** Decimal hours such as "1.25" (1 h 15 min). */
export function parseHours(text: string): number | string {
  const s = text.trim();
  if (s === '') return 'Enter the hours (0 if it is not needed).';
  if (/^\d+,\d+$/.test(s)) return `Write hours with a point, such as "${s.replace(',', '.')}".`;
  if (!/^\d+(\.\d+)?$/.test(s)) return 'Enter hours as a number, such as 1.5.';
  const h = Number(s);
  if (h > 1000) return 'Use at most 1000 hours.';
  return h;
}

function parseWhole(text: string, min: number, max: number, what: string): number | string {
  const s = text.trim();
  if (!/^\d+$/.test(s)) return `Enter ${what} as a whole number.`;
  const n = Number(s);
  if (n < min || n > max) return `Use ${min} to ${max} ${what}.`;
  return n;
}

function parseMoney(text: string, currency: string): number | string {
  if (text.trim() === '') return 'Enter an amount (0 for none).';
  try {
    const minor = toMinor(text, currency);
    if (minor < 0) return 'Amounts cannot be negative.';
    return minor;
  } catch (err) {
    return err instanceof Error ? err.message : 'That is not an amount.';
  }
}

function uniqueKey(wanted: string, taken: Set<string>): string {
  let key = wanted;
  for (let i = 2; taken.has(key); i++) key = `${wanted.slice(0, 28)}-${i}`;
  taken.add(key);
  return key;
}

/**
 * The draft as a table for the API, with every problem found on the way: first what cannot be
 * read at all (by the box it came from), then the shared schema's own checks on the result.
 */
export function fromDraft(d: PriceDraft): { table: PriceTableInput; issues: DraftIssue[] } {
  const issues: DraftIssue[] = [];
  const currency = d.currency.trim().toUpperCase();
  let currencyOk = true;
  try {
    toMinor('0', currency);
  } catch {
    currencyOk = false;
    issues.push({ path: 'currency', message: 'Use an ISO 4217 currency code such as EUR, USD or JPY.' });
  }
  function read<T>(path: string, result: T | string, fallback: T): T {
    if (typeof result === 'string') {
      issues.push({ path, message: result });
      return fallback;
    }
    return result;
  }
  // With no valid currency, amounts cannot be read yet; the currency box says why.
  const money = (path: string, text: string) => (currencyOk ? read(path, parseMoney(text, currency), 0) : 0);

  const stageHours: PriceTableInput['stageHours'] = {};
  for (const [size, tiers] of Object.entries(d.stageHours)) {
    stageHours[size] = {};
    for (const [tier, stages] of Object.entries(tiers)) {
      stageHours[size][tier] = {};
      for (const [stage, text] of Object.entries(stages)) {
        stageHours[size][tier][stage] = read(`stageHours.${size}.${tier}.${stage}`, parseHours(text), 0);
      }
    }
  }

  const extraKeys = new Set(d.extras.map((e) => e.key).filter(Boolean));
  const extras: NonNullable<PriceTableInput['extras']> = d.extras.map((e, i) => {
    const key = e.key || uniqueKey(keyFromLabel(e.label || 'extra'), extraKeys);
    return e.kind === 'flat'
      ? { key, label: e.label, kind: 'flat', amount: money(`extras.${i}.amount`, e.amount) }
      : { key, label: e.label, kind: 'hours', hours: read(`extras.${i}.hours`, parseHours(e.hours), 0), stage: e.stage };
  });

  const presetKeys = new Set(d.presetLines.map((p) => p.key).filter(Boolean));
  const presetLines: NonNullable<PriceTableInput['presetLines']> = d.presetLines.map((p, i) => {
    const key = p.key || uniqueKey(keyFromLabel(p.label || 'line'), presetKeys);
    return { key, label: p.label, kind: p.kind, amount: money(`presetLines.${i}.amount`, p.amount), taxable: p.taxable };
  });

  const lr = d.learningRate.trim();
  let learningRate = 0.9;
  if (!/^(0(\.\d+)?|1(\.0+)?)$/.test(lr)) issues.push({ path: 'learningRate', message: 'Enter a number from 0.5 to 1, such as 0.9.' });
  else learningRate = Number(lr);

  const table: PriceTableInput = {
    currency,
    hourlyRate: money('hourlyRate', d.hourlyRate),
    stages: d.stages,
    tiers: d.tiers,
    stageHours,
    extras,
    presetLines,
    materialsPerFigure: money('materialsPerFigure', d.materialsPerFigure),
    minimumOrder: money('minimumOrder', d.minimumOrder),
    rush: {
      weeks: read('rush.weeks', parseWhole(d.rush.weeks, 0, 104, 'weeks'), 0),
      surchargeBp: read('rush.surchargeBp', parsePercent(d.rush.surchargeBp), 0),
    },
    discounts: d.discounts.map((x, i) => ({ minTotal: money(`discounts.${i}.minTotal`, x.minTotal), bp: read(`discounts.${i}.bp`, parsePercent(x.bp), 0) })),
    tax: {
      rateBp: read('tax.rateBp', parsePercent(d.tax.rateBp), 0),
      label: d.tax.label,
      pricesIncludeTax: d.tax.pricesIncludeTax === 'included',
      taxId: d.tax.taxId,
    },
    depositBp: read('depositBp', parsePercent(d.depositBp), 5000),
    learningRate,
    quoteValidityDays: read('quoteValidityDays', parseWhole(d.quoteValidityDays, 1, 365, 'days'), 30),
    terms: d.terms,
    showHoursToClient: d.showHoursToClient,
  };

  const seen = new Set(issues.map((i) => i.path));
  const checked = priceTable.safeParse(table);
  if (!checked.success) {
    for (const issue of checked.error.issues) {
      const path = issue.path.map(String).join('.');
      if (seen.has(path)) continue;
      seen.add(path);
      issues.push({ path, message: friendlier(path, issue.message) });
    }
  }
  return { table, issues };
}

/** The schema speaks in basis points; the boxes take percentages. */
function friendlier(path: string, message: string): string {
  if (/Bp$|\.bp$/.test(path)) return message.replace(/Use basis points.*$/, 'Use at most two decimals.');
  return message;
}

/** A new extra's or line's key comes from its label when saved; until then it has none. */
export function emptyExtra(stageKey: string): ExtraDraft {
  return { key: '', label: '', kind: 'hours', amount: '', hours: '1', stage: stageKey };
}
