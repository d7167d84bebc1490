import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { chargeAmount, chargeRule } from '../../shared/money';
import { defaultStageTemplate } from '../../shared/hazards';
import { defaultExtras, defaultTiers as studioDefaultTiers, sizeClasses as figureSizeClasses } from '../../shared/schemas/commissions';
import {
  formatBasisPoints,
  formatHours,
  learningCurveFactor,
  learningCurveHours,
  QuoteInputError,
  quoteFigures,
  type FigureQuoteLine,
  type QuoteResult,
} from '../../shared/pricing';
import {
  defaultPriceTable,
  defaultStages,
  defaultTiers,
  priceTable,
  sizeClasses,
  type PriceTable,
  type QuoteEngineInput,
} from '../../shared/schemas/price-table';

const stageKeys = defaultStages.map((s) => s.key);

/** a grid cell with every stage at 0 h except the ones given */
function cell(hours: Partial<Record<(typeof stageKeys)[number], number>>): Record<string, number> {
  return Object.fromEntries(stageKeys.map((k) => [k, hours[k] ?? 0]));
}

function figureLine(q: QuoteResult, i: number): FigureQuoteLine {
  const l = q.lines[i];
  if (l.type !== 'figure') throw new Error(`line ${i} is not a figure line`);
  return l;
}

// --------------------------------------------------------------------------------------------------

describe("learningCurveHours — Wright's cumulative-average model", () => {
  // T. P. Wright, "Factors Affecting the Cost of Airplanes", J. Aeronautical Sciences 3 (1936):
  // total for n units = T1 · n^(1 + log2 r). Worked example from the issue: r = 0.8, T1 = 100 h.
  it('r = 0.8, T1 = 100 h: 1 unit 100 h, 2 units 160 h, 4 units 256 h, 8 units 409.6 h', () => {
    expect(learningCurveHours(100, 1, 0.8)).toBe(100);
    expect(learningCurveHours(100, 2, 0.8)).toBeCloseTo(160, 9);
    expect(learningCurveHours(100, 4, 0.8)).toBeCloseTo(256, 9);
    expect(learningCurveHours(100, 8, 0.8)).toBeCloseTo(409.6, 9);
  });

  it('the cumulative average falls to r each time the quantity doubles', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.5, max: 1, noNaN: true }), fc.integer({ min: 1, max: 2000 }), (r, n) => {
        const avg = (k: number) => learningCurveHours(10, k, r) / k;
        expect(avg(2 * n) / avg(n)).toBeCloseTo(r, 10);
      }),
    );
  });

  it('r = 1 is linear, exactly', () => {
    expect(learningCurveHours(3, 7, 1)).toBe(21);
    expect(learningCurveHours(2.5, 10, 1)).toBe(25);
  });

  it('quantity 0 is 0 h; bad arguments throw', () => {
    expect(learningCurveHours(5, 0, 0.9)).toBe(0);
    expect(() => learningCurveHours(5, 1.5, 0.9)).toThrow(RangeError);
    expect(() => learningCurveHours(5, 2, 1.1)).toThrow(RangeError);
    expect(() => learningCurveHours(5, 2, 0)).toThrow(RangeError);
    expect(() => learningCurveHours(-1, 2, 0.9)).toThrow(RangeError);
  });

  it('the engine-independent series match Math.pow to 1e-13 (relative)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.5, max: 1, noNaN: true }), fc.integer({ min: 1, max: 10_000 }), (r, n) => {
        const expected = n ** (1 + Math.log2(r));
        expect(Math.abs(learningCurveFactor(n, r) - expected) / expected).toBeLessThan(1e-13);
      }),
      { numRuns: 500 },
    );
  });
});

describe('formatting helpers', () => {
  it('formatBasisPoints and formatHours', () => {
    expect(formatBasisPoints(500)).toBe('5 %');
    expect(formatBasisPoints(1250)).toBe('12.5 %');
    expect(formatBasisPoints(825)).toBe('8.25 %');
    expect(formatHours(150)).toBe('2.5 h');
    expect(formatHours(20)).toBe('0.33 h');
    expect(formatHours(60)).toBe('1 h');
  });
});

// --------------------------------------------------------------------------------------------------

