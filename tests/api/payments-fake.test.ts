// The real `stripe` SDK (through server/lib/payments) against the local fake of the payment service,
// with a small webhook receiver standing in for the app. Everything on 127.0.0.1 with system-chosen ports.
import crypto from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { startPaymentsFake, type PaymentsFake } from '../../server/fakes/payments-fake';
import { checkoutFromEvent, createPayments, PaymentsError, WebhookSignatureError, type Payments } from '../../server/lib/payments';
import { manualClock } from '../../server/lib/clock';
import { toMinor } from '../../shared/money';

// ---- the payment service's currency table (published reference; fails, not skips, when missing) ----
// Source: ../shared/reference/stripe_currency_decimals.tsv, from the payment service's "Supported currencies" page.
type DecimalsRow = { code: string; stripe_class: string; stripe_amount_exponent: string; iso4217_minor_units: string; example_major: string; example_stripe_amount: string };
function readDecimals(): DecimalsRow[] {
  const file = path.resolve(process.cwd(), '../shared/reference/stripe_currency_decimals.tsv');
  const lines = fs.readFileSync(file, 'utf8').split('\n').filter((l) => l.trim() !== '' && !l.startsWith('#'));
  const header = lines[0].split('\t');
  return lines.slice(1).map((l) => {
    const cells = l.split('\t');
    return Object.fromEntries(header.map((h, i) => [h, (cells[i] ?? '').trim()])) as DecimalsRow;
  });
}
const decimals = readDecimals();
const row = (code: string) => {
  const r = decimals.find((d) => d.code === code);
  if (!r) throw new Error(`${code} is not in stripe_currency_decimals.tsv`);
  return r;
};

// ---- a webhook receiver standing in for POST /api/webhooks/payments ----
type Received = { headers: http.IncomingHttpHeaders; body: Buffer };
function startReceiver() {
  const received: Received[] = [];
  let failNext = 0;
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      received.push({ headers: req.headers, body: Buffer.concat(chunks) });
      if (failNext > 0) {
        failNext--;
        res.writeHead(500).end('not now');
      } else {
        res.writeHead(200, { 'content-type': 'application/json' }).end('{"received":true}');
      }
    });
  });
  return new Promise<{ url: string; received: Received[]; failNextTimes(n: number): void; close(): Promise<void> }>((resolve) => {
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as AddressInfo;
      resolve({
        url: `http://127.0.0.1:${port}/api/webhooks/payments`,
        received,
        failNextTimes: (n) => {
          failNext = n;
        },
        close: () =>
          new Promise<void>((r) => {
            server.close(() => r());
            server.closeAllConnections();
          }),
      });
    });
  });
}

const eventsOf = (rec: Received[], sessionId: string) =>
  rec.filter((r) => {
    const e = JSON.parse(r.body.toString('utf8'));
    return e.data?.object?.id === sessionId;
  });

function payForm(number: string, expiry = '12/34', cvc = '123') {
  return new URLSearchParams({ number, expiry, cvc });
}

async function submitCard(url: string, number: string, expiry?: string, cvc?: string) {
  return fetch(url, { method: 'POST', body: payForm(number, expiry, cvc), redirect: 'manual' });
}

let fake: PaymentsFake;
let payments: Payments;
let receiver: Awaited<ReturnType<typeof startReceiver>>;
let seq = 0;
const key = (what: string) => `${what}-${process.pid}-${++seq}`;

beforeAll(async () => {
  receiver = await startReceiver();
  fake = await startPaymentsFake({ webhookUrl: receiver.url, retryDelaysMs: [20, 40, 80] });
  payments = createPayments({ secretKey: fake.secretKey, webhookSecret: fake.webhookSecret, fake: { host: fake.host, port: fake.port } });
});

afterAll(async () => {
  await fake?.close();
  await receiver?.close();
});

beforeEach(() => {
  receiver.failNextTimes(0);
});

function checkout(overrides: Partial<Parameters<Payments['createCheckout']>[0]> = {}) {
  return payments.createCheckout({
    invoiceId: 'inv_41',
    studioId: 'st_7',
    amountMinor: 12500,
    currency: 'USD',
    description: 'Deposit for commission C-0041 · Ash-grey wardens',
    customerEmail: 'rowan.client@demo.test',
    successUrl: 'http://sablework.test/portal/invoices/inv_41/paid?session={CHECKOUT_SESSION_ID}',
    cancelUrl: 'http://sablework.test/portal/invoices/inv_41',
    idempotencyKey: key('checkout'),
    ...overrides,
  });
}

