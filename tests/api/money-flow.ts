// Shared steps of the money API tests (price table, quotes, invoices, payments): not a test file itself.
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { defaultPriceTable, defaultStages, type PriceTable } from '../../shared/schemas/price-table';
import { twoStudios, type Caller, type TestApp } from '../support/app';

export type Side = Awaited<ReturnType<typeof twoStudios>>['a'];

/** A grid cell: every stage 0 h except the ones given. */
export const cell = (hours: Record<string, number>) => Object.fromEntries(defaultStages.map((s) => [s.key, hours[s.key] ?? 0]));

/**
 * The test table, worked by hand: €30.00 an hour, no batch saving (r = 1), no materials, minimum, discounts or
 * rush; a 28 mm Tabletop figure is 2 h (basecoat 1, layer 0.5, basing 0.5) = €60.00; VAT 20 % included in
 * the prices; deposit 50 %.
 */
export function testTable(): PriceTable {
  const t = defaultPriceTable('EUR');
  t.hourlyRate = 3000;
  t.learningRate = 1;
  t.materialsPerFigure = 0;
  t.minimumOrder = 0;
  t.discounts = [];
  t.rush = { weeks: 0, surchargeBp: 0 };
  t.stageHours['28'].tabletop = cell({ basecoat: 1, layer: 0.5, basing: 0.5 });
  t.tax = { rateBp: 2000, label: 'VAT', pricesIncludeTax: true, taxId: 'VAT-TEST-0001' };
  t.depositBp = 5000;
  t.terms = 'Deposit kept for work done; the rest refunded.';
  return t;
}

export async function moneyStudios(sw: TestApp, table: PriceTable = testTable()) {
  const { a, b } = await twoStudios(sw);
  for (const s of [a, b]) {
    const res = await s.owner.put(`/api/studios/${s.studioId}/price-table`, table);
    if (res.status !== 200) throw new Error(`price table: ${res.status} ${JSON.stringify(res.body)}`);
  }
  return { a, b };
}

/**
 * A commission of the side's client: "Scouts" ×2 and "Captain" ×1, both 28 mm Tabletop, so 3 × €60.00 =
 * €180.00 of figures; with the €10.00 shipping line the quote is €190.00 (VAT inside), deposit €95.00.
 */
export async function commission(s: Side, title = 'Scout patrol') {
  const res = await s.owner.post(`/api/studios/${s.studioId}/commissions`, {
    clientId: s.clientId,
    title,
    figures: [
      { name: 'Scouts', quantity: 2, sizeClass: '28', tier: 'tabletop' },
      { name: 'Captain', quantity: 1, sizeClass: '28', tier: 'tabletop' },
    ],
  });
  if (res.status !== 201) throw new Error(`commission: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body as { id: number; figures: { id: number; stages: { id: number; key: string; estimateHours: number }[] }[] };
}

export const shipping = [{ kind: 'shipping', label: 'Tracked shipping', unitAmount: 1000 }];

export async function draftQuote(s: Side, commissionId: number, body: object = { extraLines: shipping }) {
  const res = await s.owner.post(`/api/studios/${s.studioId}/commissions/${commissionId}/quotes`, body);
  if (res.status !== 201) throw new Error(`quote: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body;
}

export async function sentQuote(s: Side, commissionId: number, body?: object) {
  const q = await draftQuote(s, commissionId, body);
  const res = await s.owner.post(`/api/studios/${s.studioId}/quotes/${q.id}/send`);
  if (res.status !== 200) throw new Error(`send: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body;
}

export async function acceptedQuote(s: Side, commissionId: number, body?: object) {
  const q = await sentQuote(s, commissionId, body);
  const res = await s.client.post(`/api/studios/${s.studioId}/quotes/${q.id}/accept`, { name: 'Client A', acceptTerms: true });
  if (res.status !== 200) throw new Error(`accept: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body;
}

export async function invoicesOf(c: Caller, studioId: number, commissionId: number) {
  const res = await c.get(`/api/studios/${studioId}/invoices?commissionId=${commissionId}`);
  if (res.status !== 200) throw new Error(`invoices: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.items as { id: number; kind: string; status: string; number: string | null; total: number; paid: number; balanceDue: number; quoteId: number | null; lines: { amountMinor: number; taxBp: number }[]; tax: number }[];
}

/** Lets the fake's webhook deliveries reach the app. */
export async function listen(sw: TestApp) {
  const server: Server = await new Promise((resolve) => {
    const s = sw.app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  sw.paymentsFake!.setWebhookUrl(`http://127.0.0.1:${port}/api/webhooks/payments`);
  return {
    url: `http://127.0.0.1:${port}`,
    close: () =>
      new Promise<void>((r) => {
        sw.paymentsFake!.setWebhookUrl(null);
        server.close(() => r());
        server.closeAllConnections();
      }),
  };
}

/** The payer on the fake's checkout page: opens it, then posts the card form (what the page's form sends). */
export async function payOnCheckoutPage(url: string, number = '4242 4242 4242 4242') {
  const page = await fetch(url);
  if (page.status !== 200) throw new Error(`checkout page: ${page.status}`);
  const html = await page.text();
  if (!/name="number"/.test(html)) throw new Error('the checkout page has no card number field');
  return fetch(url, { method: 'POST', body: new URLSearchParams({ number, expiry: '12/34', cvc: '123' }), redirect: 'manual' });
}
