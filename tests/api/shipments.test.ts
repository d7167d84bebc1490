import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DAY } from '../../server/lib/clock';
import { CUSTOMS_CAUTION, defaultPackingItems } from '../../shared/schemas/shipments';
import { idOf, mailTo, startTestApp, twoStudios, type TestApp } from '../support/app';
import { insertCommission, insertFigure } from '../support/fixtures';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let base: string;


/** An issued invoice of the commission, written straight into the invoices table (its own API is tested elsewhere). */
async function invoice(commissionId: number, kind: 'deposit' | 'balance', status: 'open' | 'partly_paid' | 'paid', total: number, paid: number) {
  const now = sw.clock.now().toISOString();
  const [row] = await sw
    .db('invoices')
    .insert({
      studio_id: s.a.studioId,
      commission_id: commissionId,
      client_id: s.a.clientId,
      kind,
      status,
      number: `T-${commissionId}-${kind}`,
      currency: 'EUR',
      lines_json: '[]',
      tax_inclusive: true,
      tax_label: 'VAT',
      subtotal: total,
      tax: 0,
      total,
      paid,
      issued_at: now,
      created_at: now,
      updated_at: now,
    })
    .returning('id');
  return idOf(row);
}

/** A finished commission of studio A's client, ready to ship, with one figure; its shipment started. */
async function readyToShip(title: string) {
  const id = await insertCommission(sw, s.a.studioId, s.a.clientId, { title, status: 'ready_to_ship' });
  await insertFigure(sw, s.a.studioId, id);
  const res = await s.a.owner.post(`${base}/commissions/${id}/shipments`, {});
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return { commissionId: id, shipment: res.body, url: `${base}/commissions/${id}/shipments/${res.body.id}` };
}

const parcel = { carrier: 'Invented Post', service: 'Tracked & insured', tracking: 'IP-4455-2026', weightGrams: 1200, lengthCm: 30, widthCm: 20, heightCm: 15, insuredMinor: 45000 };

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  base = `/api/studios/${s.a.studioId}`;
  await s.a.owner.patch(`${base}/clients/${s.a.clientId}`, { address: { line1: 'Mossweg 7', city: 'Utrecht', postalCode: '3511', country: 'NL' } });
  await s.a.owner.put(`${base}/shipping-settings`, { autoCloseDays: 14, fromCountry: 'DE', packingItems: defaultPackingItems });
});
afterAll(() => sw.stop());

