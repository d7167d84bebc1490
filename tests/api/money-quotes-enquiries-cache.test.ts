import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createListsVersionTriggers, dropListsVersionTriggers } from '../../migrations/20270207120000-lists-version';
import { createQuotesEnquiriesListsTriggers, dropQuotesEnquiriesListsTriggers, quotesEnquiriesListsTriggers } from '../../migrations/20270208120000-lists-version-quotes-enquiries';
import { Caller, idOf, signInAs, startTestApp, withQueries, type TestApp } from '../support/app';
import { images } from '../support/fixtures';
import { afterEachWrite, bothClocks, isFloorRead, ok } from '../support/kept-reads';
import { checkoutCompletedEvent } from '../support/payment-events';
import { acceptedQuote, commission, draftQuote, invoicesOf, moneyStudios, sentQuote, shipping, type Side } from './money-flow';

// The owner's money view, the enquiry list and the quote list (the owner's and a client's) are kept in memory
// per studio, version and query (server/features/money/money.service.ts, enquiries/enquiries.service.ts,
// quotes/quotes.service.ts): the money view under the schedule, books and lists versions together, the two
// lists under studios.lists_version, which migrations/20270208120000-lists-version-quotes-enquiries.ts moves
// with the quotes, enquiries, their figures and photos, the studio's tiers and a commission's status before
// its hold. Two app instances share one database (one SQLite file, or one PostgreSQL database with
// DATABASE_URL): `cached` with the caches on, `fresh` with listsCacheRows 0, which reads every answer from the
// database. After each kind of write these answers read, through either instance or straight to the
// database, the cached answers must be the fresh ones, and something else than before (else the write proved
// nothing). Each new trigger has a write straight to the database that only it sees, and with that trigger
// dropped the cached answer stays as it was.

let cached: TestApp;
let fresh: TestApp;
const { at, advance } = bothClocks(() => [cached, fresh]);
let a: Side;
let b: Side;
let base: string;
let slug: string;
const ids: Record<string, number> = {};

const enquiryShapes = ['', '?status=new', '?limit=1&offset=1', '?q=corvin'];
const quoteShapes = () => ['', '?status=sent', '?limit=1&offset=1', '?q=marsh', `?commissionId=${ids.first}`];
const clientQuoteShapes = ['', '?limit=1'];

type Role = 'owner' | 'client';
const callers = { cached: {}, fresh: {} } as Record<'cached' | 'fresh', Record<'a' | 'b', Record<Role, Caller>>>;

/** The money view, the enquiries and the quotes of studio A (owner and client) and of studio B, from one instance. */
async function lists(on: 'cached' | 'fresh') {
  const out: Record<string, unknown> = {};
  for (const s of [a, b]) {
    const S = `/api/studios/${s.studioId}`;
    const tag = s === a ? 'a' : 'b';
    const c = callers[on][tag];
    out[`${tag} money`] = (await ok(c.owner.get(`${S}/money`))).body;
    for (const q of enquiryShapes) out[`${tag} enquiries${q}`] = (await ok(c.owner.get(`${S}/enquiries${q}`))).body;
    for (const q of quoteShapes()) out[`${tag} quotes${q}`] = (await ok(c.owner.get(`${S}/quotes${q}`))).body;
    for (const q of clientQuoteShapes) out[`${tag} client quotes${q}`] = (await ok(c.client.get(`${S}/quotes${q}`))).body;
  }
  return out;
}

/** Reads everything on the cached instance, moves the clocks on a minute, writes, compares. */
const afterWrite = afterEachWrite(lists, () => advance(60_000));

const now = () => cached.clock.now().toISOString();
let n = 0;
const insertId = async (table: string, row: Record<string, unknown>) => idOf((await cached.db(table).insert(row).returning('id'))[0]);

