import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DAY } from '../../server/lib/clock';
import { startTestApp, type TestApp } from '../support/app';
import { acceptedQuote, commission, invoicesOf, moneyStudios, type Side } from './money-flow';

let sw: TestApp;
let a: Side;
let b: Side;
const url = (s: Side, path: string) => `/api/studios/${s.studioId}${path}`;

beforeAll(async () => {
  sw = await startTestApp();
  ({ a, b } = await moneyStudios(sw));
});
afterAll(() => sw.stop());

describe("the owner's money view", () => {
  it('sums what is owed by client, what came in this month and the deposits held for work not begun', async () => {
    const empty = (await a.owner.get(url(a, '/money'))).body;
    expect(empty).toMatchObject({ currency: 'EUR', outstandingByClient: [], paidThisMonthMinor: 0, depositsHeldMinor: 0, openInvoices: 0 });

    // 1. deposit paid in full by bank: the commission is booked, its €95.00 is held
    const booked = await commission(a, 'Booked');
    await acceptedQuote(a, booked.id);
    const [d1] = await invoicesOf(a.owner, a.studioId, booked.id);
    await a.owner.post(url(a, `/invoices/${d1.id}/payments`), { method: 'bank', amountMinor: 9500 });
    // 2. deposit part-paid (€40.00 of €95.00): €55.00 still owed; €40.00 held (the commission is still quoted)
    const part = await commission(a, 'Part paid');
    await acceptedQuote(a, part.id);
    const [d2] = await invoicesOf(a.owner, a.studioId, part.id);
    await a.owner.post(url(a, `/invoices/${d2.id}/payments`), { method: 'cash', amountMinor: 4000 });
    // 3. a paid deposit of a commission already on the bench: not held any more
    const bench = await commission(a, 'On the bench');
    await acceptedQuote(a, bench.id);
    const [d3] = await invoicesOf(a.owner, a.studioId, bench.id);
    await a.owner.post(url(a, `/invoices/${d3.id}/payments`), { method: 'bank', amountMinor: 9500 });
    await a.owner.post(url(a, `/commissions/${bench.id}/transitions`), { to: 'on_bench' });
    // 4. a payment received last month does not count for this month (received 2026-02-27)
    const old = await commission(a, 'Old');
    await acceptedQuote(a, old.id);
    const [d4] = await invoicesOf(a.owner, a.studioId, old.id);
    await a.owner.post(url(a, `/invoices/${d4.id}/payments`), { method: 'bank', amountMinor: 1000, receivedAt: '2026-02-27' });
    // studio B's money never shows in A's view
    const cb = await commission(b, 'Other studio');
    await acceptedQuote(b, cb.id);

    const m = (await a.owner.get(url(a, '/money'))).body;
    expect(m.outstandingByClient).toEqual([{ client: { id: a.clientId, name: 'Client a' }, currency: 'EUR', outstandingMinor: 5500 + 8500, invoices: 2, overdue: 0 }]);
    expect(m.paidThisMonthMinor).toBe(9500 + 4000 + 9500);
    // held: booked 9500 + part-paid (quoted) 4000 + old (quoted) 1000; the one on the bench is not
    expect(m.depositsHeldMinor).toBe(9500 + 4000 + 1000);
    expect(m.openInvoices).toBe(2);

    // a week after the deposits' due date (7 days) they are overdue
    sw.clock.advance(8 * DAY);
    const later = (await a.owner.get(url(a, '/money'))).body;
    expect(later.overdueInvoices).toBe(2);
    expect(later.outstandingByClient[0].overdue).toBe(2);
    // a new month starts at midnight in the studio's timezone (Europe/Berlin): 2026-03-31T22:00Z is 1 April there
    sw.clock.set('2026-03-31T22:30:00.000Z');
    expect((await a.owner.get(url(a, '/money'))).body.paidThisMonthMinor).toBe(0);
    sw.clock.set('2026-03-31T21:30:00.000Z');
    expect((await a.owner.get(url(a, '/money'))).body.paidThisMonthMinor).toBe(23000);
  });
});