async function paidCheckout(overrides: Parameters<typeof checkout>[0] = {}) {
  const c = await checkout(overrides);
  const res = await submitCard(c.url, '4242 4242 4242 4242');
  expect(res.status).toBe(303);
  const info = await payments.retrieveCheckout(c.id);
  expect(info.paid).toBe(true);
  return { ...c, paymentIntentId: info.paymentIntentId as string };
}

describe('checkout sessions through the SDK', () => {
  it('creates a payment checkout whose amount, currency and invoice metadata come back unchanged', async () => {
    const c = await checkout();
    expect(c.id).toMatch(/^cs_test_/);
    expect(c.url).toBe(`${fake.url}/pay/${c.id}`);
    expect(c).toMatchObject({ amountCharged: 12500, amountMinor: 12500, currency: 'USD' });

    const info = await payments.retrieveCheckout(c.id);
    expect(info).toMatchObject({ id: c.id, status: 'open', paymentStatus: 'unpaid', paid: false, amountMinor: 12500, currency: 'USD', invoiceId: 'inv_41', studioId: 'st_7', paymentIntentId: null });

    const raw = await payments.stripe.checkout.sessions.retrieve(c.id);
    expect(raw).toMatchObject({ object: 'checkout.session', mode: 'payment', amount_total: 12500, currency: 'usd', customer_email: 'rowan.client@demo.test', client_reference_id: 'inv_41' });
    expect(raw.metadata).toEqual({ invoiceId: 'inv_41', studioId: 'st_7' });
  });

  it('gives back the same checkout for the same idempotency key, a new one for a new key, and refuses a reused key with other parameters', async () => {
    const k = key('same');
    const a = await checkout({ idempotencyKey: k });
    const b = await checkout({ idempotencyKey: k });
    expect(b.id).toBe(a.id);
    expect(b.url).toBe(a.url);
    const c = await checkout({ idempotencyKey: key('other') });
    expect(c.id).not.toBe(a.id);
    await expect(checkout({ idempotencyKey: k, amountMinor: 999 })).rejects.toMatchObject({ name: 'PaymentsError', type: 'idempotency_error' });
  });

  it('refuses a wrong secret key with 401', async () => {
    const wrong = createPayments({ secretKey: 'sk_test_not_the_one', webhookSecret: fake.webhookSecret, fake: { host: fake.host, port: fake.port } });
    await expect(checkout()).resolves.toMatchObject({ currency: 'USD' }); // the right key works…
    await expect(
      wrong.createCheckout({ invoiceId: 1, studioId: 1, amountMinor: 100, currency: 'USD', description: 'x', successUrl: 'http://a.test/', cancelUrl: 'http://a.test/', idempotencyKey: key('wrong') }),
    ).rejects.toMatchObject({ name: 'PaymentsError', statusCode: 401 }); // …another does not
  });

  it('will not send a live key to the local fake', () => {
    expect(() => createPayments({ secretKey: 'sk_live_abc', webhookSecret: 'whsec_x', fake: { host: '127.0.0.1', port: 1 } })).toThrow(/live/);
  });

  it('rejects amounts that are not positive whole minor units before calling the service', async () => {
    await expect(checkout({ amountMinor: 12.5 })).rejects.toThrow(/whole number/);
    await expect(checkout({ amountMinor: 0 })).rejects.toThrow(/positive/);
    await expect(checkout({ currency: 'XYZ' })).rejects.toThrow(/Unknown currency/);
  });
});

