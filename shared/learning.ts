// Learning from actuals: what the studio's logged time says about its estimates. Pure functions; the
// server feeds them rows from the database, the tests feed them hand-worked and generated numbers.
//
// The batch learning rate follows the same model as the quote engine (shared/pricing.ts): Wright's
// cumulative-average curve, T(n) = T1 · n^(1 + log2 r) for n identical figures painted as one batch
// (T. P. Wright, "Factors Affecting the Cost of Airplanes", J. Aeronautical Sciences 3, 1936).
// Taking logs: ln T = ln T1 + (1 + log2 r) · ln n, a straight line in (ln n, ln T). We fit it by ordinary
// least squares and read the rate off the slope: r = 2^(slope − 1).
//
// Batches of different figures take different times for their first unit. Each point may carry the
// price table's hours for ONE of its figures (`unitHours`); the fit then runs on ln(T / unitHours), which
// removes the differences between size classes and tiers and leaves the batch effect in the slope.

export type BatchPoint = {
  /** identical figures painted together */
  quantity: number;
  /** hours logged on the whole batch (the stages compared) */
  hours: number;
  /** the table's hours for one such figure over the same stages; 1 when not given */
  unitHours?: number;
};

export type LearningFit = {
  /** r: the share of itself the average time per figure falls to each time the batch doubles */
  rate: number;
  /** slope of ln(hours / unitHours) against ln(quantity): 1 + log2 r */
  slope: number;
  /** ln of the fitted first-figure time over the table's (0 = the table's hours are right for one figure) */
  intercept: number;
  /** exp(intercept): logged first-figure time as a multiple of the table's */
  firstFigureFactor: number;
  /** batches used */
  points: number;
  /** distinct batch sizes among them */
  quantities: number;
  /** coefficient of determination of the fit, 0..1 (1 when every point lies on the line) */
  r2: number;
};

/**
 * Least squares on ln(hours / unitHours) against ln(quantity). Points with a non-positive or non-finite
 * value are left out. Null when fewer than two distinct batch sizes remain: a line needs two x values.
 */
export function fitLearningRate(points: readonly BatchPoint[]): LearningFit | null {
  const xs: number[] = [];
  const ys: number[] = [];
  for (const p of points) {
    const unit = p.unitHours ?? 1;
    if (!(Number.isInteger(p.quantity) && p.quantity >= 1)) continue;
    if (!(Number.isFinite(p.hours) && p.hours > 0 && Number.isFinite(unit) && unit > 0)) continue;
    xs.push(Math.log(p.quantity));
    ys.push(Math.log(p.hours / unit));
  }
  const n = xs.length;
  const quantities = new Set(xs).size;
  if (quantities < 2) return null;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = xs[i] - mx;
    const dy = ys[i] - my;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
  }
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  const r2 = syy === 0 ? 1 : Math.min(1, (sxy * sxy) / (sxx * syy));
  return { rate: 2 ** (slope - 1), slope, intercept, firstFigureFactor: Math.exp(intercept), points: n, quantities, r2 };
}

/** The median of some numbers (mean of the middle two for an even count); null for none. */
export function median(values: readonly number[]): number | null {
  if (values.length === 0) return null;
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

/**
 * Hours of ONE figure from a batch's logged hours, by the same curve: T1 = T / n^(1 + log2 r). The price
 * table holds hours for one figure, so this is what a batch's actuals are compared with.
 */
export function firstFigureHours(batchHours: number, quantity: number, learningRate: number): number {
  if (quantity <= 1) return batchHours;
  return batchHours / quantity ** (1 + Math.log2(learningRate));
}

export type DoneStageSample = {
  sizeClass: string;
  tier: string;
  stage: string;
  quantity: number;
  /** hours logged on the stage for the whole batch */
  loggedHours: number;
  /** hours of the price table's extras that the figure's extras add to this stage, for one figure */
  extraUnitHours?: number;
};

export type CellActual = {
  sizeClass: string;
  tier: string;
  stage: string;
  /** median over done stages of the logged hours for one figure (batches converted by the table's rate) */
  medianHours: number;
  /** how many done stages the median rests on */
  count: number;
};

/**
 * Per size class, tier and stage: the median logged hours for one figure, with the count behind it.
 * Each done stage's batch hours are turned into one figure's hours with the table's learning rate, and
 * the hours the figure's extras add to that stage (from the table) are taken off, so what is left
 * compares with the table's cell. Sorted by size class, tier and stage as given in `order`.
 */
export function cellActuals(
  samples: readonly DoneStageSample[],
  learningRate: number,
  order: { sizeClasses: readonly string[]; tiers: readonly string[]; stages: readonly string[] },
): CellActual[] {
  const groups = new Map<string, { sizeClass: string; tier: string; stage: string; values: number[] }>();
  for (const s of samples) {
    if (!(s.loggedHours > 0)) continue;
    const one = Math.max(0, firstFigureHours(s.loggedHours, s.quantity, learningRate) - (s.extraUnitHours ?? 0));
    const key = `${s.sizeClass}\u0000${s.tier}\u0000${s.stage}`;
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { sizeClass: s.sizeClass, tier: s.tier, stage: s.stage, values: [] }));
    g.values.push(one);
  }
  const rank = (list: readonly string[], k: string) => {
    const i = list.indexOf(k);
    return i < 0 ? list.length : i;
  };
  return [...groups.values()]
    .map((g) => ({ sizeClass: g.sizeClass, tier: g.tier, stage: g.stage, medianHours: median(g.values) as number, count: g.values.length }))
    .sort(
      (a, b) =>
        rank(order.sizeClasses, a.sizeClass) - rank(order.sizeClasses, b.sizeClass) ||
        rank(order.tiers, a.tier) - rank(order.tiers, b.tier) ||
        rank(order.stages, a.stage) - rank(order.stages, b.stage),
    );
}

export type CellSuggestion = CellActual & {
  /** the table's hours for one figure in this cell now */
  tableHours: number;
  /** the suggested new value: the median, rounded to 0.05 h (3 minutes) */
  suggestedHours: number;
  /** (median − table) / table; null when the table says 0 h */
  change: number | null;
};

export type SuggestionRules = {
  /** fewest done stages a suggestion rests on */
  minCount: number;
  /** smallest relative difference worth a change, 0.1 = 10 % */
  minChange: number;
};

/** Our own defaults (common practice for a small studio): three done stages, a 10 % difference. */
export const defaultSuggestionRules: SuggestionRules = { minCount: 3, minChange: 0.1 };

export const roundToStep = (hours: number, step = 0.05) => Math.round(hours / step) * step;

/**
 * Cells where the logged median differs from the table by at least `minChange` (and by at least one
 * 0.05 h step), resting on at least `minCount` done stages. `tableHours(cell)` returns undefined for a
 * cell the table does not have, which is then left out.
 */
export function suggestCells(
  actuals: readonly CellActual[],
  tableHours: (c: { sizeClass: string; tier: string; stage: string }) => number | undefined,
  rules: SuggestionRules = defaultSuggestionRules,
): CellSuggestion[] {
  const out: CellSuggestion[] = [];
  for (const a of actuals) {
    if (a.count < rules.minCount) continue;
    const table = tableHours(a);
    if (table === undefined) continue;
    const suggested = Math.round(roundToStep(a.medianHours) * 100) / 100;
    if (Math.abs(suggested - table) < 0.05 - 1e-9) continue;
    const change = table > 0 ? (a.medianHours - table) / table : null;
    if (change !== null && Math.abs(change) < rules.minChange) continue;
    out.push({ ...a, tableHours: table, suggestedHours: suggested, change });
  }
  return out;
}