describe('price table schema and defaults', () => {
  it.each(['USD', 'JPY', 'KWD', 'HUF', 'EUR', 'IDR'])('defaultPriceTable(%s) is a valid table and survives parsing unchanged', (cur) => {
    const t = defaultPriceTable(cur);
    const parsed = priceTable.parse(t);
    expect(parsed).toEqual(t);
    expect(t.currency).toBe(cur);
  });

  it('has the 11 default stages, the 3 default tiers and the usual defaults', () => {
    const t = defaultPriceTable('EUR');
    expect(t.stages.map((s) => s.key)).toEqual(['prep', 'assembly', 'prime', 'basecoat', 'shade', 'layer', 'glaze', 'details', 'basing', 'weathering', 'varnish']);
    expect(t.tiers.map((s) => s.label)).toEqual(['Tabletop', 'Enhanced', 'Display']);
    expect(t.depositBp).toBe(5000);
    expect(t.learningRate).toBe(0.9);
    expect(t.quoteValidityDays).toBe(30);
    expect(t.showHoursToClient).toBe(false);
    expect(Object.keys(t.stageHours)).toEqual([...sizeClasses]);
    for (const size of sizeClasses) for (const tier of defaultTiers) expect(Object.keys(t.stageHours[size][tier.key])).toEqual(stageKeys);
  });

  it('invented default hours grow with the size class and the tier', () => {
    const t = defaultPriceTable('USD');
    const total = (size: string, tier: string) => Object.values(t.stageHours[size][tier]).reduce((s, h) => s + h, 0);
    expect(total('32', 'tabletop')).toBeGreaterThan(total('28', 'tabletop'));
    expect(total('large', 'display')).toBeGreaterThan(total('160', 'display'));
    expect(total('28', 'display')).toBeGreaterThan(total('28', 'enhanced'));
    expect(total('28', 'enhanced')).toBeGreaterThan(total('28', 'tabletop'));
  });

  it("uses a new studio's own keys: the figures' size classes, the default tiers, extras and stage template", () => {
    const t = defaultPriceTable('EUR');
    expect(Object.keys(t.stageHours)).toEqual([...figureSizeClasses]);
    expect(t.tiers.map((x) => x.key)).toEqual(studioDefaultTiers.map((x) => x.key));
    expect(t.extras.map((x) => x.key)).toEqual(defaultExtras.map((x) => x.key));
    expect(t.stages.map((x) => x.key)).toEqual(defaultStageTemplate.map((x) => x.key));
    // a figure as the figures API stores it prices without translation
    const q = quoteFigures({ priceTable: t, figures: [{ name: 'Scout', quantity: 1, sizeClass: '28', tier: 'tabletop', extras: defaultExtras.map((x) => x.key) }], today: '2025-01-01' });
    expect(q.lines).toHaveLength(1);
  });

  it('defaults in a currency without an invented rate start at 0 for the owner to set', () => {
    expect(defaultPriceTable('IDR').hourlyRate).toBe(0);
    expect(defaultPriceTable('JPY').hourlyRate % 1).toBe(0);
  });

  it('refuses an unknown currency', () => {
    expect(() => defaultPriceTable('XYZ')).toThrow('Unknown currency code "XYZ"');
    expect(priceTable.safeParse({ ...defaultPriceTable('USD'), currency: 'XYZ' }).success).toBe(false);
  });

  function issues(t: unknown): string[] {
    const r = priceTable.safeParse(t);
    return r.success ? [] : r.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
  }

  it('reports a missing grid cell by its path', () => {
    const t = defaultPriceTable('USD');
    delete t.stageHours['40'].display.glaze;
    expect(issues(t)).toEqual(['stageHours.40.display.glaze: Enter the Glaze hours for Display, 40 mm.']);
    const u = defaultPriceTable('USD');
    delete u.stageHours.large;
    expect(issues(u)).toEqual(['stageHours.large: Enter the hours for Large or vehicle.']);
  });

  it('rejects duplicate keys, hour extras on unknown stages, stray grid keys and out-of-range values', () => {
    const t = defaultPriceTable('USD');
    t.stages.push({ key: 'prep', label: 'Prep again' });
    expect(issues(t).some((m) => m.includes('"prep" is used twice'))).toBe(true);

    const e = defaultPriceTable('USD');
    e.extras.push({ key: 'gems', label: 'Gems', kind: 'hours', hours: 1, stage: 'sparkle' });
    expect(issues(e)).toContain('extras.8.stage: There is no stage "sparkle".');

    const g = defaultPriceTable('USD');
    g.stageHours['28'].tabletop.sparkle = 1;
    expect(issues(g)).toContain('stageHours.28.tabletop.sparkle: There is no stage "sparkle".');

    expect(issues({ ...defaultPriceTable('USD'), learningRate: 0.4 }).length).toBe(1);
    expect(issues({ ...defaultPriceTable('USD'), hourlyRate: 30.5 }).length).toBe(1);
    expect(issues({ ...defaultPriceTable('USD'), depositBp: -1 }).length).toBe(1);
    expect(issues({ ...defaultPriceTable('USD'), discounts: [{ minTotal: 100, bp: 5 }, { minTotal: 100, bp: 10 }] }).length).toBe(1);
  });
});