describe('packing a parcel', () => {
  it('starts with the ship-to address from the client record and the studio’s packing checklist; abroad gets a customs wording', async () => {
    const { shipment, url } = await readyToShip('Fungus wizard');
    expect(shipment).toMatchObject({ status: 'preparing', shipTo: { name: 'Client a', line1: 'Mossweg 7', city: 'Utrecht', postalCode: '3511', country: 'NL' }, abroad: true, currency: 'EUR' });
    expect(shipment.checklist).toEqual(defaultPackingItems.map((label) => ({ label, done: false })));
    // The figures are the client's own (no models-in record says otherwise): the wording says so and that the service was painting.
    expect(shipment.suggestedCustomsText).toContain('painted hobby miniature figure');
    expect(shipment.suggestedCustomsText).toMatch(/^1 painted hobby miniature figure \(/);
    expect(shipment.suggestedCustomsText).toContain("The figure is the recipient's own property. It was sent to Studio a only to be painted");
    expect(CUSTOMS_CAUTION).toMatch(/not legal advice/);

    // The address is editable per shipment; the client record stays as it was.
    const edited = await s.a.owner.patch(url, { shipTo: { name: 'Client a', line1: 'Pakketpunt 2', city: 'Utrecht', country: 'DE' }, checklist: [{ label: 'Each figure wrapped so it cannot move', done: true }] });
    expect(edited.status, JSON.stringify(edited.body)).toBe(200);
    expect(edited.body).toMatchObject({ shipTo: { line1: 'Pakketpunt 2', country: 'DE' }, abroad: false, checklist: [{ label: 'Each figure wrapped so it cannot move', done: true }] });
    const client = await s.a.owner.get(`${base}/clients/${s.a.clientId}`).expect(200);
    expect(client.body.address.line1).toBe('Mossweg 7');
    expect((await s.a.owner.post(`${base}/commissions/${shipment.commissionId}/shipments`, {})).status).toBe(409);
  });

  it('says truthfully when the studio bought the models', async () => {
    const { commissionId, url } = await readyToShip('Bought-in beetles');
    await s.a.owner.put(`${base}/commissions/${commissionId}/models-in`, { supplier: 'studio_buys' });
    await sw.db('figures').where({ commission_id: commissionId }).update({ quantity: 3 });
    const list = await s.a.owner.get(`${base}/commissions/${commissionId}/shipments`).expect(200);
    expect(list.body[0].suggestedCustomsText).toMatch(/^3 painted hobby miniature figures \(/);
    expect(list.body[0].suggestedCustomsText).toContain('The figures were bought by Studio a for the recipient and painted to order');
    expect((await s.a.owner.patch(url, { weightGrams: 0, insuredMinor: -1 })).body.error.fields).toMatchObject({ weightGrams: 'At least 1.', insuredMinor: 'At least 0.' });
  });

  it('will not leave without carrier, tracking number and address', async () => {
    const { url } = await readyToShip('Half-packed heron');
    await s.a.owner.patch(url, { shipTo: { name: 'Client a' } });
    const res = await s.a.owner.post(`${url}/ship`, { overrideUnpaid: true, overrideReason: 'Paid in cash' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['carrier', 'shipTo.city', 'shipTo.country', 'shipTo.line1', 'tracking']);
  });
});

describe('the balance before shipping', () => {
  it('refuses the move to shipped while the balance is unpaid, through the shipment and through the plain transition alike', async () => {
    const { commissionId, url } = await readyToShip('Unpaid toad king');
    await s.a.owner.patch(url, parcel);
    await invoice(commissionId, 'deposit', 'paid', 20000, 20000);
    await invoice(commissionId, 'balance', 'partly_paid', 30000, 10000);
    const viaShipment = await s.a.owner.post(`${url}/ship`, {});
    expect(viaShipment.status).toBe(409);
    expect(viaShipment.body.error.code).toBe('balance_unpaid');
    expect(viaShipment.body.error.balance).toMatchObject({ unpaid: true, openMinor: 20000, paidBalanceInvoice: false });
    const viaTransition = await s.a.owner.post(`${base}/commissions/${commissionId}/transitions`, { to: 'shipped' });
    expect(viaTransition.status).toBe(409);
    expect(viaTransition.body.error.code).toBe('balance_unpaid');
    const c = await s.a.owner.get(`${base}/commissions/${commissionId}`).expect(200);
    expect(c.body.status).toBe('ready_to_ship');
    expect((await s.a.owner.get(`${base}/commissions/${commissionId}/shipments`)).body[0].status).toBe('preparing');
    // A commission without any paid balance invoice is unpaid too.
    const bare = await insertCommission(sw, s.a.studioId, s.a.clientId, { status: 'ready_to_ship' });
    expect((await s.a.owner.post(`${base}/commissions/${bare}/transitions`, { to: 'shipped' })).body.error.code).toBe('balance_unpaid');
  });

  it('lets the owner ship anyway with a reason, which is logged; an override without a reason is refused', async () => {
    const { commissionId, url } = await readyToShip('Override owl');
    await s.a.owner.patch(url, parcel);
    const noReason = await s.a.owner.post(`${url}/ship`, { overrideUnpaid: true });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.fields).toEqual({ overrideReason: 'Say why the parcel leaves before the balance is paid.' });
    const res = await s.a.owner.post(`${url}/ship`, { overrideUnpaid: true, overrideReason: 'Paying on collection at the fair' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ status: 'shipped', overrideReason: 'Paying on collection at the fair', shippedBy: { name: 'Test Person' } });
    const log = await s.a.owner.get(`${base}/commissions/${commissionId}/activity`).expect(200);
    const status = log.body.find((e: { action: string; detail: { to?: string } }) => e.action === 'commission.status' && e.detail.to === 'shipped');
    expect(status.detail).toMatchObject({ override: 'balance_unpaid', reason: 'Shipped before the balance was paid: Paying on collection at the fair' });
    expect(status.summary).toContain('Paying on collection at the fair');
  });

  it('ships without a word once the balance invoice is paid, and e-mails the client the tracking number', async () => {
    const { commissionId, url } = await readyToShip('Paid pike');
    await s.a.owner.patch(url, parcel);
    await invoice(commissionId, 'deposit', 'paid', 20000, 20000);
    await invoice(commissionId, 'balance', 'paid', 30000, 30000);
    const before = await s.a.owner.get(`${base}/commissions/${commissionId}/shipments`).expect(200);
    expect(before.body[0].balance).toMatchObject({ unpaid: false, summary: 'The balance is paid.' });
    const res = await s.a.owner.post(`${url}/ship`, {});
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ status: 'shipped', overrideReason: null, shippedAt: sw.clock.now().toISOString() });
    expect((await s.a.owner.get(`${base}/commissions/${commissionId}`)).body.status).toBe('shipped');
    const mails = await mailTo(sw, 'client-a@studio.test');
    const shipped = mails.find((m) => m.subject === 'Studio a: "Paid pike" is on its way');
    expect(shipped?.text).toContain('Tracking number: IP-4455-2026');
    expect(shipped?.text).toContain('Invented Post (Tracked & insured)');
    expect(shipped?.text).toContain('€450.00');
    expect((await s.a.owner.post(`${url}/ship`, {})).status).toBe(409);
  });
});