describe('the fake checkout page', () => {
  it('shows the description, the amount with its currency and a card form, with no script and a strict CSP', async () => {
    const c = await checkout({ description: 'Deposit <b>C-0041</b> & bases' });
    const res = await fetch(c.url);
    expect(res.status).toBe(200);
    const page = await res.text();
    expect(page).toContain('Deposit &lt;b&gt;C-0041&lt;/b&gt; &amp; bases'); // escaped, never raw HTML
    expect(page).toContain('125.00');
    expect(page).toContain('USD');
    for (const name of ['number', 'expiry', 'cvc']) expect(page).toContain(`name="${name}"`);
    expect(page).toMatch(/<button type="submit">Pay/);
    expect(page).toContain(`action="/pay/${c.id}"`);
    expect(page).not.toMatch(/<script/i);
    expect(page).not.toMatch(/ style=/i);
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toContain("default-src 'none'");
    expect(csp).toContain("style-src 'self'");
    expect(csp).toContain('form-action');
    expect(csp).toContain('http://sablework.test'); // the redirect after paying is allowed
    expect(csp).not.toContain('unsafe-inline');
    const css = await fetch(`${fake.url}/pay/assets/checkout.css`);
    expect(css.headers.get('content-type')).toMatch(/text\/css/);
    expect(await css.text()).toContain('#286B5E'); // verdigris-600, our primary action colour (look.md)
  });

  it('declines 4000 0000 0000 0002: the page says declined and offers the form again; the session stays unpaid and no event is sent', async () => {
    const c = await checkout();
    const before = fake.events().length;
    const res = await submitCard(c.url, '4000 0000 0000 0002');
    expect(res.status).toBe(402);
    const page = await res.text();
    expect(page).toMatch(/declined/i);
    expect(page).toContain('name="number"'); // try again
    await fake.idle();
    expect(fake.events().length).toBe(before);
    expect(eventsOf(receiver.received, c.id)).toHaveLength(0);
    expect(await payments.retrieveCheckout(c.id)).toMatchObject({ paid: false, status: 'open', paymentIntentId: null });
  });

  it('asks again for a mistyped number, a past expiry or a short CVC, and refuses non-test card numbers', async () => {
    const c = await checkout();
    const typo = await submitCard(c.url, '4242 4242 4242 4241', '01/20', '12');
    expect(typo.status).toBe(422);
    const page = await typo.text();
    expect(page).toContain('incomplete or has a typo');
    expect(page).toContain('expiry date has passed');
    expect(page).toContain('3 or 4 digits');
    const other = await submitCard(c.url, '4111 1111 1111 1111'); // passes the Luhn check but is not a documented test number
    expect(other.status).toBe(422);
    expect(await other.text()).toContain('test cards only');
    expect((await payments.retrieveCheckout(c.id)).paid).toBe(false);
  });

  it('pays with 4242 4242 4242 4242: session paid, a signed checkout.session.completed that verifyEvent accepts, then a redirect to success_url', async () => {
    const c = await checkout();
    const res = await submitCard(c.url, '4242 4242 4242 4242');
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe(`http://sablework.test/portal/invoices/inv_41/paid?session=${c.id}`);

    // The first delivery attempt is awaited before the redirect, so it has already arrived.
    const got = eventsOf(receiver.received, c.id);
    expect(got).toHaveLength(1);
    const { headers, body } = got[0];
    const event = payments.verifyEvent(body, headers['stripe-signature']);
    expect(event.type).toBe('checkout.session.completed');
    const info = checkoutFromEvent(event);
    expect(info).toMatchObject({ id: c.id, paid: true, status: 'complete', amountMinor: 12500, currency: 'USD', invoiceId: 'inv_41', studioId: 'st_7' });
    expect(info?.paymentIntentId).toMatch(/^pi_/);

    // The header follows the documented scheme: t=<seconds>,v1=hex(HMAC-SHA256(secret, "t.body")).
    const sig = String(headers['stripe-signature']);
    const m = /^t=(\d+),v1=([0-9a-f]{64})$/.exec(sig);
    expect(m).not.toBeNull();
    const expected = crypto.createHmac('sha256', fake.webhookSecret).update(`${m?.[1]}.${body.toString('utf8')}`).digest('hex');
    expect(m?.[2]).toBe(expected);

    const after = await payments.retrieveCheckout(c.id);
    expect(after).toMatchObject({ paid: true, paymentStatus: 'paid', status: 'complete', paymentIntentId: info?.paymentIntentId, url: null });
    const pi = await payments.stripe.paymentIntents.retrieve(info?.paymentIntentId as string);
    expect(pi).toMatchObject({ status: 'succeeded', amount: 12500, currency: 'usd', metadata: { invoiceId: 'inv_41', studioId: 'st_7' } });

    // Opening the page again says it is done; pressing Pay again goes where the first press went.
    expect(await (await fetch(c.url)).text()).toContain('This payment is done');
    const again = await submitCard(c.url, '4242 4242 4242 4242');
    expect(again.status).toBe(303);
    await fake.idle();
    expect(eventsOf(receiver.received, c.id)).toHaveLength(1);
  });
});