let ip = 0;
/** A visitor's enquiry through the public form of studio A, on the cached instance. */
async function enquire(email: string, photos = 0) {
  const c = new Caller(cached.app);
  const token = await c.csrf();
  let req = c.agent.post(`/api/public/studios/${slug}/enquiries`).set('x-csrf-token', token).set('x-forwarded-for', `198.51.100.${++ip}`);
  const fields = {
    name: 'Corvin Ashdale',
    email,
    figures: JSON.stringify([
      { name: 'Marsh rat swarm', quantity: 10, sizeClass: '25' },
      { name: 'Marsh ogre', quantity: 1, sizeClass: '50' },
    ]),
    tier: 'display',
    extras: JSON.stringify([]),
    dueDate: '2026-09-01',
    consent: 'true',
  };
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  for (let i = 0; i < photos; i++) req = req.attach('photos', await images.twoTone(120, 90), { filename: `ref${i}.jpg`, contentType: 'image/jpeg' });
  const res = await req;
  if (res.status !== 201) throw new Error(`enquiry failed: ${res.status} ${JSON.stringify(res.body)}`);
  return idOf(await cached.db('enquiries').where({ email: email.toLowerCase() }).orderBy('id', 'desc').first('id'));
}

/**
 * Writes straight to the database, one per new trigger, each seen by that trigger alone (so with it dropped
 * the kept answers stay as they were). In order: each delete removes what its insert added.
 */
const straight: Record<string, () => Promise<unknown>> = {
  lists_version_quotes_insert: async () => {
    const q = await cached.db('quotes').where({ id: ids.sentQuote }).first();
    const { id: _id, ...row } = q;
    ids.sqlQuote = await insertId('quotes', { ...row, version: 90, status: 'sent', valid_until: '2027-01-01', created_at: now(), updated_at: now() });
  },
  lists_version_quotes_update: () => cached.db('quotes').where({ id: ids.sqlQuote }).update({ total: 20_000 + ++n }),
  lists_version_quotes_delete: () => cached.db('quotes').where({ id: ids.sqlQuote }).delete(),
  lists_version_enquiries_insert: async () =>
    (ids.sqlEnquiry = await insertId('enquiries', {
      studio_id: a.studioId,
      status: 'new',
      name: 'Straight visitor',
      email: 'straight@visitor.test',
      tier: 'straight-tier',
      extras: '[]',
      currency: 'EUR',
      consent_at: now(),
      created_at: now(),
    })),
  lists_version_enquiries_update: () => cached.db('enquiries').where({ id: ids.sqlEnquiry }).update({ name: `Straight visitor ${++n}` }),
  lists_version_enquiry_figures_insert: async () =>
    (ids.sqlFigure = await insertId('enquiry_figures', { studio_id: a.studioId, enquiry_id: ids.sqlEnquiry, position: 1, name: 'Straight toad', quantity: 2, size_class: '28' })),
  lists_version_enquiry_figures_update: () => cached.db('enquiry_figures').where({ id: ids.sqlFigure }).update({ quantity: 3 + ++n }),
  lists_version_enquiry_figures_delete: () => cached.db('enquiry_figures').where({ id: ids.sqlFigure }).delete(),
  lists_version_enquiry_photos_insert: async () =>
    (ids.sqlPhoto = await insertId('enquiry_photos', { studio_id: a.studioId, enquiry_id: ids.sqlEnquiry, storage_key: 'straight/none', format: 'jpeg', width: 10, height: 10, bytes: 100, created_at: now() })),
  // Moved to the other enquiry and back: the photo counts change.
  lists_version_enquiry_photos_update: async () => {
    const p = await cached.db('enquiry_photos').where({ id: ids.sqlPhoto }).first('enquiry_id');
    await cached.db('enquiry_photos').where({ id: ids.sqlPhoto }).update({ enquiry_id: p.enquiry_id === ids.sqlEnquiry ? ids.enquiry : ids.sqlEnquiry });
  },
  lists_version_enquiry_photos_delete: () => cached.db('enquiry_photos').where({ id: ids.sqlPhoto }).delete(),
  // The straight enquiry's tier has no label until the studio's list has it.
  lists_version_studio_lists_insert: async () => (ids.sqlTier = await insertId('studio_lists', { studio_id: a.studioId, list: 'tier', key: 'straight-tier', label: 'Straight tier', position: 50 })),
  lists_version_studio_lists_update: () => cached.db('studio_lists').where({ id: ids.sqlTier }).update({ label: `Straight tier ${++n}` }),
  lists_version_studio_lists_delete: () => cached.db('studio_lists').where({ id: ids.sqlTier }).delete(),
  lists_version_enquiries_delete: () => cached.db('enquiries').where({ id: ids.sqlEnquiry }).delete(),
  // The commission on hold from booked holds its deposit; on hold from the bench it does not.
  lists_version_commissions_hold_update: async () => {
    const c = await cached.db('commissions').where({ id: ids.first }).first('status_before_hold');
    await cached.db('commissions').where({ id: ids.first }).update({ status_before_hold: c.status_before_hold === 'booked' ? 'on_bench' : 'booked' });
  },
};

