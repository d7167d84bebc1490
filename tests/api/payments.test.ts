// The whole way from a quote to a paid deposit through the local fake of the payment service: the app listens,
// the fake posts its signed events to POST /api/webhooks/payments, and the payer drives the fake's checkout page.
import fs from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mailTo, signUp, startTestApp, type TestApp } from '../support/app';
import { acceptedQuote, commission, invoicesOf, listen, moneyStudios, payOnCheckoutPage, sentQuote, type Side } from './money-flow';
import { checkoutCompletedEvent } from '../support/payment-events';

let sw: TestApp;
let a: Side;
let b: Side;
let server: Awaited<ReturnType<typeof listen>>;
const url = (s: Side, path: string) => `/api/studios/${s.studioId}${path}`;

beforeAll(async () => {
  sw = await startTestApp();
  ({ a, b } = await moneyStudios(sw));
  server = await listen(sw);
});
afterAll(async () => {
  await server?.close();
  await sw.stop();
});

/** A commission with an accepted quote and its open deposit invoice (€95.00). */
async function depositInvoice(title = 'Scout patrol') {
  const c = await commission(a, title);
  await acceptedQuote(a, c.id);
  const [deposit] = await invoicesOf(a.owner, a.studioId, c.id);
  return { c, deposit };
}

async function payDepositByCard(title?: string) {
  const { c, deposit } = await depositInvoice(title);
  const co = await a.client.post(url(a, `/invoices/${deposit.id}/checkout`));
  expect(co.status).toBe(200);
  const paid = await payOnCheckoutPage(co.body.url);
  expect(paid.status).toBe(303);
  await sw.paymentsFake!.idle();
  return { c, deposit, checkout: co.body as { url: string; sessionId: string; amountMinor: number } };
}

const webhook = (body: string, signature: string) => request(sw.app).post('/api/webhooks/payments').set('content-type', 'application/json').set('stripe-signature', signature).send(body);
const completedEvent = (id: string, session: { id: string; amount: number; currency: string; invoiceId: number; studioId: number }) =>
  checkoutCompletedEvent(id, { ...session, sessionId: session.id }, sw.clock.now());
const sign = (payload: string, secret = sw.paymentsFake!.webhookSecret) =>
  sw.payments.stripe.webhooks.generateTestHeaderString({ payload, secret, timestamp: Math.floor(sw.clock.now().getTime() / 1000) });