describe('webhook signatures', () => {
  let delivery: Received;
  beforeAll(async () => {
    const c = await paidCheckout();
    delivery = eventsOf(receiver.received, c.id)[0];
  });

  it('verifyEvent throws on a tampered body', () => {
    const tampered = Buffer.from(delivery.body.toString('utf8').replace('"amount_total": 12500', '"amount_total": 1'));
    expect(tampered.equals(delivery.body)).toBe(false);
    expect(() => payments.verifyEvent(tampered, delivery.headers['stripe-signature'])).toThrow(WebhookSignatureError);
  });

  it('verifyEvent throws on a tampered, missing or foreign-secret signature and on a stale timestamp', () => {
    const sig = String(delivery.headers['stripe-signature']);
    const flipped = sig.slice(0, -1) + (sig.endsWith('0') ? '1' : '0');
    expect(() => payments.verifyEvent(delivery.body, flipped)).toThrow(WebhookSignatureError);
    expect(() => payments.verifyEvent(delivery.body, undefined)).toThrow(WebhookSignatureError);
    expect(() => payments.verifyEvent(delivery.body, [sig, sig])).toThrow(WebhookSignatureError);
    const otherSecret = createPayments({ secretKey: fake.secretKey, webhookSecret: 'whsec_someone_else', fake: { host: fake.host, port: fake.port } });
    expect(() => otherSecret.verifyEvent(delivery.body, sig)).toThrow(WebhookSignatureError);
    const later = manualClock(new Date(Date.now() + 10 * 60_000));
    const future = createPayments({ secretKey: fake.secretKey, webhookSecret: fake.webhookSecret, fake: { host: fake.host, port: fake.port }, clock: later });
    expect(() => future.verifyEvent(delivery.body, sig)).toThrow(/tolerance/);
    // and the untouched delivery still verifies
    expect(payments.verifyEvent(delivery.body, sig).type).toBe('checkout.session.completed');
  });
});

describe('webhook delivery', () => {
  it('retries a failed delivery until the endpoint takes it', async () => {
    receiver.failNextTimes(2);
    const c = await paidCheckout();
    await fake.idle();
    const got = eventsOf(receiver.received, c.id);
    expect(got).toHaveLength(3);
    const ids = got.map((g) => JSON.parse(g.body.toString('utf8')).id);
    expect(new Set(ids).size).toBe(1);
    const view = fake.events().find((e) => e.id === ids[0]);
    expect(view?.deliveries.map((d) => d.status)).toEqual([500, 500, 200]);
  });

  it('re-delivers an event on request with the same id, and it still verifies', async () => {
    const c = await paidCheckout();
    const list = (await (await fetch(`${fake.url}/__fake/events`)).json()) as { data: { id: string; type: string; data: { object: { id: string } } }[] };
    const event = list.data.find((e) => e.type === 'checkout.session.completed' && e.data.object.id === c.id);
    expect(event).toBeDefined();
    const res = await fetch(`${fake.url}/__fake/events/${event?.id}/redeliver`, { method: 'POST' });
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ ok: true, status: 200, trigger: 'redeliver' });
    const got = eventsOf(receiver.received, c.id);
    expect(got).toHaveLength(2);
    const [first, second] = got.map((g) => payments.verifyEvent(g.body, g.headers['stripe-signature']));
    expect(second.id).toBe(first.id);
    expect(second.id).toBe(event?.id);
    const missing = await fetch(`${fake.url}/__fake/events/evt_nope/redeliver`, { method: 'POST' });
    expect(missing.status).toBe(404);
  });
});