describe('after shipping', () => {
  async function shipped(title: string) {
    const r = await readyToShip(title);
    await s.a.owner.patch(r.url, parcel);
    const res = await s.a.owner.post(`${r.url}/ship`, { overrideUnpaid: true, overrideReason: 'Test parcel' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return r;
  }

  it('the client sees the parcel (not the packing details) and confirms receipt; the commission closes', async () => {
    const { commissionId, url } = await shipped('Received rook');
    const seen = await s.a.client.get(`${base}/commissions/${commissionId}/shipments`).expect(200);
    expect(seen.body[0]).toMatchObject({ status: 'shipped', tracking: 'IP-4455-2026', checklist: null, customsText: null, balance: null, overrideReason: null });
    expect(seen.body[0].autoCloseOn).toBe('2026-03-16');
    const res = await s.a.client.post(`${url}/received`, {});
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ status: 'delivered', receivedBy: 'client', deliveredOn: '2026-03-02' });
    expect((await s.a.owner.get(`${base}/commissions/${commissionId}`)).body.status).toBe('closed');
    expect((await s.a.client.post(`${url}/received`, {})).status).toBe(409);
    const ownerMails = await mailTo(sw, 'owner-a@studio.test');
    expect(ownerMails.some((m) => m.subject === 'Client a has received "Received rook"')).toBe(true);
  });

  it('the owner records the delivery date instead; the commission closes', async () => {
    const { commissionId, url } = await shipped('Delivered duck');
    expect((await s.a.owner.post(`${url}/delivered`, { deliveredOn: '2026-02-01' })).body.error.fields).toEqual({ deliveredOn: 'The parcel cannot arrive before it was sent.' });
    const res = await s.a.owner.post(`${url}/delivered`, { deliveredOn: '2026-03-04' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ status: 'delivered', receivedBy: 'studio', deliveredOn: '2026-03-04' });
    expect((await s.a.owner.get(`${base}/commissions/${commissionId}`)).body.status).toBe('closed');
  });

  it('a client cannot see another client’s parcel, nor a parcel still being packed', async () => {
    const packing = await readyToShip('Still packing');
    expect((await s.a.client.get(`${base}/commissions/${packing.commissionId}/shipments`)).body).toEqual([]);
    expect((await s.a.client.post(`${packing.url}/received`, {})).status).toBe(404);
    const other = await insertCommission(sw, s.b.studioId, s.b.clientId, { status: 'ready_to_ship' });
    expect((await s.a.client.get(`/api/studios/${s.b.studioId}/commissions/${other}/shipments`)).status).toBe(404);
  });

  it('the job closes a commission nobody marked received the studio’s number of days after shipping, and a second run changes nothing', async () => {
    const { commissionId } = await shipped('Forgotten frog');
    expect(await sw.jobs.autoCloseShipped()).toBe(0);
    sw.clock.advance(13 * DAY);
    expect(await sw.jobs.autoCloseShipped()).toBe(0);
    expect((await s.a.owner.get(`${base}/commissions/${commissionId}`)).body.status).toBe('shipped');
    sw.clock.advance(DAY + 60_000);
    const closed = await sw.jobs.autoCloseShipped();
    expect(closed).toBeGreaterThanOrEqual(1);
    expect((await s.a.owner.get(`${base}/commissions/${commissionId}`)).body.status).toBe('closed');
    const log = await s.a.owner.get(`${base}/commissions/${commissionId}/activity`).expect(200);
    const entries = log.body.filter((e: { action: string; detail: { to?: string } }) => e.action === 'commission.status' && e.detail.to === 'closed');
    expect(entries).toHaveLength(1);
    expect(entries[0].summary).toContain('Closed by itself 14 days after shipping');
    const list = await s.a.owner.get(`${base}/commissions/${commissionId}/shipments`).expect(200);
    expect(list.body[0].autoClosedAt).not.toBeNull();

    expect(await sw.jobs.autoCloseShipped()).toBe(0);
    const again = await s.a.owner.get(`${base}/commissions/${commissionId}/activity`).expect(200);
    expect(again.body).toHaveLength(log.body.length);
  });

  it('a studio that switched auto-close off keeps waiting', async () => {
    await s.a.owner.put(`${base}/shipping-settings`, { autoCloseDays: null, fromCountry: 'DE', packingItems: ['Wrap it'] });
    const { commissionId } = await shipped('Patient pelican');
    sw.clock.advance(400 * DAY);
    expect(await sw.jobs.autoCloseShipped()).toBe(0);
    expect((await s.a.owner.get(`${base}/commissions/${commissionId}`)).body.status).toBe('shipped');
    const settings = await s.a.painter.get(`${base}/shipping-settings`).expect(200);
    expect(settings.body).toEqual({ autoCloseDays: null, fromCountry: 'DE', packingItems: ['Wrap it'] });
    expect((await s.a.painter.put(`${base}/shipping-settings`, settings.body)).status).toBe(403);
  });
});