describe('quote to booked commission through the payment fake', () => {
  it('quote → send (mail) → accept → deposit invoice → checkout page → signed event → paid and booked', async () => {
    const c = await commission(a, 'The whole way');
    const q = await sentQuote(a, c.id);
    const quoteMail = (await mailTo(sw, 'client-a@studio.test')).find((m) => m.subject.includes('The whole way'));
    expect(quoteMail?.text).toContain(`/studio/${a.studioId}/quotes/${q.id}`);

    const accepted = await a.client.post(url(a, `/quotes/${q.id}/accept`), { name: 'Client A', acceptTerms: true });
    expect(accepted.status).toBe(200);
    const [deposit] = await invoicesOf(a.client, a.studioId, c.id);
    expect(deposit).toMatchObject({ kind: 'deposit', status: 'open', total: 9500, balanceDue: 9500 });
    const invoiceMail = (await mailTo(sw, 'client-a@studio.test')).find((m) => m.subject.includes(deposit.number!));
    expect(invoiceMail?.text).toContain(`/studio/${a.studioId}/invoices/${deposit.id}`);

    const co = await a.client.post(url(a, `/invoices/${deposit.id}/checkout`));
    expect(co.status).toBe(200);
    expect(co.body).toMatchObject({ amountMinor: 9500, currency: 'EUR' });
    expect(co.body.url.startsWith(sw.paymentsFake!.url)).toBe(true);
    const stored = await sw.db('checkouts').where({ invoice_id: deposit.id }).first();
    expect(stored).toMatchObject({ session_id: co.body.sessionId, currency: 'EUR', status: 'open' });
    expect(Number(stored.amount)).toBe(9500);

    const paid = await payOnCheckoutPage(co.body.url);
    expect(paid.status).toBe(303);
    expect(paid.headers.get('location')).toBe(`http://sablework.test/studio/${a.studioId}/invoices/${deposit.id}/paid?session_id=${co.body.sessionId}`);
    await sw.paymentsFake!.idle();

    const inv = (await a.client.get(url(a, `/invoices/${deposit.id}`))).body;
    expect(inv).toMatchObject({ status: 'paid', paid: 9500, balanceDue: 0 });
    expect(inv.payments).toEqual([expect.objectContaining({ method: 'card', amountMinor: 9500 })]);
    const commissionNow = (await a.owner.get(url(a, `/commissions/${c.id}`))).body;
    expect(commissionNow.status).toBe('booked');
    const row = await sw.db('commissions').where({ id: c.id }).first('queue_position');
    const last = await sw.db('commissions').where({ studio_id: a.studioId }).max({ p: 'queue_position' }).first();
    expect(row.queue_position).toBe(last?.p);
    expect(row.queue_position).toBeGreaterThan(0);

    const events = await sw.db('payment_events').where({ invoice_id: deposit.id });
    expect(events.map((e) => [e.type, e.outcome])).toEqual([['checkout.session.completed', 'paid']]);
    const ownerMail = (await mailTo(sw, 'owner-a@studio.test')).find((m) => m.subject.startsWith('Payment received') && m.subject.includes(deposit.number!));
    expect(ownerMail?.text).toContain('€95.00');
    const receipt = (await mailTo(sw, 'client-a@studio.test')).find((m) => m.subject.startsWith('Receipt') && m.subject.includes(deposit.number!));
    expect(receipt?.text).toContain('paid in full');
  });

  it('the same event delivered again changes nothing: paid once', async () => {
    const { deposit, checkout } = await payDepositByCard('Twice');
    const event = sw.paymentsFake!.events().find((e) => e.type === 'checkout.session.completed' && (e.data.object as { id: string }).id === checkout.sessionId)!;
    const again = await sw.paymentsFake!.redeliver(event.id);
    expect(again).toMatchObject({ ok: true, status: 200 });
    expect(await sw.db('invoice_payments').where({ invoice_id: deposit.id })).toHaveLength(1);
    expect(await sw.db('payment_events').where({ id: event.id })).toHaveLength(1);
    expect((await a.owner.get(url(a, `/invoices/${deposit.id}`))).body).toMatchObject({ status: 'paid', paid: 9500 });
  });

  it('a declined card leaves the invoice open', async () => {
    const { deposit } = await depositInvoice('Declined card');
    const co = await a.client.post(url(a, `/invoices/${deposit.id}/checkout`));
    const res = await payOnCheckoutPage(co.body.url, '4000 0000 0000 0002');
    expect(res.status).toBe(402);
    expect((await a.owner.get(url(a, `/invoices/${deposit.id}`))).body).toMatchObject({ status: 'open', paid: 0 });
    // asking again for the same amount gives the same open checkout back
    expect((await a.client.post(url(a, `/invoices/${deposit.id}/checkout`))).body.sessionId).toBe(co.body.sessionId);
  });

  it('only the owner and the invoice’s own client may open a checkout', async () => {
    const { deposit } = await depositInvoice('Who pays');
    expect((await b.client.post(url(a, `/invoices/${deposit.id}/checkout`))).status).toBe(404);
    expect((await b.owner.post(url(a, `/invoices/${deposit.id}/checkout`))).status).toBe(404);
    expect((await a.painter.post(url(a, `/invoices/${deposit.id}/checkout`))).status).toBe(403);
    expect((await a.owner.post(url(a, `/invoices/${deposit.id}/checkout`))).status).toBe(200);
  });
});

