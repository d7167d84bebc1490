import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { userId } from '../support/fixtures';
import { idOf, startTestApp, twoStudios, type Caller, type TestApp } from '../support/app';

// The books on a small data set worked out by hand. Studio A (EUR, Europe/Berlin); its price table has
// learning rate 0.8 and, for one 28 mm tabletop figure, basecoat 0.5 h and layer & highlight 1.0 h.
//
// Done stages (minutes estimated / logged):
//   K1 figure F1 (1 figure):  basecoat 30 / 45, layer 60 / 60
//   K2 figure F2 (1 figure):  basecoat 30 / 48, layer 60 / 72
//   K3 figure F3 (4 figures): basecoat 96 / 96, layer 192 / 192
//   K2 also has a done "details" stage with no time logged; a cancelled commission has a done stage with time.
// One-figure hours of a batch of 4 at r = 0.8: logged / 4^(1 + log2 0.8) = logged / (4 · 0.64) = logged / 2.56.

let sw: TestApp;
let owner: Caller;
let painter: Caller;
let studioId: number;
let clientId: number;
let painterId: number;
let base: string;
const k: Record<string, number> = {};

const now = () => sw.clock.now().toISOString();

async function insert(table: string, row: Record<string, unknown>) {
  return idOf((await sw.db(table).insert(row).returning('id'))[0]);
}

async function figureWithStages(commissionId: number, quantity: number, stages: [key: string, estimate: number, logged: number][], sizeClass = '28') {
  const t = now();
  const f = await insert('figures', { studio_id: studioId, commission_id: commissionId, name: `Figure ×${quantity}`, quantity, size_class: sizeClass, tier: 'tabletop', painter_id: painterId, created_at: t, updated_at: t });
  for (const [position, [key, estimate, logged]] of stages.entries()) {
    const s = await insert('stages', { studio_id: studioId, commission_id: commissionId, figure_id: f, template_key: key, name: key, position, status: 'done', estimate_minutes: estimate, done_at: t, updated_at: t });
    if (logged > 0) {
      await insert('time_entries', {
        studio_id: studioId,
        commission_id: commissionId,
        figure_id: f,
        stage_id: s,
        user_id: painterId,
        source: 'manual',
        started_at: t,
        ended_at: t,
        minutes: logged,
        created_at: t,
        updated_at: t,
      });
    }
  }
}

beforeAll(async () => {
  sw = await startTestApp();
  const { a } = await twoStudios(sw);
  ({ owner, painter, studioId, clientId } = a);
  painterId = await userId(sw, 'painter-a@studio.test');
  base = `/api/studios/${studioId}`;
  sw.clock.set('2026-03-25T12:00:00.000Z');

  const table = (await owner.get(`${base}/price-table`)).body;
  table.learningRate = 0.8;
  table.stageHours['28'].tabletop.basecoat = 0.5;
  table.stageHours['28'].tabletop.layer = 1.0;
  expect((await owner.put(`${base}/price-table`, table)).status).toBe(200);

  const commission = (title: string, status = 'closed') => insert('commissions', { studio_id: studioId, client_id: clientId, title, status, created_at: now(), updated_at: now() });
  k.K1 = await commission('K1');
  k.K2 = await commission('K2');
  k.K3 = await commission('K3');
  k.cancelled = await commission('Cancelled', 'cancelled');
  await figureWithStages(k.K1, 1, [['basecoat', 30, 45], ['layer', 60, 60]]);
  await figureWithStages(k.K2, 1, [['basecoat', 30, 48], ['layer', 60, 72], ['details', 20, 0]]);
  await figureWithStages(k.K3, 4, [['basecoat', 96, 96], ['layer', 192, 192]]);
  await figureWithStages(k.cancelled, 1, [['basecoat', 30, 600]]);
  // A vehicle, quoted apart: it counts in the per-stage totals and has its own cell, but stays out of the fit.
  k.K4 = await commission('K4');
  await figureWithStages(k.K4, 1, [['prep', 120, 90]], 'large');
});
afterAll(() => sw.stop());