// --------------------------------------------------------------------------------------------------
// Hand-worked quotes. Every expected number below is worked out in the comments, not copied from a run.

/** USD test table: $30.00/h, r = 0.8, materials $1.50 per figure, 28 mm Tabletop = 2 h a figure. */
function usdTable(): PriceTable {
  const t = defaultPriceTable('USD');
  t.hourlyRate = 3000;
  t.learningRate = 0.8;
  t.materialsPerFigure = 150;
  t.stageHours['28'].tabletop = cell({ basecoat: 1, layer: 0.5, basing: 0.5 }); // 60 + 30 + 30 = 120 min
  t.extras = [
    { key: 'magnetising', label: 'Magnetising', kind: 'hours', hours: 0.25, stage: 'assembly' }, // 15 min
    { key: 'display-base', label: 'Display base', kind: 'flat', amount: 1200 },
  ];
  t.discounts = [{ minTotal: 20000, bp: 500 }];
  t.rush = { weeks: 4, surchargeBp: 2500 };
  t.minimumOrder = 5000;
  t.tax = { rateBp: 825, label: 'Sales tax', pricesIncludeTax: false, taxId: 'ST-0001' };
  t.depositBp = 5000;
  return t;
}

function usdInput(dueDate: string | null): QuoteEngineInput {
  return {
    priceTable: usdTable(),
    figures: [
      { id: 'f1', name: 'Line troopers', quantity: 4, sizeClass: '28', tier: 'tabletop', extras: ['magnetising'] },
      { id: 'f2', name: 'Squad leader', quantity: 1, sizeClass: '28', tier: 'tabletop', extras: ['display-base'] },
    ],
    extraLines: [
      { kind: 'shipping', label: 'Tracked shipping', unitAmount: 1500 },
      { kind: 'insurance', label: 'Insurance', unitAmount: 300, taxable: false },
    ],
    today: '2025-03-03',
    dueDate,
  };
}