beforeAll(async () => {
  cached = await startTestApp({ trustProxy: true });
  fresh = await startTestApp({ dataDir: cached.dataDir, listsCacheRows: 0, trustProxy: true });
  // Monday 30 March 2026, 12:00 in Berlin.
  at('2026-03-30T10:00:00.000Z');
  ({ a, b } = await moneyStudios(cached));
  for (const [tag, side] of [['a', a], ['b', b]] as const) {
    callers.cached[tag] = { owner: side.owner, client: side.client };
    callers.fresh[tag] = { owner: await signInAs(fresh, `owner-${tag}@studio.test`), client: await signInAs(fresh, `client-${tag}@studio.test`) };
  }
  base = `/api/studios/${a.studioId}`;
  slug = (await ok(a.owner.put(`${base}/public-page`, { enabled: true, turnaroundSource: 'text' }))).body.slug;
  ids.enquiry = await enquire('corvin@visitor.test', 1);
  await enquire('other@visitor.test');
  ids.first = (await commission(a, 'Marsh wardens')).id;
  ids.second = (await commission(a, 'Reed skiff')).id;
  await acceptedQuote(a, ids.first);
  ids.deposit = (await invoicesOf(a.owner, a.studioId, ids.first))[0].id;
  ids.sentQuote = (await sentQuote(a, ids.second)).id;
  await commission(b, 'Other studio work').then((c) => sentQuote(b, c.id));
});

afterAll(async () => {
  await fresh?.stop();
  await cached?.stop();
});

const freshOwner = () => callers.fresh.a.owner;
const freshClient = () => callers.fresh.a.client;