describe('events that must not count', () => {
  it('a tampered body or a foreign signature is 400 and changes nothing', async () => {
    const { deposit } = await depositInvoice('Tampered');
    const co = (await a.client.post(url(a, `/invoices/${deposit.id}/checkout`))).body;
    const body = completedEvent('evt_tampered_1', { id: co.sessionId, amount: 9500, currency: 'eur', invoiceId: deposit.id, studioId: a.studioId });
    const goodSig = sign(body);
    const tampered = body.replace('"amount_total":9500', '"amount_total":9501');
    expect(tampered).not.toBe(body);
    const r1 = await webhook(tampered, goodSig);
    expect(r1.status).toBe(400);
    const r2 = await webhook(body, sign(body, 'whsec_someone_else'));
    expect(r2.status).toBe(400);
    const r3 = await request(sw.app).post('/api/webhooks/payments').set('content-type', 'application/json').send(body);
    expect(r3.status).toBe(400);
    expect(await sw.db('payment_events').where({ id: 'evt_tampered_1' })).toHaveLength(0);
    expect((await a.owner.get(url(a, `/invoices/${deposit.id}`))).body).toMatchObject({ status: 'open', paid: 0 });
    // the untampered, correctly signed event is accepted (so the 400s above were the signature's doing)
    const ok = await webhook(body, goodSig);
    expect(ok.status).toBe(200);
    expect((await a.owner.get(url(a, `/invoices/${deposit.id}`))).body.status).toBe('paid');
  });

  it('a verified event whose amount does not match the checkout is not paid, and is flagged for the owner', async () => {
    const { deposit } = await depositInvoice('Short paid');
    const co = (await a.client.post(url(a, `/invoices/${deposit.id}/checkout`))).body;
    const body = completedEvent('evt_short_1', { id: co.sessionId, amount: 100, currency: 'eur', invoiceId: deposit.id, studioId: a.studioId });
    const res = await webhook(body, sign(body));
    expect(res.status).toBe(200);
    const inv = (await a.owner.get(url(a, `/invoices/${deposit.id}`))).body;
    expect(inv).toMatchObject({ status: 'open', paid: 0 });
    expect(inv.paymentIssues).toHaveLength(1);
    expect(inv.paymentIssues[0].reason).toMatch(/amount was €1\.00, not €95\.00/);
    expect((await sw.db('checkouts').where({ session_id: co.sessionId }).first()).status).toBe('flagged');
    // the client is not shown the studio's payment issues
    expect((await a.client.get(url(a, `/invoices/${deposit.id}`))).body.paymentIssues).toEqual([]);
    const money = (await a.owner.get(url(a, '/money'))).body;
    expect(money.paymentIssues.some((i: { invoiceId: number }) => i.invoiceId === deposit.id)).toBe(true);
    // a wrong currency is caught the same way
    const { deposit: d2 } = await depositInvoice('Wrong currency');
    const co2 = (await a.client.post(url(a, `/invoices/${d2.id}/checkout`))).body;
    const body2 = completedEvent('evt_currency_1', { id: co2.sessionId, amount: 9500, currency: 'usd', invoiceId: d2.id, studioId: a.studioId });
    expect((await webhook(body2, sign(body2))).status).toBe(200);
    const inv2 = (await a.owner.get(url(a, `/invoices/${d2.id}`))).body;
    expect(inv2.status).toBe('open');
    expect(inv2.paymentIssues[0].reason).toMatch(/currency was USD, not EUR/);
  });

  it('a payment for a checkout the app did not create is flagged, not counted', async () => {
    const { deposit } = await depositInvoice('Stray checkout');
    const stray = await sw.payments.createCheckout({
      invoiceId: deposit.id,
      studioId: a.studioId,
      amountMinor: 500,
      currency: 'EUR',
      description: 'Not from the app',
      successUrl: 'http://sablework.test/ok',
      cancelUrl: 'http://sablework.test/no',
      idempotencyKey: `stray-${deposit.id}`,
    });
    expect((await payOnCheckoutPage(stray.url)).status).toBe(303);
    await sw.paymentsFake!.idle();
    const inv = (await a.owner.get(url(a, `/invoices/${deposit.id}`))).body;
    expect(inv).toMatchObject({ status: 'open', paid: 0 });
    expect(inv.paymentIssues[0].reason).toMatch(/did not create/);
  });
});

