// The quote engine: a price table plus a commission's figures in, every amount of the quote out.
// Pure and deterministic — the browser preview and the server both run it and must agree to the unit,
// so it reads no clock, uses only IEEE-exact float operations (+ − × ÷, Math.round) where floats are
// unavoidable (hours), and does all money in integers (shared/money.ts).
//
// ROUNDING (stated once, applied once per line / per order-level amount):
//  - hours: each table value (decimal hours) → whole minutes, Math.round(h · 60);
//    a batch's minutes → Math.round(unit minutes · Wright factor), once per line;
//  - money: half away from zero (shared/money.ts), once per amount:
//    line labour = round(hourly rate · batch minutes / 60); discount, rush, tax each = round(base · bp / 10 000)
//    (inclusive tax: round(gross · rate / (10 000 + rate))); deposit = round(total · bp / 10 000) to the
//    payment service's step for the currency, so it can be charged exactly; balance = total − deposit.
//  Flat prices, materials and extra lines are integers times quantities: exact, never rounded.
import { allocate, chargeRule, mulDiv, percentOf, taxIncluded } from './money';
import {
  quoteEngineInput,
  sizeClassLabels,
  type ExtraLineKind,
  type ParsedQuoteEngineInput,
  type QuoteEngineInput,
  type SizeClass,
} from './schemas/price-table';

// --- Wright's learning curve ---------------------------------------------------------------------
// T. P. Wright, "Factors Affecting the Cost of Airplanes", Journal of the Aeronautical Sciences 3 (1936):
// cumulative-average model. The average time per unit falls to r of itself each time the quantity
// doubles, so the total for n units is T1 · n^(1 + log2 r).
//
// Math.pow/log/exp are not required to be correctly rounded and differ in the last bit between
// engines, which could flip a rounded minute between browser and server. These series use only
// + − × ÷ (correctly rounded in every engine) with fixed term counts, so they give the same bits everywhere.

const LN2 = 0.6931471805599453;

function detLn(x: number): number {
  let m = x;
  let e = 0;
  while (m >= 2) {
    m /= 2; // exact: scaling by powers of two
    e++;
  }
  while (m < 1) {
    m *= 2;
    e--;
  }
  if (m > 1.4142135623730951) {
    m /= 2;
    e++;
  }
  // ln m = 2 atanh z, z = (m − 1)/(m + 1), |z| ≤ 0.172: 20 odd terms are far past double precision
  const z = (m - 1) / (m + 1);
  const z2 = z * z;
  let term = z;
  let sum = 0;
  for (let k = 1; k <= 39; k += 2) {
    sum += term / k;
    term *= z2;
  }
  return 2 * sum + e * LN2;
}

function detExp(y: number): number {
  const k = Math.round(y / LN2);
  const r = y - k * LN2; // |r| ≤ 0.35
  let term = 1;
  let sum = 1;
  for (let i = 1; i <= 24; i++) {
    term = (term * r) / i;
    sum += term;
  }
  for (let i = 0; i < k; i++) sum *= 2;
  for (let i = 0; i > k; i--) sum /= 2;
  return sum;
}

/** n^(1 + log2 r): the multiple of the first unit's time that n identical units take in all. */
export function learningCurveFactor(quantity: number, learningRate: number): number {
  if (!Number.isInteger(quantity) || quantity < 0) throw new RangeError(`The quantity must be a whole number ≥ 0, got ${quantity}`);
  if (!(learningRate > 0 && learningRate <= 1)) throw new RangeError(`The learning rate must be in (0, 1], got ${learningRate}`);
  if (quantity <= 1) return quantity;
  if (learningRate === 1) return quantity;
  const exponent = 1 + detLn(learningRate) / LN2;
  return detExp(exponent * detLn(quantity));
}

/**
 * Total hours for `quantity` identical units when the first takes `firstUnitHours`, by Wright's
 * cumulative-average model: T1 · n^(1 + log2 r). At r = 0.8, T1 = 100: 2 units 160 h, 4 units 256 h; r = 1 is linear.
 */
export function learningCurveHours(firstUnitHours: number, quantity: number, learningRate: number): number {
  if (!Number.isFinite(firstUnitHours) || firstUnitHours < 0) throw new RangeError(`Hours must be ≥ 0, got ${firstUnitHours}`);
  return firstUnitHours * learningCurveFactor(quantity, learningRate);
}

// --- output shapes --------------------------------------------------------------------------------