describe('the kept money view, enquiries and quotes after each write they read', () => {
  it('answer as a fresh read does from the start', async () => {
    const first = await lists('cached');
    expect(first).toEqual(await lists('fresh'));
    expect(await lists('cached')).toEqual(first);
    expect((first['a enquiries'] as { items: unknown[] }).items).toHaveLength(2);
    expect((first['a quotes'] as { items: unknown[] }).items).toHaveLength(2);
    expect((first['a money'] as { openInvoices: number }).openInvoices).toBe(1);
  });

  it('enquiries received, declined and accepted, and the tiers relabelled, through either instance', async () => {
    await afterWrite(() => enquire('third@visitor.test', 1));
    const third = idOf(await cached.db('enquiries').where({ email: 'third@visitor.test' }).first('id'));
    await afterWrite(() => ok(freshOwner().post(`${base}/enquiries/${third}/decline`, { message: 'We cannot take this on just now.' })));
    await afterWrite(() => ok(a.owner.post(`${base}/enquiries/${ids.enquiry}/accept`, { invite: false }), 201));
    const lists = (await ok(a.owner.get(`${base}/lists`))).body as { tiers: { key: string; label: string }[]; extras: { key: string; label: string }[] };
    await afterWrite(() => ok(freshOwner().put(`${base}/lists`, { tiers: lists.tiers.map((t) => ({ ...t, label: `${t.label} (marsh)` })), extras: lists.extras })));
  });

  it('quotes drafted, edited, sent, answered by the client and accepted through either instance', async () => {
    const c = await commission(a, 'Marsh heron');
    const draft = await afterWrite(() => draftQuote(a, c.id));
    const q = (await ok(a.owner.get(`${base}/quotes?commissionId=${c.id}`))).body.items[0].id as number;
    expect(draft.after).not.toEqual(draft.before);
    await afterWrite(() => ok(freshOwner().patch(`${base}/quotes/${q}`, { extraLines: [...shipping, { kind: 'custom', label: 'Display base', unitAmount: 1500 }] })));
    await afterWrite(() => ok(freshOwner().post(`${base}/quotes/${q}/send`)));
    await afterWrite(() => ok(a.client.post(`${base}/quotes/${q}/request-changes`, { comment: 'Greener water, please.' })));
    const second = await draftQuote(a, c.id);
    await afterWrite(() => ok(a.owner.post(`${base}/quotes/${second.id}/send`)));
    await afterWrite(() => ok(freshClient().post(`${base}/quotes/${second.id}/decline`, { comment: 'Not this year.' })));
    const third = await sentQuote(a, c.id);
    // Accepted: the deposit invoice is issued (the money view owes it).
    await afterWrite(() => ok(a.client.post(`${base}/quotes/${third.id}/accept`, { name: 'Client A', acceptTerms: true })));
  });

  it('a flagged payment event, payments, refunds, invoices issued and voided, and a commission on hold', async () => {
    // A checkout paid short: the event is flagged for the owner (the payment webhook, on the cached instance).
    const co = (await ok(a.client.post(`${base}/invoices/${ids.deposit}/checkout`))).body as { sessionId: string };
    const body = checkoutCompletedEvent('evt_short_cache', { sessionId: co.sessionId, amount: 100, currency: 'eur', invoiceId: ids.deposit, studioId: a.studioId }, cached.clock.now());
    const signature = cached.payments.stripe.webhooks.generateTestHeaderString({ payload: body, secret: cached.paymentsFake!.webhookSecret, timestamp: Math.floor(cached.clock.now().getTime() / 1000) });
    await afterWrite(() => ok(request(cached.app).post('/api/webhooks/payments').set('content-type', 'application/json').set('stripe-signature', signature).send(body)));
    // Paid: the commission is booked, its deposit held.
    await afterWrite(() => ok(freshOwner().post(`${base}/invoices/${ids.deposit}/payments`, { method: 'bank', amountMinor: 9500 })));
    await afterWrite(() => ok(a.owner.post(`${base}/invoices/${ids.deposit}/refunds`, { amountMinor: 1000, reason: 'Paid twice by mistake.' })));
    ids.custom = (await ok(a.owner.post(`${base}/invoices`, { commissionId: ids.first, kind: 'custom', lines: [{ description: 'Display base', quantity: 1, unitMinor: 2500 }], dueDate: '2026-04-01' }), 201)).body.id;
    await afterWrite(() => ok(freshOwner().post(`${base}/invoices/${ids.custom}/issue`)));
    const progress = (await ok(freshOwner().post(`${base}/invoices`, { commissionId: ids.second, kind: 'progress', lines: [{ description: 'Half way', quantity: 1, unitMinor: 4000 }] }), 201)).body;
    await afterWrite(() => ok(a.owner.post(`${base}/invoices/${progress.id}/issue`)));
    await afterWrite(() => ok(freshOwner().post(`${base}/invoices/${progress.id}/void`)));
    // On hold from booked and back: still held (the same answers); onto the bench: no longer held.
    await ok(a.owner.post(`${base}/commissions/${ids.first}/transitions`, { to: 'on_hold', reason: 'Waiting for parts.' }));
    expect(await lists('cached')).toEqual(await lists('fresh'));
    await ok(freshOwner().post(`${base}/commissions/${ids.first}/transitions`, { to: 'booked' }));
    expect(await lists('cached')).toEqual(await lists('fresh'));
    await afterWrite(() => ok(a.owner.post(`${base}/commissions/${ids.first}/transitions`, { to: 'on_bench' })));
    await ok(freshOwner().post(`${base}/commissions/${ids.first}/transitions`, { to: 'on_hold', reason: 'Waiting again.' }));
    expect(await lists('cached')).toEqual(await lists('fresh'));
  });

  it('a client and a commission renamed through the API', async () => {
    await afterWrite(() => ok(a.owner.patch(`${base}/clients/${a.clientId}`, { name: 'Client A of the marsh' })));
    await afterWrite(() => ok(freshOwner().patch(`${base}/commissions/${ids.second}`, { title: 'Reed skiff, marsh' })));
  });

  it('writes the money view reads under the books and schedule versions, straight to the database', async () => {
    const payment = idOf(await cached.db('invoice_payments').where({ invoice_id: ids.deposit }).first('id'));
    await afterWrite(() => cached.db('invoice_refunds').insert({ studio_id: a.studioId, invoice_id: ids.deposit, payment_id: payment, amount: 500, reason: 'Straight refund', created_at: now() }));
    await afterWrite(() => cached.db('invoices').where({ id: ids.custom }).update({ due_date: '2026-03-01' }));
    await afterWrite(() => cached.db('studios').where({ id: a.studioId }).update({ currency: 'GBP' }).then(() => cached.db('price_tables').where({ studio_id: a.studioId }).delete()));
    await afterWrite(() => cached.db('studios').where({ id: a.studioId }).update({ currency: 'EUR' }));
    await afterWrite(() => cached.db('commissions').where({ id: ids.first }).update({ status: 'booked', status_before_hold: null }));
  });

  it('each new trigger: a write straight to the database that only it sees', async () => {
    expect(Object.keys(straight).sort()).toEqual(quotesEnquiriesListsTriggers().map((t) => t.name).sort());
    // The commission is put on hold from booked again, its deposit held.
    await cached.db('commissions').where({ id: ids.first }).update({ status: 'on_hold', status_before_hold: 'booked' });
    for (const [trigger, write] of Object.entries(straight)) {
      const { after } = await afterWrite(write).catch((err: Error) => {
        throw new Error(`${trigger}: ${err.message}`);
      });
      expect(after, trigger).toBeDefined();
    }
  }, 120_000);

  it('with any one new trigger dropped, its write leaves the kept answers as they were', async () => {
    const db = cached.db;
    const isPg = db.client.config.client === 'pg';
    const again = async () => {
      await dropQuotesEnquiriesListsTriggers(db);
      await createQuotesEnquiriesListsTriggers(db);
    };
    try {
      const tables = new Map(quotesEnquiriesListsTriggers().map((t) => [t.name, t.table]));
      for (const t of Object.keys(straight).map((name) => ({ name, table: tables.get(name)! }))) {
        const before = await lists('cached');
        await db.raw(isPg ? `drop trigger ${t.name} on ${t.table}` : `drop trigger ${t.name}`);
        advance(60_000);
        await straight[t.name]();
        expect(await lists('cached'), t.name).toEqual(before);
        expect(await lists('fresh'), t.name).not.toEqual(before);
        await again();
        // Any later write moves the version again, and the kept answers with it.
        await db('studios').where({ id: a.studioId }).increment('lists_version', 1);
        expect(await lists('cached')).toEqual(await lists('fresh'));
      }
    } finally {
      await again();
    }
  }, 180_000);

  it('the first lists triggers set aside and made again (as the bench’s loader and the rack’s test do) leave these working', async () => {
    await dropListsVersionTriggers(cached.db);
    await createListsVersionTriggers(cached.db);
    await afterWrite(() => cached.db('quotes').where({ id: ids.sentQuote }).update({ total: 30_000 + ++n }));
    await afterWrite(() => cached.db('clients').where({ id: a.clientId }).update({ name: `Client A, renamed ${++n}` }));
  });

  it('the clock moving across the day a quote runs out and an invoice falls due, and into the next month, with no write', async () => {
    const c = await commission(a, 'Marsh lantern');
    const q = await sentQuote(a, c.id);
    await cached.db('quotes').where({ id: q.id }).update({ valid_until: '2026-04-02' });
    await cached.db('invoices').where({ id: ids.custom }).update({ due_date: '2026-04-01' });
    // 23:59 on Wednesday 1 April in Berlin (UTC+2), then 00:01 on the 2nd: the invoice due the 1st is overdue.
    at('2026-04-01T21:59:00.000Z');
    const day = await lists('cached');
    expect(day).toEqual(await lists('fresh'));
    at('2026-04-01T22:01:00.000Z');
    const next = await lists('cached');
    expect(next).toEqual(await lists('fresh'));
    const money = (l: Record<string, unknown>) => l['a money'] as { overdueInvoices: number; paidThisMonthMinor: number };
    expect(money(next).overdueInvoices).toBe(money(day).overdueInvoices + 1);
    // 00:01 on the 3rd: the quote valid until the 2nd has run out (shown, and stored, as expired).
    const status = (l: Record<string, unknown>) => (l['a quotes'] as { items: { id: number; status: string }[] }).items.find((i) => i.id === q.id)!.status;
    at('2026-04-02T22:01:00.000Z');
    const third = await lists('cached');
    expect(third).toEqual(await lists('fresh'));
    expect([status(next), status(third)]).toEqual(['sent', 'expired']);
    // The payments were made in March: none this month; back in March (another machine's clock), there they are.
    expect(money(third).paidThisMonthMinor).toBe(0);
    at('2026-03-31T08:00:00.000Z');
    const march = await lists('cached');
    expect(march).toEqual(await lists('fresh'));
    expect(money(march).paidThisMonthMinor).toBeGreaterThan(0);
  });

  it('a change of the studio’s zone, with no other write', async () => {
    // 22:30 UTC on 2 April: the 3rd in Berlin (UTC+2), the 2nd in New York (UTC−4).
    await cached.db('invoices').where({ id: ids.custom }).update({ due_date: '2026-04-02' });
    at('2026-04-02T22:30:00.000Z');
    const berlin = await lists('cached');
    expect(berlin).toEqual(await lists('fresh'));
    await cached.db('studios').where({ id: a.studioId }).update({ timezone: 'America/New_York' });
    const york = await lists('cached');
    expect(york).toEqual(await lists('fresh'));
    expect(york['a money']).not.toEqual(berlin['a money']);
  });
});

