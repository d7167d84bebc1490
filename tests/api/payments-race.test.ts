// Payment events for one checkout arriving at the same moment: whatever their ids, the checkout is paid once.
// On SQLite the one connection serializes them anyway; on PostgreSQL (DATABASE_URL) the transactions really
// overlap, and the checkout's conditional claim is what keeps a second payment out.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../support/app';
import { checkoutCompletedEvent } from '../support/payment-events';
import { acceptedQuote, commission, invoicesOf, moneyStudios, type Side } from './money-flow';

let sw: TestApp;
let a: Side;
beforeAll(async () => {
  sw = await startTestApp();
  ({ a } = await moneyStudios(sw));
});
afterAll(() => sw.stop());

const deliver = (payload: string) =>
  request(sw.app)
    .post('/api/webhooks/payments')
    .set('content-type', 'application/json')
    .set('stripe-signature', sw.payments.stripe.webhooks.generateTestHeaderString({ payload, secret: sw.paymentsFake!.webhookSecret, timestamp: Math.floor(sw.clock.now().getTime() / 1000) }))
    .send(payload);

describe('payment events at the same moment', () => {
  it('six events with different ids for one checkout, all at once: one payment, one "paid" event, five "ignored"', async () => {
    const c = await commission(a, 'Race');
    await acceptedQuote(a, c.id);
    const [deposit] = await invoicesOf(a.owner, a.studioId, c.id);
    const co = await a.client.post(`/api/studios/${a.studioId}/invoices/${deposit.id}/checkout`);
    expect(co.status).toBe(200);
    const s = { sessionId: co.body.sessionId, amount: co.body.amountMinor, invoiceId: deposit.id, studioId: a.studioId };
    const answers = await Promise.all(Array.from({ length: 6 }, (_, i) => deliver(checkoutCompletedEvent(`evt_race_${i}`, { ...s, paymentIntent: `pi_race_${s.invoiceId}` }, sw.clock.now()))));
    expect(answers.map((r) => r.status)).toEqual([200, 200, 200, 200, 200, 200]);
    expect((await sw.db('invoice_payments').where({ invoice_id: deposit.id })).map((p) => Number(p.amount))).toEqual([co.body.amountMinor]);
    const outcomes = (await sw.db('payment_events').whereLike('id', 'evt_race_%')).map((e) => e.outcome).sort();
    expect(outcomes).toEqual(['ignored', 'ignored', 'ignored', 'ignored', 'ignored', 'paid']);
    expect((await a.owner.get(`/api/studios/${a.studioId}/invoices/${deposit.id}`)).body).toMatchObject({ status: 'paid', paid: co.body.amountMinor, balanceDue: 0 });
  });
});