describe('refunds', () => {
  it('the owner refunds in part and then the rest through the payment service; credit notes record both', async () => {
    const { deposit } = await payDepositByCard('Refunded');
    expect((await a.client.post(url(a, `/invoices/${deposit.id}/refunds`), { reason: 'x' })).status).toBe(403);
    const part = await a.owner.post(url(a, `/invoices/${deposit.id}/refunds`), { amountMinor: 2000, reason: 'One scout stays unpainted' });
    expect(part.status).toBe(200);
    expect(part.body.creditNote).toMatchObject({ kind: 'credit_note', status: 'refunded', total: 2000, creditFor: deposit.id });
    expect(part.body.creditNote.number).toMatch(/^2026-\d{4}$/);
    expect(part.body.invoice).toMatchObject({ status: 'paid', paid: 7500, refunded: 2000, credited: 2000, balanceDue: 0 });
    expect(part.body.invoice.payments[0].refundedMinor).toBe(2000);
    await sw.paymentsFake!.idle();
    const refundEvents = sw.paymentsFake!.events().filter((e) => e.type === 'refund.created' && (e.data.object as { metadata?: { invoiceId?: string } }).metadata?.invoiceId === String(deposit.id));
    expect(refundEvents.map((e) => (e.data.object as { amount: number }).amount)).toEqual([2000]);
    const tooMuch = await a.owner.post(url(a, `/invoices/${deposit.id}/refunds`), { amountMinor: 7501, reason: 'Too much' });
    expect(tooMuch.status).toBe(400);
    const rest = await a.owner.post(url(a, `/invoices/${deposit.id}/refunds`), { reason: 'Cancelled after all' });
    expect(rest.body.creditNote.total).toBe(7500);
    expect(rest.body.invoice).toMatchObject({ status: 'refunded', paid: 0, refunded: 9500 });
    // the refund events that come back are stored and change nothing
    await sw.paymentsFake!.idle();
    expect((await sw.db('payment_events').where({ type: 'refund.created' })).length).toBeGreaterThanOrEqual(2);
    expect((await a.owner.get(url(a, `/invoices/${deposit.id}`))).body.paid).toBe(0);
  });
});

describe('cancellation per the terms', () => {
  it('before any work: the whole deposit goes back to the card', async () => {
    const { c } = await payDepositByCard('Cancel early');
    const preview = (await a.owner.get(url(a, `/commissions/${c.id}/cancellation`))).body;
    expect(preview).toMatchObject({ depositPaid: 9500, workDoneMinutes: 0, workDoneMinor: 0, keptMinor: 0, refundMinor: 9500, cardRefundMinor: 9500 });
  });

  it('after work: the done stages at the hourly rate are kept (capped at the deposit); confirming refunds the rest and cancels', async () => {
    const { c, deposit } = await payDepositByCard('Cancel late');
    // The scouts' basecoat (2 × 1 h from the accepted quote) is done: 120 min × €30.00 = €60.00 of work.
    const scouts = c.figures[0];
    const basecoat = scouts.stages.find((s) => s.key === 'basecoat')!;
    expect((await a.owner.patch(url(a, `/stages/${basecoat.id}`), { status: 'done' })).status).toBe(200);
    const preview = (await a.owner.get(url(a, `/commissions/${c.id}/cancellation`))).body;
    expect(preview).toMatchObject({ currency: 'EUR', depositPaid: 9500, workDoneMinutes: 120, workDoneMinor: 6000, keptMinor: 6000, refundMinor: 3500, cardRefundMinor: 3500 });
    expect(preview.explanation).toContain('€60.00');
    expect((await a.owner.post(url(a, `/commissions/${c.id}/cancellation`), {})).status).toBe(400); // a reason is needed
    const done = await a.owner.post(url(a, `/commissions/${c.id}/cancellation`), { reason: 'The client moved abroad' });
    expect(done.status).toBe(200);
    expect(done.body.creditNotes.map((n: { total: number }) => n.total)).toEqual([3500]);
    expect((await a.owner.get(url(a, `/commissions/${c.id}`))).body.status).toBe('cancelled');
    expect((await a.owner.get(url(a, `/invoices/${deposit.id}`))).body).toMatchObject({ paid: 6000, refunded: 3500 });
    await sw.paymentsFake!.idle();
    const refunds = sw.paymentsFake!.events().filter((e) => e.type === 'refund.created' && (e.data.object as { metadata?: { invoiceId?: string } }).metadata?.invoiceId === String(deposit.id));
    expect(refunds.map((e) => (e.data.object as { amount: number }).amount)).toEqual([3500]);
  });

  it('when the work done exceeds the deposit, the studio keeps the whole deposit', async () => {
    const { c } = await payDepositByCard('Cancel very late');
    for (const f of c.figures) for (const s of f.stages) await a.owner.patch(url(a, `/stages/${s.id}`), { status: 'done' });
    const preview = (await a.owner.get(url(a, `/commissions/${c.id}/cancellation`))).body;
    // all quoted stage time: 360 min → €180.00 of work against a €95.00 deposit
    expect(preview).toMatchObject({ workDoneMinutes: 360, workDoneMinor: 18000, keptMinor: 9500, refundMinor: 0 });
  });
});