export type FigureQuoteLine = {
  type: 'figure';
  id: string | number | null;
  name: string;
  quantity: number;
  sizeClass: SizeClass;
  tier: string;
  tierLabel: string;
  extras: { key: string; label: string; kind: 'flat' | 'hours'; unitAmount: number; unitMinutes: number }[];
  /** minutes per stage for ONE unit (stage hours of the table or the figure's own, plus hour extras) */
  unitStageMinutes: Record<string, number>;
  /** minutes per stage for the whole batch after the learning curve; sums to batchMinutes exactly */
  batchStageMinutes: Record<string, number>;
  unitMinutes: number;
  batchMinutes: number;
  labour: number;
  /** flat extras × quantity */
  extrasAmount: number;
  /** materials per figure × quantity */
  materials: number;
  amount: number;
};

export type ExtraQuoteLine = {
  type: 'extra';
  id: string | number | null;
  kind: ExtraLineKind;
  label: string;
  quantity: number;
  unitAmount: number;
  taxable: boolean;
  amount: number;
};

export type QuoteLine = FigureQuoteLine | ExtraQuoteLine;

export type ClientBreakdown = {
  currency: string;
  showHours: boolean;
  lines: { label: string; detail: string; quantity: number; minutes: number | null; amount: number }[];
  /** amounts are never negative; `effect` says which way they move the subtotal */
  adjustments: { kind: 'discount' | 'rush' | 'minimum'; label: string; effect: 'subtract' | 'add'; amount: number }[];
  subtotal: number;
  tax: { label: string; rateBp: number; inclusive: boolean; amount: number } | null;
  total: number;
  deposit: number;
  balance: number;
  totalMinutes: number | null;
  validUntil: string;
};

export type QuoteResult = {
  currency: string;
  today: string;
  dueDate: string | null;
  validUntil: string;
  /** figure lines then extra lines, each in input order; their amounts sum to `subtotal` */
  lines: QuoteLine[];
  figuresSubtotal: number;
  extrasSubtotal: number;
  subtotal: number;
  /** the best discount step reached by the figures' subtotal (shipping and other extra lines neither count nor get it) */
  discount: { bp: number; minTotal: number | null; amount: number };
  /** surcharge on the figures' subtotal when the due date is sooner than `weeks` weeks */
  rush: { applies: boolean; weeks: number; daysUntilDue: number | null; bp: number; amount: number };
  /** lifts the figures' work (after discount and rush) to the minimum order; 0 without figure lines */
  minimumTopUp: number;
  /** subtotal − discount + rush + minimumTopUp: the total before exclusive tax (or the gross total with inclusive tax) */
  net: number;
  tax: { label: string; rateBp: number; inclusive: boolean; taxableBase: number; amount: number };
  total: number;
  deposit: { bp: number; amount: number };
  balance: number;
  totalMinutes: number;
  /** the whole commission's minutes per stage (sum of the lines' batch minutes) */
  stageMinutes: Record<string, number>;
  clientBreakdown: ClientBreakdown;
};

/** Thrown for input the engine cannot price; `issues` carry zod-style paths for a form or a 422. */
export class QuoteInputError extends Error {
  readonly issues: { path: (string | number)[]; message: string }[];
  constructor(issues: { path: (string | number)[]; message: string }[]) {
    super(issues.map((i) => (i.path.length ? `${i.path.join('.')}: ${i.message}` : i.message)).join('; '));
    this.name = 'QuoteInputError';
    this.issues = issues;
  }
}

// --- helpers ----------------------------------------------------------------------------------------

function dayNumber(iso: string): number {
  const [y, m, d] = iso.split('-').map(Number);
  return Date.UTC(y, m - 1, d) / 86_400_000;
}

function addDays(iso: string, days: number): string {
  return new Date((dayNumber(iso) + days) * 86_400_000).toISOString().slice(0, 10);
}

/** 1250 → "12.5 %", 500 → "5 %" (integer maths, the same text everywhere) */
export function formatBasisPoints(bp: number): string {
  const whole = Math.trunc(bp / 100);
  const frac = String(bp % 100).padStart(2, '0').replace(/0+$/, '');
  return `${whole}${frac ? `.${frac}` : ''} %`;
}

/** 150 → "2.5 h", 20 → "0.33 h" (rounded half up to 2 decimals; for display only) */
export function formatHours(minutes: number): string {
  const hundredths = mulDiv(minutes, 100, 60);
  const whole = Math.trunc(hundredths / 100);
  const frac = String(hundredths % 100).padStart(2, '0').replace(/0+$/, '');
  return `${whole}${frac ? `.${frac}` : ''} h`;
}

// --- the engine -----------------------------------------------------------------------------------