describe('GET /reports/actuals', () => {
  it('compares logged with estimated hours for done stages, per stage and in total', async () => {
    const res = await owner.get(`${base}/reports/actuals`);
    expect(res.status).toBe(200);
    const r = res.body;
    expect([r.doneStages, r.doneWithoutTime]).toEqual([7, 1]);
    // basecoat: 30 + 30 + 96 = 156 min = 2.6 h estimated, 45 + 48 + 96 = 189 min = 3.15 h logged, 189/156 − 1 = 0.2115…
    // layer: 60 + 60 + 192 = 312 min = 5.2 h, 60 + 72 + 192 = 324 min = 5.4 h, 324/312 − 1 = 0.0384…
    // prep (the vehicle): 120 min = 2 h estimated, 90 min = 1.5 h logged: −0.25.
    expect(r.byStage.map((s: { key: string; count: number; estimatedHours: number; loggedHours: number; difference: number }) => [s.key, s.count, s.estimatedHours, s.loggedHours, s.difference])).toEqual([
      ['prep', 1, 2, 1.5, -0.25],
      ['basecoat', 3, 2.6, 3.15, 0.212],
      ['layer', 3, 5.2, 5.4, 0.038],
    ]);
    // 588 min = 9.8 h against 603 min = 10.05 h: 603/588 − 1 = 0.0255…
    expect(r.totals).toEqual({ estimatedHours: 9.8, loggedHours: 10.05, difference: 0.026 });
    expect(r.recent).toHaveLength(7);
  });

  it('gives the median one-figure hours per cell with the count behind it, and suggests table changes', async () => {
    const r = (await owner.get(`${base}/reports/actuals`)).body;
    // basecoat: F1 0.75 h, F2 0.8 h, F3 96 min / 2.56 = 37.5 min = 0.625 h → median 0.75 (table 0.5).
    // layer: F1 1.0 h, F2 1.2 h, F3 192 min / 2.56 = 75 min = 1.25 h → median 1.2 (table 1.0).
    const cells = r.cells.map((c: { sizeClass: string; tier: string; stage: string; medianHours: number; count: number; tableHours: number }) => [c.sizeClass, c.tier, c.stage, c.medianHours, c.count, c.tableHours]);
    expect(cells.slice(0, 2)).toEqual([
      ['28', 'tabletop', 'basecoat', 0.75, 3, 0.5],
      ['28', 'tabletop', 'layer', 1.2, 3, 1],
    ]);
    expect(cells[2].slice(0, 5)).toEqual(['large', 'tabletop', 'prep', 1.5, 1]);
    // +50 % and +20 %: both past the 10 % threshold with 3 done stages each.
    expect(r.suggestions.map((s: { stage: string; tableHours: number; suggestedHours: number; change: number; stageLabel: string }) => [s.stage, s.stageLabel, s.tableHours, s.suggestedHours, Math.round(s.change * 1000) / 1000])).toEqual([
      ['basecoat', 'Basecoat', 0.5, 0.75, 0.5],
      ['layer', 'Layer & highlight', 1, 1.2, 0.2],
    ]);
  });

  it('fits the batch learning rate from the figures and shows it beside the table’s', async () => {
    const r = (await owner.get(`${base}/reports/actuals`)).body;
    // Points (quantity, logged h / table h for one figure over the same stages, 1.5 h):
    //   F1 (1, 1.75/1.5), F2 (1, 2.0/1.5), F3 (4, 4.8/1.5 = 3.2). The vehicle is not a point.
    // x = 0, 0, ln 4; mean ln4/3; Sxx = (2/3)(ln 4)²; Sxy = (ln 4/3)(2·y3 − y1 − y2);
    // slope = (2·y3 − y1 − y2) / (2 ln 4) = ln(3.2² / ((1.75/1.5)(2/1.5))) / ln 16; r = 2^(slope − 1).
    const slope = Math.log((3.2 * 3.2) / ((1.75 / 1.5) * (2 / 1.5))) / Math.log(16);
    expect(r.learningRate.table).toBe(0.8);
    expect(r.learningRate.batches).toBe(3);
    expect(r.learningRate.fitted.slope).toBeCloseTo(slope, 10);
    expect(r.learningRate.fitted.rate).toBeCloseTo(2 ** (slope - 1), 10);
    expect(r.learningRate.fitted.rate).toBeCloseTo(0.8, 1);
  });

  it('drops a suggestion once the owner accepts the cell through the price table', async () => {
    const table = (await owner.get(`${base}/price-table`)).body;
    table.stageHours['28'].tabletop.basecoat = 0.75;
    expect((await owner.put(`${base}/price-table`, table)).status).toBe(200);
    const r = (await owner.get(`${base}/reports/actuals`)).body;
    expect(r.suggestions.map((s: { stage: string }) => s.stage)).toEqual(['layer']);
    expect(r.cells[0].tableHours).toBe(0.75);
  });

  it('is for owners only', async () => {
    expect((await painter.get(`${base}/reports/actuals`)).status).toBe(403);
  });
});