describe('hand-worked quote: USD, tax added on top, discount, rush', () => {
  // Line troopers ×4: unit = 120 min + magnetising 15 min (assembly) = 135 min.
  //   Wright at r = 0.8: 4^(1 + log2 0.8) = 4 · 0.8² = 2.56 → 135 · 2.56 = 345.6 → 346 min.
  //   labour = 3000 · 346 / 60 = 17 300 exactly; materials 4 · 150 = 600 → line 17 900.
  //   stages for the batch, 346 split 15 : 60 : 30 : 30 (assembly, basecoat, layer, basing):
  //   floors 38, 153, 76, 76 = 343; remainders (·/135) 60, 105, 120, 120 → +1 to layer, basing, basecoat
  //   → assembly 38, basecoat 154, layer 77, basing 77.
  // Squad leader ×1: 120 min → labour 3000 · 120 / 60 = 6000; display base 1200; materials 150 → 7350.
  // Figures 17 900 + 7350 = 25 250; shipping 1500 + insurance 300 → subtotal 27 050.
  // Discount: 25 250 ≥ 20 000 → 5 % = 1262.5 → 1263 (half away from zero).
  // Rush: due 2025-03-24 is 21 days away, < 4 weeks → 25 % of 25 250 = 6312.5 → 6313.
  // Work 25 250 − 1263 + 6313 = 30 300 ≥ minimum 5000 → no top-up.
  // Net 27 050 − 1263 + 6313 = 32 100; taxable = 32 100 − 300 (insurance untaxed) = 31 800.
  // Sales tax 8.25 % of 31 800 = 2623.5 → 2624. Total 32 100 + 2624 = 34 724.
  // Deposit 50 % = 17 362; balance 17 362.
  const q = quoteFigures(usdInput('2025-03-24'));

  it('prices the figure lines', () => {
    const a = figureLine(q, 0);
    expect(a.unitMinutes).toBe(135);
    expect(a.batchMinutes).toBe(346);
    expect(a.labour).toBe(17300);
    expect(a.materials).toBe(600);
    expect(a.amount).toBe(17900);
    expect(a.unitStageMinutes).toMatchObject({ assembly: 15, basecoat: 60, layer: 30, basing: 30, prep: 0 });
    expect(a.batchStageMinutes).toEqual({
      prep: 0, assembly: 38, prime: 0, basecoat: 154, shade: 0, layer: 77, glaze: 0, details: 0, basing: 77, weathering: 0, varnish: 0,
    });
    const b = figureLine(q, 1);
    expect([b.batchMinutes, b.labour, b.extrasAmount, b.materials, b.amount]).toEqual([120, 6000, 1200, 150, 7350]);
  });

  it('adds up the order', () => {
    expect(q.lines.map((l) => l.amount)).toEqual([17900, 7350, 1500, 300]);
    expect(q.figuresSubtotal).toBe(25250);
    expect(q.subtotal).toBe(27050);
    expect(q.discount).toEqual({ bp: 500, minTotal: 20000, amount: 1263 });
    expect(q.rush).toEqual({ applies: true, weeks: 4, daysUntilDue: 21, bp: 2500, amount: 6313 });
    expect(q.minimumTopUp).toBe(0);
    expect(q.net).toBe(32100);
    expect(q.tax).toEqual({ label: 'Sales tax', rateBp: 825, inclusive: false, taxableBase: 31800, amount: 2624 });
    expect(q.total).toBe(34724);
    expect(q.deposit).toEqual({ bp: 5000, amount: 17362 });
    expect(q.balance).toBe(17362);
    expect(q.totalMinutes).toBe(466);
    expect(q.stageMinutes).toMatchObject({ assembly: 38, basecoat: 154 + 60, layer: 77 + 30, basing: 77 + 30 });
    expect(q.validUntil).toBe('2025-04-02'); // 2025-03-03 + 30 days
  });

  it('reads well for the client, without hours', () => {
    const c = q.clientBreakdown;
    expect(c.lines[0]).toEqual({ label: 'Line troopers', detail: '28 mm · Tabletop · Magnetising', quantity: 4, minutes: null, amount: 17900 });
    expect(c.adjustments).toEqual([
      { kind: 'discount', label: 'Order discount 5 %', effect: 'subtract', amount: 1263 },
      { kind: 'rush', label: 'Rush (due within 4 weeks) 25 %', effect: 'add', amount: 6313 },
    ]);
    expect(c.tax).toEqual({ label: 'Sales tax', rateBp: 825, inclusive: false, amount: 2624 });
    expect([c.subtotal, c.total, c.deposit, c.balance, c.totalMinutes]).toEqual([27050, 34724, 17362, 17362, null]);
    expect(JSON.stringify(c)).not.toMatch(/StageMinutes|labour/);
  });

  it('shows hours when the studio chooses to', () => {
    const input = usdInput('2025-03-24');
    (input.priceTable as PriceTable).showHoursToClient = true;
    const c = quoteFigures(input).clientBreakdown;
    expect(c.lines.map((l) => l.minutes)).toEqual([346, 120, null, null]);
    expect(c.totalMinutes).toBe(466);
  });

  it('exactly 4 weeks away is not "sooner than 4 weeks": no rush', () => {
    // due 2025-03-31 = 28 days. Net 27 050 − 1263 = 25 787; taxable 25 487; tax 8.25 % = 2102.68 → 2103;
    // total 27 890; deposit 13 945; balance 13 945.
    const r = quoteFigures(usdInput('2025-03-31'));
    expect(r.rush).toEqual({ applies: false, weeks: 4, daysUntilDue: 28, bp: 0, amount: 0 });
    expect([r.net, r.tax.amount, r.total, r.deposit.amount, r.balance]).toEqual([25787, 2103, 27890, 13945, 13945]);
    expect(quoteFigures(usdInput('2025-03-30')).rush.applies).toBe(true); // 27 days
    expect(quoteFigures(usdInput(null)).rush.applies).toBe(false);
  });
});