/**
 * Price a quote. Validates `input` with `quoteEngineInput` (throws QuoteInputError), then:
 * line minutes = table (or figure) stage hours + hour extras, per unit, through Wright's curve for the
 * batch; line amount = labour + flat extras × qty + materials × qty; extra lines = unit amount × qty;
 * subtotal = Σ lines; discount and rush on the figures' subtotal; minimum-order top-up; tax inclusive or
 * exclusive on the taxable part; deposit and balance. Same input → the same object, key for key.
 */
export function quoteFigures(input: QuoteEngineInput): QuoteResult {
  const parsed = quoteEngineInput.safeParse(input);
  if (!parsed.success) {
    throw new QuoteInputError(parsed.error.issues.map((i) => ({ path: i.path.map((p) => (typeof p === 'number' ? p : String(p))), message: i.message })));
  }
  return price(parsed.data);
}

function price(q: ParsedQuoteEngineInput): QuoteResult {
  const t = q.priceTable;
  const stageKeys = t.stages.map((s) => s.key);
  const extrasByKey = new Map(t.extras.map((e) => [e.key, e]));
  const tierLabel = new Map(t.tiers.map((x) => [x.key, x.label]));

  const figureLines: FigureQuoteLine[] = q.figures.map((f) => {
    const omitted = new Set(f.omitStages);
    const grid = t.stageHours[f.sizeClass][f.tier];
    const unitStageMinutes: Record<string, number> = {};
    for (const s of stageKeys) {
      const h = f.stageHours[s] ?? grid[s];
      unitStageMinutes[s] = omitted.has(s) ? 0 : Math.round(h * 60) + 0; // + 0 turns a -0 into 0
    }
    let unitFlat = 0;
    const extras = f.extras.map((key) => {
      const e = extrasByKey.get(key)!;
      if (e.kind === 'flat') {
        unitFlat += e.amount;
        return { key, label: e.label, kind: e.kind, unitAmount: e.amount, unitMinutes: 0 };
      }
      const minutes = Math.round(e.hours * 60) + 0;
      unitStageMinutes[e.stage] += minutes;
      return { key, label: e.label, kind: e.kind, unitAmount: 0, unitMinutes: minutes };
    });
    const unitMinutes = stageKeys.reduce((s, k) => s + unitStageMinutes[k], 0);
    const batchMinutes = f.quantity === 1 ? unitMinutes : Math.round(unitMinutes * learningCurveFactor(f.quantity, t.learningRate));
    const shares = allocate(
      batchMinutes,
      stageKeys.map((k) => unitStageMinutes[k]),
    );
    const batchStageMinutes: Record<string, number> = {};
    stageKeys.forEach((k, i) => (batchStageMinutes[k] = shares[i]));
    if ((t.hourlyRate * batchMinutes) / 60 > Number.MAX_SAFE_INTEGER) {
      throw new QuoteInputError([{ path: [], message: `The quote's labour for "${f.name}" is too large to price exactly.` }]);
    }
    const labour = mulDiv(t.hourlyRate, batchMinutes, 60);
    const extrasAmount = unitFlat * f.quantity;
    const materials = t.materialsPerFigure * f.quantity;
    return {
      type: 'figure',
      id: f.id,
      name: f.name,
      quantity: f.quantity,
      sizeClass: f.sizeClass,
      tier: f.tier,
      tierLabel: tierLabel.get(f.tier)!,
      extras,
      unitStageMinutes,
      batchStageMinutes,
      unitMinutes,
      batchMinutes,
      labour,
      extrasAmount,
      materials,
      amount: labour + extrasAmount + materials,
    };
  });

  const extraLines: ExtraQuoteLine[] = q.extraLines.map((l) => ({
    type: 'extra',
    id: l.id,
    kind: l.kind,
    label: l.label,
    quantity: l.quantity,
    unitAmount: l.unitAmount,
    taxable: l.taxable,
    amount: l.unitAmount * l.quantity,
  }));

  const figuresSubtotal = figureLines.reduce((s, l) => s + l.amount, 0);
  const extrasSubtotal = extraLines.reduce((s, l) => s + l.amount, 0);
  const subtotal = figuresSubtotal + extrasSubtotal;
  const tooLarge = (what: string) => new QuoteInputError([{ path: [], message: `The quote's ${what} is too large to price exactly.` }]);
  // every product and sum of lines is ≤ the subtotal, so a digit lost anywhere shows up here
  if (!Number.isSafeInteger(subtotal)) throw tooLarge('subtotal');

  // highest step reached; steps are not cumulative
  let best: { minTotal: number; bp: number } | null = null;
  for (const d of t.discounts) {
    if (figuresSubtotal >= d.minTotal && d.bp > 0 && (best === null || d.minTotal > best.minTotal)) best = d;
  }
  const discount = {
    bp: best?.bp ?? 0,
    minTotal: best?.minTotal ?? null,
    amount: best ? percentOf(figuresSubtotal, best.bp) : 0,
  };

  const daysUntilDue = q.dueDate === null ? null : dayNumber(q.dueDate) - dayNumber(q.today);
  const rushApplies = daysUntilDue !== null && t.rush.weeks > 0 && t.rush.surchargeBp > 0 && daysUntilDue < t.rush.weeks * 7 && figureLines.length > 0;
  const rush = {
    applies: rushApplies,
    weeks: t.rush.weeks,
    daysUntilDue,
    bp: rushApplies ? t.rush.surchargeBp : 0,
    amount: rushApplies ? percentOf(figuresSubtotal, t.rush.surchargeBp) : 0,
  };

  const work = figuresSubtotal - discount.amount + rush.amount;
  const minimumTopUp = figureLines.length > 0 && work < t.minimumOrder ? t.minimumOrder - work : 0;
  const net = subtotal - discount.amount + rush.amount + minimumTopUp;

  const untaxed = extraLines.filter((l) => !l.taxable).reduce((s, l) => s + l.amount, 0);
  const taxableBase = net - untaxed;
  const inclusive = t.tax.pricesIncludeTax;
  const taxAmount = inclusive ? taxIncluded(taxableBase, t.tax.rateBp) : percentOf(taxableBase, t.tax.rateBp);
  const total = inclusive ? net : net + taxAmount;
  if (!Number.isSafeInteger(net) || !Number.isSafeInteger(total)) throw tooLarge('total');

  let step = 1;
  try {
    step = chargeRule(t.currency).minorStep;
  } catch {
    // the payment service has no rule for this currency: nothing to align the deposit to
  }
  let depositAmount = t.depositBp === 10_000 ? total : mulDiv(total, t.depositBp, 10_000 * step) * step;
  if (depositAmount > total) depositAmount -= step; // rounding up to the step can pass a tiny total
  const balance = total - depositAmount;

  const stageMinutes: Record<string, number> = {};
  for (const k of stageKeys) stageMinutes[k] = figureLines.reduce((s, l) => s + l.batchStageMinutes[k], 0);
  const totalMinutes = figureLines.reduce((s, l) => s + l.batchMinutes, 0);
  const validUntil = addDays(q.today, t.quoteValidityDays);

  const lines: QuoteLine[] = [...figureLines, ...extraLines];
  const showHours = t.showHoursToClient;
  const adjustments: ClientBreakdown['adjustments'] = [];
  if (discount.amount > 0) adjustments.push({ kind: 'discount', label: `Order discount ${formatBasisPoints(discount.bp)}`, effect: 'subtract', amount: discount.amount });
  if (rush.amount > 0) {
    adjustments.push({ kind: 'rush', label: `Rush (due within ${t.rush.weeks} week${t.rush.weeks === 1 ? '' : 's'}) ${formatBasisPoints(rush.bp)}`, effect: 'add', amount: rush.amount });
  }
  if (minimumTopUp > 0) adjustments.push({ kind: 'minimum', label: 'Minimum order top-up', effect: 'add', amount: minimumTopUp });

  const clientBreakdown: ClientBreakdown = {
    currency: t.currency,
    showHours,
    lines: lines.map((l) =>
      l.type === 'figure'
        ? {
            label: l.name,
            detail: [sizeClassLabels[l.sizeClass], l.tierLabel, ...l.extras.map((e) => e.label)].join(' · '),
            quantity: l.quantity,
            minutes: showHours ? l.batchMinutes : null,
            amount: l.amount,
          }
        : { label: l.label, detail: '', quantity: l.quantity, minutes: null, amount: l.amount },
    ),
    adjustments,
    subtotal,
    tax: t.tax.rateBp > 0 ? { label: t.tax.label, rateBp: t.tax.rateBp, inclusive, amount: taxAmount } : null,
    total,
    deposit: depositAmount,
    balance,
    totalMinutes: showHours ? totalMinutes : null,
    validUntil,
  };

  return {
    currency: t.currency,
    today: q.today,
    dueDate: q.dueDate,
    validUntil,
    lines,
    figuresSubtotal,
    extrasSubtotal,
    subtotal,
    discount,
    rush,
    minimumTopUp,
    net,
    tax: { label: t.tax.label, rateBp: t.tax.rateBp, inclusive, taxableBase, amount: taxAmount },
    total,
    deposit: { bp: t.depositBp, amount: depositAmount },
    balance,
    totalMinutes,
    stageMinutes,
    clientBreakdown,
  };
}
