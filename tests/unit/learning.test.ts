import { describe, expect, it } from 'vitest';
import { cellActuals, firstFigureHours, fitLearningRate, median, suggestCells, type BatchPoint } from '../../shared/learning';
import { learningCurveHours } from '../../shared/pricing';

// mulberry32: a fixed-seed generator, so the generated batches are the same on every run.
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe('fitLearningRate: least squares on ln(time) against ln(quantity)', () => {
  it('fits three batches worked out by hand', () => {
    // Batches of 1, 2 and 4 figures took 2 h, 3 h and 5 h.
    // x = ln 1, ln 2, ln 4 = 0, L, 2L (L = ln 2); mean x = L.  y = ln 2, ln 3, ln 5.
    // Sxx = L² + 0 + L² = 2L².  Sxy = (−L)(ln 2 − ȳ) + 0 + (L)(ln 5 − ȳ) = L · ln(5/2).
    // slope = ln 2.5 / (2 ln 2) = log4 2.5 = 0.660964…; r = 2^(slope − 1) = 2^(log4 2.5) / 2 = √2.5 / 2 = 0.790569…
    const fit = fitLearningRate([
      { quantity: 1, hours: 2 },
      { quantity: 2, hours: 3 },
      { quantity: 4, hours: 5 },
    ]);
    expect(fit).not.toBeNull();
    expect(fit!.slope).toBeCloseTo(Math.log(2.5) / (2 * Math.log(2)), 12);
    expect(fit!.rate).toBeCloseTo(Math.sqrt(2.5) / 2, 12);
    expect(fit!.rate).toBeCloseTo(0.790569, 6);
    // intercept = ȳ − slope · x̄ = ln(30)/3 − log4(2.5) · ln 2 = ln(30)/3 − ln(2.5)/2
    expect(fit!.intercept).toBeCloseTo(Math.log(30) / 3 - Math.log(2.5) / 2, 12);
    expect([fit!.points, fit!.quantities]).toEqual([3, 3]);
    expect(fit!.r2).toBeGreaterThan(0.99);
    expect(fit!.r2).toBeLessThan(1);
  });

  it('recovers the rate exactly from points on a Wright curve (r = 0.8: 10 h, 16 h, 25.6 h)', () => {
    // T(n) = 10 · n^(1 + log2 0.8): T(2) = 10 · 2 · 0.8 = 16, T(4) = 10 · 4 · 0.64 = 25.6.
    const fit = fitLearningRate([
      { quantity: 1, hours: 10 },
      { quantity: 2, hours: 16 },
      { quantity: 4, hours: 25.6 },
    ])!;
    expect(fit.rate).toBeCloseTo(0.8, 12);
    expect(fit.firstFigureFactor).toBeCloseTo(10, 10);
    expect(fit.r2).toBeCloseTo(1, 12);
  });

  it('recovers a known rate of 0.85 from 60 generated batches of different figures with noise', () => {
    const rand = rng(20260302);
    const rate = 0.85;
    const points: BatchPoint[] = [];
    for (let i = 0; i < 60; i++) {
      const quantity = 1 + Math.floor(rand() * 30);
      const unitHours = 0.5 + rand() * 8; // the table's hours for one figure of this batch
      const speed = 1.15; // this studio takes 15 % longer than its table on a first figure
      const noise = Math.exp((rand() - 0.5) * 0.1); // ±5 % multiplicative
      points.push({ quantity, unitHours, hours: learningCurveHours(unitHours * speed, quantity, rate) * noise });
    }
    const fit = fitLearningRate(points)!;
    expect(fit.points).toBe(60);
    expect(Math.abs(fit.rate - rate)).toBeLessThan(0.01);
    expect(Math.abs(fit.firstFigureFactor - 1.15)).toBeLessThan(0.05);
    // Without the table's hours the differences between figures swamp the batch effect.
    const raw = fitLearningRate(points.map(({ quantity, hours }) => ({ quantity, hours })))!;
    expect(raw.r2).toBeLessThan(fit.r2);
  });

  it('needs two distinct batch sizes and ignores unusable points', () => {
    expect(fitLearningRate([])).toBeNull();
    expect(fitLearningRate([{ quantity: 3, hours: 5 }, { quantity: 3, hours: 6 }])).toBeNull();
    expect(fitLearningRate([{ quantity: 1, hours: 2 }, { quantity: 2, hours: 0 }, { quantity: 0, hours: 4 }])).toBeNull();
    const fit = fitLearningRate([
      { quantity: 1, hours: 2 },
      { quantity: 2, hours: Number.NaN },
      { quantity: 2, hours: 3.2 }, // r = 3.2 / (2 · 2) = 0.8
    ])!;
    expect(fit.points).toBe(2);
    expect(fit.rate).toBeCloseTo(0.8, 12);
  });
});