describe("the payment service's amount rules on real invoices", () => {
  // ../shared/reference/stripe_currency_decimals.tsv: JPY is zero-decimal (charged as is); KWD three-decimal,
  // charged in multiples of 10 fils (rounded half away from zero, so 5.125 KWD is charged as 5.130).
  const reference = fs
    .readFileSync(path.resolve(process.cwd(), '../shared/reference/stripe_currency_decimals.tsv'), 'utf8')
    .split('\n')
    .filter((l) => l.trim() && !l.startsWith('#'))
    .map((l) => l.split('\t'));
  const classOf = (code: string) => {
    const col = reference[0].indexOf('stripe_class');
    const row = reference.find((r) => r[0] === code);
    if (!row || col < 0) throw new Error(`${code} is not in stripe_currency_decimals.tsv`);
    return row[col].trim();
  };
  it.each([
    ['JPY', 'zero-decimal', 12345, 12345],
    ['KWD', 'three-decimal', 5125, 5130],
  ])('%s (%s): an invoice of %i minor units is charged %i and settles', async (currency, cls, amount, charged) => {
    expect(classOf(currency)).toBe(cls); // stripe_currency_decimals.tsv
    const owner = await signUp(sw, { email: `owner-${currency.toLowerCase()}@studio.test`, studioName: `${currency} studio`, currency });
    const s = `/api/studios/${owner.studioId}`;
    const client = await owner.caller.post(`${s}/clients`, { name: `${currency} client`, email: `client-${currency.toLowerCase()}@studio.test` });
    const c = await owner.caller.post(`${s}/commissions`, { clientId: client.body.id, title: `${currency} work`, figures: [] });
    const inv = await owner.caller.post(`${s}/invoices`, { commissionId: c.body.id, kind: 'custom', lines: [{ description: 'Work', quantity: 1, unitMinor: amount, taxBp: 0 }] });
    expect(inv.body.currency).toBe(currency);
    await owner.caller.post(`${s}/invoices/${inv.body.id}/issue`);
    const co = await owner.caller.post(`${s}/invoices/${inv.body.id}/checkout`);
    expect(co.body).toMatchObject({ currency, amountMinor: charged });
    expect((await payOnCheckoutPage(co.body.url)).status).toBe(303);
    await sw.paymentsFake!.idle();
    const after = (await owner.caller.get(`${s}/invoices/${inv.body.id}`)).body;
    expect(after).toMatchObject({ status: 'paid', paid: charged, balanceDue: 0 });
  });
});