describe('hand-worked quote: JPY, tax included, minimum order top-up, 30 % deposit', () => {
  // Table: ¥4000/h, r = 0.9, materials ¥200, minimum ¥30 000, 10 % consumption tax included, deposit 30 %.
  // Knight ×2, 32 mm Enhanced: basecoat 1.5 h + layer 2 h = 210 min; 2^(1 + log2 0.9) = 1.8 → 378 min.
  // labour 4000 · 378 / 60 = 25 200; materials 400 → line 25 600 = subtotal (no discount steps, no due date).
  // Work 25 600 < 30 000 → top-up 4400; net = total = 30 000 (prices include tax).
  // Tax inside: 30 000 · 1000 / 11 000 = 2727.27 → 2727. Deposit 30 % = 9000; balance 21 000.
  const t = defaultPriceTable('JPY');
  t.hourlyRate = 4000;
  t.learningRate = 0.9;
  t.materialsPerFigure = 200;
  t.minimumOrder = 30000;
  t.discounts = [];
  t.tax = { rateBp: 1000, label: 'Consumption tax', pricesIncludeTax: true, taxId: '' };
  t.depositBp = 3000;
  t.stageHours['32'].enhanced = cell({ basecoat: 1.5, layer: 2 });
  const q = quoteFigures({ priceTable: t, figures: [{ name: 'Knight', quantity: 2, sizeClass: '32', tier: 'enhanced' }], today: '2025-06-01' });

  it('matches the hand calculation', () => {
    const a = figureLine(q, 0);
    expect([a.unitMinutes, a.batchMinutes, a.labour, a.materials, a.amount]).toEqual([210, 378, 25200, 400, 25600]);
    expect([q.subtotal, q.discount.amount, q.rush.amount, q.minimumTopUp, q.net]).toEqual([25600, 0, 0, 4400, 30000]);
    expect(q.tax).toEqual({ label: 'Consumption tax', rateBp: 1000, inclusive: true, taxableBase: 30000, amount: 2727 });
    expect([q.total, q.deposit.amount, q.balance]).toEqual([30000, 9000, 21000]);
    expect(q.clientBreakdown.adjustments).toEqual([{ kind: 'minimum', label: 'Minimum order top-up', effect: 'add', amount: 4400 }]);
  });
});

describe('hand-worked quote: KWD, deposit on the payment step of 10 fils', () => {
  // 9.000 KWD/h, r = 1 (no batch saving), materials 0.125 KWD; 50 mm Tabletop = basecoat 0.5 h (30 min)
  // + details 1/3 h (Math.round(20) = 20 min) = 50 min. ×3 → 150 min; labour 9000 · 150 / 60 = 22 500;
  // materials 375 → 22 875 = total (no tax, discount, rush or minimum).
  // Deposit 50 % = 11 437.5 fils, rounded once to the 10-fils step: 22 875 · 5000 / 100 000 = 1143.75 → 1144
  // → 11 440; balance 11 435 (charging it sends 11 440: the service rounds to the nearest ten).
  const t = defaultPriceTable('KWD');
  t.hourlyRate = 9000;
  t.learningRate = 1;
  t.materialsPerFigure = 125;
  t.minimumOrder = 0;
  t.discounts = [];
  t.stageHours['50'].tabletop = cell({ basecoat: 0.5, details: 1 / 3 });
  const q = quoteFigures({ priceTable: t, figures: [{ name: 'Ogre', quantity: 3, sizeClass: '50', tier: 'tabletop' }], today: '2025-01-10', dueDate: '2025-12-01' });

  it('matches the hand calculation', () => {
    const a = figureLine(q, 0);
    expect([a.unitMinutes, a.batchMinutes, a.labour, a.amount]).toEqual([50, 150, 22500, 22875]);
    expect([q.total, q.deposit.amount, q.balance]).toEqual([22875, 11440, 11435]);
    expect(chargeAmount(q.deposit.amount, 'KWD')).toBe(11440);
    expect(chargeAmount(q.balance, 'KWD')).toBe(11440);
  });
});