describe('GET /reports/earnings', () => {
  // K1 was quoted at 238.00 incl. 19 % tax with 5.00 materials and 12.00 shipping passed through (17.00 of 238.00).
  // Deposit invoice 119.00 (tax 19.00) paid by card 10 Feb; balance invoice 119.00 (tax 19.00) paid by bank
  // 28 Feb 23:30Z (1 March 00:30 in Berlin, so March); 11.90 refunded 20 March. Card fee 1.5 % + 0.25.
  beforeAll(async () => {
    const t = now();
    const json = JSON.stringify({
      lines: [
        { type: 'figure', materials: 500, amount: 20000 },
        { type: 'extra', kind: 'shipping', amount: 1200 },
        { type: 'extra', kind: 'custom', amount: 300 },
      ],
    });
    await insert('quotes', {
      studio_id: studioId,
      commission_id: k.K1,
      client_id: clientId,
      version: 1,
      status: 'accepted',
      input_json: '{}',
      price_table_json: '{}',
      result_json: json,
      currency: 'EUR',
      total: 23800,
      deposit: 11900,
      balance: 11900,
      quote_date: '2026-02-01',
      valid_until: '2026-03-03',
      created_at: t,
      updated_at: t,
    });
    const invoice = (kind: string, currency = 'EUR') =>
      insert('invoices', {
        studio_id: studioId,
        commission_id: k.K1,
        client_id: clientId,
        kind,
        status: 'paid',
        currency,
        lines_json: '[]',
        tax_inclusive: false,
        tax_label: 'VAT',
        subtotal: 10000,
        tax: 1900,
        total: 11900,
        paid: 11900,
        created_at: t,
        updated_at: t,
      });
    const deposit = await invoice('deposit');
    const balance = await invoice('balance');
    const elsewhere = await invoice('custom', 'USD');
    const pay = (invoiceId: number, method: string, amount: number, at: string) => insert('invoice_payments', { studio_id: studioId, invoice_id: invoiceId, method, amount, received_at: at, created_at: at });
    await pay(deposit, 'card', 11900, '2026-02-10T10:00:00.000Z');
    const p2 = await pay(balance, 'bank', 11900, '2026-02-28T23:30:00.000Z');
    await pay(elsewhere, 'card', 5000, '2026-03-02T10:00:00.000Z');
    await insert('invoice_refunds', { studio_id: studioId, invoice_id: balance, payment_id: p2, amount: 1190, created_at: '2026-03-20T10:00:00.000Z' });
    expect((await owner.put(`${base}/reports/settings`, { cardFeeBp: 150, cardFeeFixedMinor: 25 })).status).toBe(200);
  });

  it('splits what came in into tax, fees, costs and net, month by month in the studio’s timezone', async () => {
    const res = await owner.get(`${base}/reports/earnings?from=2026-02&to=2026-03`);
    expect(res.status).toBe(200);
    const r = res.body;
    expect([r.currency, r.from, r.to, r.settings]).toEqual(['EUR', '2026-02', '2026-03', { cardFeeBp: 150, cardFeeFixedMinor: 25 }]);
    // Feb, deposit 11900 by card: tax 11900·1900/11900 = 1900; fee 11900·1.5 % = 178.5 → 179, + 25 = 204;
    //   costs 11900·1700/23800 = 850; net 11900 − 1900 − 204 − 850 = 8946.
    // Mar, balance 11900 by bank: tax 1900, no fee, costs 850, net 9150;
    //   refund −1190: tax −190, costs −85, net −915 (no fee back). March: 10710 / 1710 / 0 / 765 / 8235.
    expect(r.months).toEqual([
      { month: '2026-02', paid: 11900, tax: 1900, fees: 204, costs: 850, net: 8946 },
      { month: '2026-03', paid: 10710, tax: 1710, fees: 0, costs: 765, net: 8235 },
    ]);
    expect(r.totals).toMatchObject({ paid: 22610, tax: 3610, fees: 204, costs: 1615, net: 17181 });
  });

  it('gives each commission its effective hourly rate: paid over hours logged', async () => {
    const r = (await owner.get(`${base}/reports/earnings?from=2026-02&to=2026-03`)).body;
    expect(r.commissions).toHaveLength(1);
    const c = r.commissions[0];
    // K1 logged 45 + 60 = 105 min = 1.75 h. Gross 22610 · 60 / 105 = 12920 per hour; net 17181 · 60 / 105 = 9817.7 → 9818.
    expect(c).toMatchObject({ id: k.K1, title: 'K1', paid: 22610, net: 17181, loggedHours: 1.75, hourlyGross: 12920, hourlyNet: 9818 });
    expect(r.totals).toMatchObject({ loggedHours: 1.75, hourlyGross: 12920, hourlyNet: 9818 });
  });

  it('keeps a commission’s whole payment history for its rate when the window holds only part of it', async () => {
    const r = (await owner.get(`${base}/reports/earnings?from=2026-03&to=2026-03`)).body;
    expect(r.months.map((m: { month: string }) => m.month)).toEqual(['2026-03']);
    expect(r.totals.paid).toBe(10710);
    expect(r.commissions[0]).toMatchObject({ paid: 22610, hourlyGross: 12920 });
  });

  it('defaults to the twelve months up to this one and checks its input', async () => {
    const r = (await owner.get(`${base}/reports/earnings`)).body;
    expect([r.from, r.to, r.months.length]).toEqual(['2025-04', '2026-03', 12]);
    expect((await owner.get(`${base}/reports/earnings?from=2026-04&to=2026-03`)).status).toBe(400);
    expect((await owner.get(`${base}/reports/earnings?from=2026-13`)).status).toBe(400);
    expect((await owner.put(`${base}/reports/settings`, { cardFeeBp: 1.5, cardFeeFixedMinor: 25 })).status).toBe(400);
    expect((await painter.get(`${base}/reports/earnings`)).status).toBe(403);
  });
});