const versionReads = (sql: string[]) => sql.filter((s) => /lists_version/.test(s));
const otherReads = (sql: string[]) => sql.filter((s) => !/lists_version/.test(s) && !isFloorRead(s));

describe('reading unchanged answers', () => {
  it('the second identical request reads the version and nothing else', async () => {
    for (const [c, url] of [
      [a.owner, `${base}/money`],
      [a.owner, `${base}/enquiries`],
      [a.owner, `${base}/enquiries?status=new&limit=1`],
      [a.owner, `${base}/quotes`],
      [a.owner, `${base}/quotes?q=marsh`],
      [a.client, `${base}/quotes`],
    ] as const) {
      await ok(c.get(url));
      const again = await withQueries(cached.db, () => ok(c.get(url)));
      expect(versionReads(again.sql), url).toHaveLength(1);
      expect(otherReads(again.sql), url).toEqual([]);
    }
  });

  it('never answers one studio with another’s, nor the client with the owner’s quotes', async () => {
    await draftQuote(a, ids.second);
    const owners = (await ok(a.owner.get(`${base}/quotes`))).body;
    const clients = (await ok(a.client.get(`${base}/quotes`))).body;
    expect(clients.total).toBeLessThan(owners.total);
    expect(clients.items.some((q: { status: string }) => q.status === 'draft')).toBe(false);
    const theirs = (await ok(b.owner.get(`/api/studios/${b.studioId}/quotes`))).body;
    expect(theirs.items.map((q: { commissionTitle: string }) => q.commissionTitle)).toEqual(['Other studio work']);
    expect((await ok(b.owner.get(`/api/studios/${b.studioId}/money`))).body).not.toEqual((await ok(a.owner.get(`${base}/money`))).body);
  });
});