describe('engine details', () => {
  it("a figure's own stage hours replace the table's; omitted stages count 0", () => {
    const t = usdTable();
    const q = quoteFigures({
      priceTable: t,
      figures: [{ name: 'Tank', quantity: 1, sizeClass: 'large', tier: 'display', stageHours: { basecoat: 10 }, omitStages: ['assembly'] }],
      today: '2025-03-03',
    });
    const l = figureLine(q, 0);
    const grid = t.stageHours.large.display;
    expect(l.unitStageMinutes.basecoat).toBe(600);
    expect(l.unitStageMinutes.assembly).toBe(0);
    expect(l.unitStageMinutes.layer).toBe(Math.round(grid.layer * 60));
  });

  it('a -0 in the hours comes out as 0 minutes, never -0', () => {
    const t = usdTable();
    t.stageHours['28'].tabletop.prep = -0;
    const l = figureLine(quoteFigures({ priceTable: t, figures: [{ name: 'X', quantity: 3, sizeClass: '28', tier: 'tabletop' }], today: '2025-03-03' }), 0);
    expect(Object.is(l.unitStageMinutes.prep, 0)).toBe(true);
  });

  it('takes the highest discount step reached, not the sum', () => {
    const t = usdTable();
    t.discounts = [
      { minTotal: 1000, bp: 200 },
      { minTotal: 20000, bp: 500 },
      { minTotal: 999999, bp: 2000 },
    ];
    const q = quoteFigures({ ...usdInput(null), priceTable: t });
    expect(q.discount).toEqual({ bp: 500, minTotal: 20000, amount: 1263 });
  });

  it('deposit 100 % leaves no balance; deposit 0 % leaves it all', () => {
    for (const [bp, dep] of [
      [10000, 'total'],
      [0, 0],
    ] as const) {
      const t = usdTable();
      t.depositBp = bp;
      const q = quoteFigures({ ...usdInput(null), priceTable: t });
      expect(q.deposit.amount).toBe(dep === 'total' ? q.total : 0);
      expect(q.deposit.amount + q.balance).toBe(q.total);
    }
  });

  it('an empty quote is all zeros, with no minimum top-up', () => {
    const q = quoteFigures({ priceTable: usdTable(), today: '2025-03-03' });
    expect([q.subtotal, q.minimumTopUp, q.total, q.deposit.amount, q.balance]).toEqual([0, 0, 0, 0, 0]);
  });

  it('refuses what it cannot price, with paths for the form', () => {
    const bad = (patch: Partial<QuoteEngineInput>, path: string) => {
      try {
        quoteFigures({ ...usdInput(null), ...patch });
      } catch (e) {
        expect(e).toBeInstanceOf(QuoteInputError);
        expect((e as QuoteInputError).issues.map((i) => i.path.join('.'))).toContain(path);
        return;
      }
      throw new Error(`expected a QuoteInputError at ${path}`);
    };
    bad({ figures: [{ name: 'X', quantity: 1, sizeClass: '28', tier: 'heroic' }] }, 'figures.0.tier');
    bad({ figures: [{ name: 'X', quantity: 1, sizeClass: '28', tier: 'tabletop', extras: ['gold-leaf'] }] }, 'figures.0.extras');
    bad({ figures: [{ name: 'X', quantity: 0, sizeClass: '28', tier: 'tabletop' }] }, 'figures.0.quantity');
    bad({ figures: [{ name: 'X', quantity: 1, sizeClass: '30' as '28', tier: 'tabletop' }] }, 'figures.0.sizeClass');
    bad({ extraLines: [{ kind: 'shipping', label: 'Post', unitAmount: -100 }] }, 'extraLines.0.unitAmount');
    bad({ dueDate: '2025-03-02' }, 'dueDate');
    bad({ today: '2025-02-30' }, 'today');
  });

  it('refuses totals that would not fit exactly in a double', () => {
    const t = usdTable();
    expect(() =>
      quoteFigures({ priceTable: t, today: '2025-03-03', extraLines: Array.from({ length: 100 }, () => ({ kind: 'custom' as const, label: 'Big', quantity: 10_000, unitAmount: 1e12 })) }),
    ).toThrow(QuoteInputError);
  });
});

// --------------------------------------------------------------------------------------------------
// Properties over random quotes in USD, JPY and KWD.

const tiers = defaultTiers.map((t) => t.key);