describe('median and one-figure hours', () => {
  it('takes the middle value, or the mean of the middle two', () => {
    expect(median([5, 1, 3])).toBe(3);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([])).toBeNull();
  });

  it('turns a batch back into one figure by the table rate', () => {
    // 4 figures at r = 0.8 take 4 · 0.64 = 2.56 times one figure: 25.6 h → 10 h.
    expect(firstFigureHours(25.6, 4, 0.8)).toBeCloseTo(10, 12);
    expect(firstFigureHours(3, 1, 0.8)).toBe(3);
  });
});

describe('cell medians and suggestions', () => {
  const order = { sizeClasses: ['28', '32'], tiers: ['tabletop', 'display'], stages: ['basecoat', 'layer'] };

  it('gives the median one-figure hours per size class, tier and stage with the count behind it', () => {
    const samples = [
      { sizeClass: '28', tier: 'tabletop', stage: 'basecoat', quantity: 1, loggedHours: 0.6 },
      { sizeClass: '28', tier: 'tabletop', stage: 'basecoat', quantity: 1, loggedHours: 0.8 },
      // 2 figures at r = 0.9 take 2 · 0.9 = 1.8 one-figure times: 1.8 h → 1 h.
      { sizeClass: '28', tier: 'tabletop', stage: 'basecoat', quantity: 2, loggedHours: 1.8 },
      // extras add 0.5 h to one figure's layer stage: 2.0 − 0.5 = 1.5 h
      { sizeClass: '32', tier: 'display', stage: 'layer', quantity: 1, loggedHours: 2, extraUnitHours: 0.5 },
      { sizeClass: '32', tier: 'display', stage: 'layer', quantity: 1, loggedHours: 0 }, // nothing logged: left out
    ];
    const cells = cellActuals(samples, 0.9, order);
    expect(cells.map((c) => [c.sizeClass, c.tier, c.stage, c.count])).toEqual([
      ['28', 'tabletop', 'basecoat', 3],
      ['32', 'display', 'layer', 1],
    ]);
    expect(cells[0].medianHours).toBeCloseTo(0.8, 12); // median of 0.6, 0.8, 1.0
    expect(cells[1].medianHours).toBeCloseTo(1.5, 12);
  });

  it('suggests a change only with enough done stages and a big enough difference', () => {
    const actuals = [
      { sizeClass: '28', tier: 'tabletop', stage: 'basecoat', medianHours: 0.8, count: 3 }, // table 0.5: +60 % → 0.8
      { sizeClass: '28', tier: 'tabletop', stage: 'layer', medianHours: 0.52, count: 5 }, // table 0.5: +4 %, no
      { sizeClass: '32', tier: 'display', stage: 'layer', medianHours: 6, count: 2 }, // too few
      { sizeClass: '32', tier: 'display', stage: 'basecoat', medianHours: 1.31, count: 4 }, // table 1.6: −18 % → 1.30
    ];
    const table: Record<string, number> = { '28/tabletop/basecoat': 0.5, '28/tabletop/layer': 0.5, '32/display/layer': 4, '32/display/basecoat': 1.6 };
    const s = suggestCells(actuals, (c) => table[`${c.sizeClass}/${c.tier}/${c.stage}`]);
    expect(s.map((x) => [x.stage, x.sizeClass, x.tableHours, x.suggestedHours])).toEqual([
      ['basecoat', '28', 0.5, 0.8],
      ['basecoat', '32', 1.6, 1.3],
    ]);
    expect(s[0].change).toBeCloseTo(0.6, 12);
    expect(s[1].change).toBeCloseTo((1.31 - 1.6) / 1.6, 12);
  });
});