describe('refunds', () => {
  const refundEvents = (paymentIntentId: string) =>
    receiver.received
      .map((r) => ({ r, e: JSON.parse(r.body.toString('utf8')) }))
      .filter(({ e }) => e.type !== 'checkout.session.completed' && e.data?.object?.payment_intent === paymentIntentId);

  it('refunds in part, then the rest, posting signed charge.refunded and refund.created; a third refund is refused', async () => {
    const c = await paidCheckout();
    const part = await payments.refund({ paymentIntentId: c.paymentIntentId, amountMinor: 5000, idempotencyKey: key('refund'), metadata: { invoiceId: 'inv_41' } });
    expect(part).toMatchObject({ amountMinor: 5000, currency: 'USD', status: 'succeeded', paymentIntentId: c.paymentIntentId });
    expect(part.id).toMatch(/^re_/);
    const rest = await payments.refund({ paymentIntentId: c.paymentIntentId, idempotencyKey: key('refund') });
    expect(rest.amountMinor).toBe(7500);
    await expect(payments.refund({ paymentIntentId: c.paymentIntentId, amountMinor: 1, idempotencyKey: key('refund') })).rejects.toMatchObject({
      name: 'PaymentsError',
      code: 'charge_already_refunded',
    });
    await fake.idle();
    const events = refundEvents(c.paymentIntentId).map(({ r }) => payments.verifyEvent(r.body, r.headers['stripe-signature']));
    expect(events.map((e) => e.type)).toEqual(['charge.refunded', 'refund.created', 'charge.refunded', 'refund.created']);
    const charges = events.filter((e) => e.type === 'charge.refunded').map((e) => e.data.object as { amount_refunded: number; refunded: boolean });
    expect(charges).toEqual([expect.objectContaining({ amount_refunded: 5000, refunded: false }), expect.objectContaining({ amount_refunded: 12500, refunded: true })]);
    expect(events[1].data.object).toMatchObject({ id: part.id, amount: 5000, metadata: { invoiceId: 'inv_41' } });
  });

  it('refuses to refund more than is left and gives the same refund back for the same key', async () => {
    const c = await paidCheckout();
    await expect(payments.refund({ paymentIntentId: c.paymentIntentId, amountMinor: 12501, idempotencyKey: key('refund') })).rejects.toMatchObject({ code: 'amount_too_large' });
    const k = key('refund');
    const a = await payments.refund({ paymentIntentId: c.paymentIntentId, amountMinor: 2000, idempotencyKey: k });
    const b = await payments.refund({ paymentIntentId: c.paymentIntentId, amountMinor: 2000, idempotencyKey: k });
    expect(b.id).toBe(a.id);
    const rest = await payments.refund({ paymentIntentId: c.paymentIntentId, idempotencyKey: key('refund') });
    expect(rest.amountMinor).toBe(10500); // 2000 was refunded once, not twice
  });

  it('says so when the payment intent does not exist', async () => {
    await expect(payments.refund({ paymentIntentId: 'pi_missing', idempotencyKey: key('refund') })).rejects.toSatisfy(
      (e: unknown) => e instanceof PaymentsError && e.statusCode === 404 && e.code === 'resource_missing',
    );
  });
});