const tableArb = fc
  .record({
    currency: fc.constantFrom('USD', 'JPY', 'KWD'),
    hourlyRate: fc.integer({ min: 0, max: 2_000_000 }),
    materials: fc.integer({ min: 0, max: 200_000 }),
    minimumOrder: fc.integer({ min: 0, max: 20_000_000 }),
    rushWeeks: fc.integer({ min: 0, max: 12 }),
    rushBp: fc.integer({ min: 0, max: 20_000 }),
    discounts: fc.uniqueArray(fc.record({ minTotal: fc.integer({ min: 0, max: 10_000_000 }), bp: fc.integer({ min: 0, max: 10_000 }) }), {
      selector: (d) => d.minTotal,
      maxLength: 4,
    }),
    taxBp: fc.integer({ min: 0, max: 10_000 }),
    inclusive: fc.boolean(),
    depositBp: fc.oneof(fc.integer({ min: 0, max: 10_000 }), fc.constantFrom(0, 2000, 5000, 10_000)),
    learningRate: fc.double({ min: 0.5, max: 1, noNaN: true }),
    showHours: fc.boolean(),
    flat: fc.integer({ min: 0, max: 500_000 }),
    extraHours: fc.double({ min: 0, max: 20, noNaN: true }),
  })
  .map((o): PriceTable => {
    const t = defaultPriceTable(o.currency);
    t.hourlyRate = o.hourlyRate;
    t.materialsPerFigure = o.materials;
    t.minimumOrder = o.minimumOrder;
    t.rush = { weeks: o.rushWeeks, surchargeBp: o.rushBp };
    t.discounts = o.discounts;
    t.tax = { rateBp: o.taxBp, label: 'VAT', pricesIncludeTax: o.inclusive, taxId: '' };
    t.depositBp = o.depositBp;
    t.learningRate = o.learningRate;
    t.showHoursToClient = o.showHours;
    t.extras = [
      { key: 'flat-extra', label: 'Flat extra', kind: 'flat', amount: o.flat },
      { key: 'hours-extra', label: 'Hours extra', kind: 'hours', hours: o.extraHours, stage: 'details' },
    ];
    return t;
  });

const figureArb = fc.record({
  name: fc.constantFrom('Warden', 'Skirmisher', 'Beast', 'Walker', 'Hero'),
  quantity: fc.integer({ min: 1, max: 300 }),
  sizeClass: fc.constantFrom(...sizeClasses),
  tier: fc.constantFrom(...tiers),
  extras: fc.subarray(['flat-extra', 'hours-extra']),
  omitStages: fc.subarray(stageKeys),
  stageHours: fc.dictionary(fc.constantFrom(...stageKeys), fc.double({ min: 0, max: 50, noNaN: true }), { maxKeys: 3 }),
});

const extraLineArb = fc.record({
  kind: fc.constantFrom('shipping', 'insurance', 'models', 'custom'),
  label: fc.constantFrom('Post', 'Cover', 'Kit', 'Other'),
  quantity: fc.integer({ min: 1, max: 20 }),
  unitAmount: fc.integer({ min: 0, max: 5_000_000 }),
  taxable: fc.boolean(),
});

const dayMs = 86_400_000;
const quoteArb = fc
  .record({
    priceTable: tableArb,
    figures: fc.array(figureArb, { maxLength: 6 }),
    extraLines: fc.array(extraLineArb, { maxLength: 4 }),
    todayOffset: fc.integer({ min: 0, max: 3650 }),
    dueIn: fc.option(fc.integer({ min: 0, max: 400 })),
  })
  .map(({ todayOffset, dueIn, ...rest }): QuoteEngineInput => {
    const base = Date.UTC(2024, 0, 1) + todayOffset * dayMs;
    const iso = (ms: number) => new Date(ms).toISOString().slice(0, 10);
    return { ...rest, today: iso(base), dueDate: dueIn === null ? null : iso(base + dueIn * dayMs) };
  });

function everyNumber(v: unknown, path = '$', out: [string, number][] = []): [string, number][] {
  if (typeof v === 'number') out.push([path, v]);
  else if (Array.isArray(v)) v.forEach((x, i) => everyNumber(x, `${path}[${i}]`, out));
  else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) everyNumber(x, `${path}.${k}`, out);
  return out;
}

const sum = (xs: number[]) => xs.reduce((s, x) => s + x, 0);

// Hundreds of random quotes per property: seconds on an idle machine, more on a shared one.
describe('properties of random quotes (USD, JPY, KWD)', { timeout: 60_000 }, () => {
  it('lines sum to the subtotal; deposit + balance = total; the order adds up', () => {
    fc.assert(
      fc.property(quoteArb, (input) => {
        const q = quoteFigures(input);
        expect(sum(q.lines.map((l) => l.amount))).toBe(q.subtotal);
        expect(q.figuresSubtotal + q.extrasSubtotal).toBe(q.subtotal);
        expect(q.deposit.amount + q.balance).toBe(q.total);
        expect(q.net).toBe(q.subtotal - q.discount.amount + q.rush.amount + q.minimumTopUp);
        expect(q.total).toBe(q.tax.inclusive ? q.net : q.net + q.tax.amount);
        expect(sum(q.clientBreakdown.lines.map((l) => l.amount))).toBe(q.clientBreakdown.subtotal);
        expect([q.clientBreakdown.total, q.clientBreakdown.deposit, q.clientBreakdown.balance]).toEqual([q.total, q.deposit.amount, q.balance]);
      }),
      { numRuns: 300 },
    );
  });

  it('every number is a non-negative safe integer (money in minor units, time in minutes)', () => {
    fc.assert(
      fc.property(quoteArb, (input) => {
        for (const [path, n] of everyNumber(quoteFigures(input))) {
          expect(Number.isSafeInteger(n) && n >= 0 && !Object.is(n, -0), `${path} = ${n}`).toBe(true);
        }
      }),
      { numRuns: 300 },
    );
  });

  it('stage minutes add up; the batch never costs more than one-by-one or less than one unit', () => {
    fc.assert(
      fc.property(quoteArb, (input) => {
        const q = quoteFigures(input);
        for (const l of q.lines) {
          if (l.type !== 'figure') continue;
          expect(sum(Object.values(l.unitStageMinutes))).toBe(l.unitMinutes);
          expect(sum(Object.values(l.batchStageMinutes))).toBe(l.batchMinutes);
          expect(l.batchMinutes).toBeLessThanOrEqual(l.unitMinutes * l.quantity);
          expect(l.batchMinutes).toBeGreaterThanOrEqual(l.unitMinutes);
          expect(l.amount).toBe(l.labour + l.extrasAmount + l.materials);
        }
        expect(sum(Object.values(q.stageMinutes))).toBe(q.totalMinutes);
      }),
      { numRuns: 200 },
    );
  });

  it('the deposit (below 100 %) can be charged exactly, a multiple of the payment step, and never exceeds the total', () => {
    fc.assert(
      fc.property(quoteArb, (input) => {
        const q = quoteFigures(input);
        expect(q.deposit.amount).toBeLessThanOrEqual(q.total);
        // a 100 % deposit is the total itself, which the service's step may round when charged
        if (q.deposit.bp === 10_000) return;
        expect(q.deposit.amount % chargeRule(q.currency).minorStep).toBe(0);
        expect(chargeAmount(q.deposit.amount, q.currency)).toBe(q.deposit.amount);
      }),
      { numRuns: 200 },
    );
  });

  it('hours stay hidden from the client unless the studio shows them', () => {
    fc.assert(
      fc.property(quoteArb, (input) => {
        const c = quoteFigures(input).clientBreakdown;
        const show = (input.priceTable as PriceTable).showHoursToClient;
        expect(c.showHours).toBe(show);
        if (!show) {
          expect(c.totalMinutes).toBeNull();
          expect(c.lines.every((l) => l.minutes === null)).toBe(true);
        }
      }),
      { numRuns: 100 },
    );
  });

  it('is deterministic and JSON-safe: same input → identical output; the input is not changed', () => {
    fc.assert(
      fc.property(quoteArb, (input) => {
        const before = JSON.stringify(input);
        const a = quoteFigures(input);
        const b = quoteFigures(JSON.parse(before));
        expect(JSON.stringify(input)).toBe(before);
        expect(JSON.stringify(b)).toBe(JSON.stringify(a));
        expect(JSON.parse(JSON.stringify(a))).toEqual(a);
      }),
      { numRuns: 100 },
    );
  });
});