describe("the payment service's amount rules (stripe_currency_decimals.tsv)", () => {
  it('JPY is zero-decimal: ¥500 is sent as 500, shown as ¥500 JPY, refunded in whole yen', async () => {
    const jpy = row('JPY'); // stripe_currency_decimals.tsv: JPY zero-decimal, example 500 → 500
    expect(jpy.stripe_class).toBe('zero-decimal');
    const minor = toMinor(jpy.example_major, 'JPY');
    const c = await paidCheckout({ amountMinor: minor, currency: 'jpy' });
    expect(c.amountCharged).toBe(Number(jpy.example_stripe_amount));
    const raw = await payments.stripe.checkout.sessions.retrieve(c.id);
    expect(raw).toMatchObject({ amount_total: Number(jpy.example_stripe_amount), currency: 'jpy' });
    expect(await (await fetch(`${fake.url}/pay/${c.id}`)).text()).toMatch(/¥500/);
    const part = await payments.refund({ paymentIntentId: c.paymentIntentId, amountMinor: 120, idempotencyKey: key('refund') });
    expect(part).toMatchObject({ amountMinor: 120, currency: 'JPY' });
  });

  it('KWD has three decimals and the last digit must be 0: 5.124 KWD is charged as the reference value', async () => {
    const kwd = row('KWD'); // stripe_currency_decimals.tsv: KWD three-decimal, example 5.124 → "5120 or 5130"
    expect(kwd.stripe_class).toBe('three-decimal');
    const allowed = kwd.example_stripe_amount.split(/\s+or\s+/).map(Number);
    const c = await checkout({ amountMinor: toMinor(kwd.example_major, 'KWD'), currency: 'KWD' });
    expect(allowed).toContain(c.amountCharged);
    expect(c.amountCharged % 10).toBe(0);
    expect(c.amountMinor).toBe(c.amountCharged); // ISO also has 3 digits for KWD
    expect((await payments.retrieveCheckout(c.id)).amountMinor).toBe(c.amountCharged);
    expect(await (await fetch(c.url)).text()).toContain('5.120');
  });

  it('every three-decimal currency in the reference is charged in multiples of 10, and the fake refuses a raw amount that is not', async () => {
    const three = decimals.filter((d) => d.stripe_class === 'three-decimal'); // stripe_currency_decimals.tsv
    expect(three.map((d) => d.code).sort()).toEqual(['BHD', 'JOD', 'KWD', 'OMR', 'TND']);
    for (const d of three) {
      const c = await checkout({ amountMinor: 7125, currency: d.code });
      expect(c.amountCharged % 10, d.code).toBe(0);
      expect(Math.abs(c.amountCharged - 7125), d.code).toBeLessThanOrEqual(5);
    }
    await expect(
      payments.stripe.checkout.sessions.create({
        mode: 'payment',
        success_url: 'http://sablework.test/ok',
        line_items: [{ quantity: 1, price_data: { currency: 'kwd', unit_amount: 5125, product_data: { name: 'Raw call' } } }],
      }),
    ).rejects.toMatchObject({ type: 'StripeInvalidRequestError', code: 'amount_invalid' });
  });

  it('a KWD refund must be exact in multiples of 10 fils', async () => {
    const c = await paidCheckout({ amountMinor: 5130, currency: 'KWD' });
    await expect(payments.refund({ paymentIntentId: c.paymentIntentId, amountMinor: 5, currency: 'KWD', idempotencyKey: key('refund') })).rejects.toThrow(/multiple of 10/);
    // currency looked up from the payment intent when not given
    await expect(payments.refund({ paymentIntentId: c.paymentIntentId, amountMinor: 1005, idempotencyKey: key('refund') })).rejects.toThrow(/multiple of 10/);
    const ok = await payments.refund({ paymentIntentId: c.paymentIntentId, amountMinor: 1010, idempotencyKey: key('refund') });
    expect(ok).toMatchObject({ amountMinor: 1010, currency: 'KWD' });
  });

  it('ISK goes to the API as a two-decimal amount ending in 00', async () => {
    const isk = row('ISK'); // stripe_currency_decimals.tsv: ISK special case, example 5 → 500
    const c = await checkout({ amountMinor: toMinor(isk.example_major, 'ISK'), currency: 'ISK' });
    expect(c.amountCharged).toBe(Number(isk.example_stripe_amount));
    expect((await payments.retrieveCheckout(c.id)).amountMinor).toBe(5);
  });
});

describe('a fake on a manual clock', () => {
  it('signs with its clock, which the adapter verifies on the same clock, and expires sessions after a day', async () => {
    const clock = manualClock('2026-03-02T09:00:00.000Z');
    const rec = await startReceiver();
    const f = await startPaymentsFake({ clock, webhookUrl: rec.url, retryDelaysMs: [] });
    try {
      const p = createPayments({ secretKey: f.secretKey, webhookSecret: f.webhookSecret, fake: { host: f.host, port: f.port }, clock });
      const base = { invoiceId: 9, studioId: 3, amountMinor: 4000, currency: 'EUR', description: 'Balance', successUrl: 'http://sablework.test/ok', cancelUrl: 'http://sablework.test/no' };
      const paid = await p.createCheckout({ ...base, idempotencyKey: 'mc-1' });
      expect((await submitCard(paid.url, '4242424242424242', '03/26')).status).toBe(303); // March 2026 still valid on 2 March 2026
      expect(rec.received).toHaveLength(1);
      const sig = String(rec.received[0].headers['stripe-signature']);
      expect(sig).toMatch(new RegExp(`^t=${Date.parse('2026-03-02T09:00:00.000Z') / 1000},`));
      expect(p.verifyEvent(rec.received[0].body, sig).type).toBe('checkout.session.completed');

      const old = await p.createCheckout({ ...base, idempotencyKey: 'mc-2' });
      clock.advance(25 * 60 * 60_000);
      expect(await p.retrieveCheckout(old.id)).toMatchObject({ status: 'expired', paid: false, url: null });
      expect(await (await fetch(old.url)).text()).toContain('expired');
      expect((await submitCard(old.url, '4242424242424242')).status).toBe(410);
      expect(rec.received).toHaveLength(1);
    } finally {
      await f.close();
      await rec.close();
    }
  });
});
