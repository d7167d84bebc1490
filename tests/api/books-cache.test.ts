import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Config } from '../../server/config';
import { defaultPriceTable } from '../../shared/schemas/price-table';
import { PASSWORD, signInAs, startTestApp, withQueries, type Caller, type TestApp } from '../support/app';
import { acceptedQuote, commission, invoicesOf, moneyStudios, type Side } from './money-flow';
import { afterEachWrite, bothClocks, isFloorRead } from '../support/kept-reads';

// The books (earnings, actuals) and each role's home are kept in memory under the books version
// (server/features/reports/reports.service.ts, server/features/dashboard/dashboard.service.ts;
// schedule_version + books_version, migrations/20270205120000-books-version.ts). Two app instances share
// one database (one SQLite file, or one PostgreSQL database with DATABASE_URL), as docs/scaling.md runs
// them: `cached` with the books cache, `fresh` with it off (booksCacheRows: 0, and the forecast cache off),
// so every answer of `fresh` is read from the database. After each kind of write those answers read, made
// through either instance or straight to the database, and after the clock moves across a day and a month,
// the cached instance must answer everything exactly as the fresh one, and something else than before (else
// the write proved nothing).

let cached: TestApp;
let fresh: TestApp;
const { at, advance } = bothClocks(() => [cached, fresh]);
let a: Side;
let b: Side;
let base: string;
type Who = 'owner' | 'painter' | 'client' | 'otherOwner';
const callers: Record<'cached' | 'fresh', Record<Who, Caller>> = { cached: {} as Record<Who, Caller>, fresh: {} as Record<Who, Caller> };
const ids: Record<string, number> = {};
let stages: { id: number; key: string }[] = [];
let figureIds: number[] = [];

/** Off on the fresh instance. */
const booksOff: Partial<Config> = { booksCacheRows: 0, forecastCacheStages: 0 };


// eslint-disable-next-line @typescript-eslint/no-explicit-any -- answers compared whole
const ok = async (res: Promise<{ status: number; body: any }>, status = 200) => {
  const r = await res;
  if (r.status !== status) throw new Error(`${r.status}: ${JSON.stringify(r.body)}`);
  return r;
};

/** The books' query shapes: the default window (ends this month), a fixed one, one from a month on. */
const earningShapes = ['', '?from=2026-01&to=2026-06', '?from=2026-03'];

/** Everything the books and the homes answer, from one instance. */
async function books(on: 'cached' | 'fresh') {
  const c = callers[on];
  const out: Record<string, unknown> = {};
  for (const s of earningShapes) out[`earnings${s}`] = (await ok(c.owner.get(`${base}/reports/earnings${s}`))).body;
  out.actuals = (await ok(c.owner.get(`${base}/reports/actuals`))).body;
  out.home = (await ok(c.owner.get(`${base}/dashboard`))).body;
  out.painterHome = (await ok(c.painter.get(`${base}/dashboard`))).body;
  out.clientHome = (await ok(c.client.get(`${base}/dashboard`))).body;
  out.otherEarnings = (await ok(c.otherOwner.get(`/api/studios/${b.studioId}/reports/earnings`))).body;
  out.otherHome = (await ok(c.otherOwner.get(`/api/studios/${b.studioId}/dashboard`))).body;
  return out;
}

const afterWrite = afterEachWrite(books);

const invoices = () => invoicesOf(callers.cached.owner, a.studioId, ids.first);

beforeAll(async () => {
  cached = await startTestApp();
  fresh = await startTestApp({ dataDir: cached.dataDir, ...booksOff });
  // Monday 30 March 2026, 12:00 in Berlin (summer time since the 29th: UTC+2).
  at('2026-03-30T10:00:00.000Z');
  ({ a, b } = await moneyStudios(cached));
  base = `/api/studios/${a.studioId}`;
  callers.cached = { owner: a.owner, painter: a.painter, client: a.client, otherOwner: b.owner };
  callers.fresh = {
    owner: await signInAs(fresh, 'owner-a@studio.test', PASSWORD),
    painter: await signInAs(fresh, 'painter-a@studio.test', PASSWORD),
    client: await signInAs(fresh, 'client-a@studio.test', PASSWORD),
    otherOwner: await signInAs(fresh, 'owner-b@studio.test', PASSWORD),
  };
  const c = await commission(a, 'Marsh wardens');
  ids.first = c.id;
  figureIds = c.figures.map((f) => f.id);
  stages = c.figures[0].stages;
  ids.second = (await commission(a, 'Reed skiff')).id;
  ids.other = (await commission(b, 'Salt barge')).id;
});
afterAll(async () => {
  await fresh?.stop();
  await cached?.stop();
});

describe('the kept books and owner’s home after each write they read', () => {
  it('answer as a fresh read does from the start', async () => {
    const first = await books('cached');
    expect(first).toEqual(await books('fresh'));
    expect((first.home as { role: string }).role).toBe('owner');
    expect((first['earnings'] as { from: string; to: string }).to).toBe('2026-03');
  });

  it('a quote accepted (the deposit invoice issued with it), each instance', async () => {
    await afterWrite(() => acceptedQuote(a, ids.first));
    await afterWrite(() => acceptedQuote({ ...a, owner: callers.fresh.owner, client: callers.fresh.client }, ids.second));
    const [deposit] = await invoices();
    expect(deposit).toMatchObject({ kind: 'deposit', status: 'open' });
    ids.deposit = deposit.id;
  });

  it('a payment recorded, and a refund', async () => {
    await afterWrite(() => ok(callers.fresh.owner.post(`${base}/invoices/${ids.deposit}/payments`, { method: 'bank', amountMinor: 5000 })));
    await afterWrite(() => ok(callers.cached.owner.post(`${base}/invoices/${ids.deposit}/payments`, { method: 'cash', amountMinor: 4500, receivedAt: '2026-02-10' })));
    await afterWrite(() => ok(callers.fresh.owner.post(`${base}/invoices/${ids.deposit}/refunds`, { amountMinor: 1000, reason: 'Paid twice by mistake.' })));
  });

  it('an invoice issued and voided', async () => {
    const draft = (await ok(callers.cached.owner.post(`${base}/invoices`, { commissionId: ids.first, kind: 'custom', lines: [{ description: 'Display base', quantity: 1, unitMinor: 2500 }], dueDate: '2026-03-31' }), 201)).body;
    ids.custom = draft.id;
    await afterWrite(() => ok(callers.fresh.owner.post(`${base}/invoices/${ids.custom}/issue`)));
    const progress = (await ok(callers.fresh.owner.post(`${base}/invoices`, { commissionId: ids.second, kind: 'progress', lines: [{ description: 'Half way', quantity: 1, unitMinor: 4000 }] }), 201)).body;
    await afterWrite(() => ok(callers.cached.owner.post(`${base}/invoices/${progress.id}/issue`)));
    await afterWrite(() => ok(callers.cached.owner.post(`${base}/invoices/${progress.id}/void`)));
  });

  it('time logged on a done stage, and a stage ticked', async () => {
    await afterWrite(() => ok(callers.cached.painter.patch(`${base}/stages/${stages[0].id}`, { status: 'done' })));
    await afterWrite(() => ok(callers.fresh.painter.post(`${base}/stages/${stages[0].id}/time`, { hours: 1.5 }), 201));
    await ok(callers.fresh.painter.post(`${base}/stages/${stages[1].id}/time`, { hours: 0.75 }), 201);
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/stages/${stages[1].id}`, { status: 'done' })));
    await afterWrite(() => ok(callers.cached.owner.patch(`${base}/stages/${stages[1].id}`, { estimateHours: 2 })));
  });

  it('the owner’s own timer started and stopped', async () => {
    await afterWrite(() => ok(callers.fresh.owner.post(`${base}/stages/${stages[2].id}/timer`), 201));
    advance(30 * 60_000);
    await afterWrite(() => ok(callers.cached.owner.post(`${base}/timer/stop`)));
  });

  it('a figure’s tier, size and extras (the actuals’ cells)', async () => {
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/figures/${figureIds[0]}`, { tier: 'display' })));
    await afterWrite(() => ok(callers.cached.owner.patch(`${base}/figures/${figureIds[0]}`, { sizeClass: '32' })));
    await afterWrite(() => cached.db('figures').where({ id: figureIds[0] }).update({ extras: JSON.stringify(['assembly', 'conversion', 'magnetising', 'freehand', 'nmm', 'light-effects', 'weathering']) }));
  });

  it('the card fee and the price table', async () => {
    await afterWrite(() => ok(callers.fresh.owner.put(`${base}/reports/settings`, { cardFeeBp: 150, cardFeeFixedMinor: 25 })));
    await afterWrite(() => ok(callers.cached.owner.put(`${base}/reports/settings`, { cardFeeBp: 150, cardFeeFixedMinor: 30 })));
    const table = (await ok(callers.cached.owner.get(`${base}/price-table`))).body;
    await afterWrite(() => ok(callers.fresh.owner.put(`${base}/price-table`, { ...table, hourlyRate: 3500 })));
    table.stageHours['28'].tabletop.basecoat = 2;
    await afterWrite(() => ok(callers.cached.owner.put(`${base}/price-table`, table)));
  });

  it('a client and a commission renamed', async () => {
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/clients/${a.clientId}`, { name: 'Client A, renamed' })));
    await afterWrite(() => ok(callers.cached.owner.patch(`${base}/commissions/${ids.first}`, { title: 'Marsh wardens, full squad' })));
  });

  it('money rows written straight to the database: a quote’s total and lines, a payment’s method and date, the card fee and a refund removed, an invoice’s due date', async () => {
    await afterWrite(() => cached.db('quotes').where({ commission_id: ids.first, status: 'accepted' }).update({ total: 30000 }));
    await afterWrite(() => fresh.db('quotes').where({ commission_id: ids.first, status: 'accepted' }).update({ result_json: JSON.stringify({ lines: [{ type: 'extra', kind: 'shipping', amount: 2000 }] }) }));
    await afterWrite(() => cached.db('invoice_payments').where({ invoice_id: ids.deposit, method: 'bank' }).update({ method: 'card' }));
    await afterWrite(() => fresh.db('books_settings').where({ studio_id: a.studioId }).delete());
    await afterWrite(() => cached.db('invoice_payments').where({ invoice_id: ids.deposit, method: 'cash' }).update({ received_at: '2026-01-10T10:00:00.000Z' }));
    await afterWrite(() => fresh.db('invoice_refunds').where({ invoice_id: ids.deposit }).delete());
    await afterWrite(() => cached.db('invoices').where({ id: ids.custom }).update({ due_date: '2026-03-29' }));
  });

  it('money rows and a running timer inserted and deleted straight to the database', async () => {
    const t = cached.clock.now().toISOString();
    const quote = (await cached.db('quotes').where({ commission_id: ids.first, status: 'accepted' }).first()) as Record<string, unknown>;
    const { id: _quoteId, ...copy } = quote;
    // A later accepted version: its lines and total count from then on.
    await afterWrite(() => cached.db('quotes').insert({ ...copy, version: Number(quote.version) + 1, total: 40000, result_json: JSON.stringify({ lines: [{ type: 'extra', kind: 'insurance', amount: 9000 }] }) }));
    await afterWrite(() => fresh.db('quotes').where({ commission_id: ids.first, version: Number(quote.version) + 1 }).delete());
    await afterWrite(() => cached.db('invoice_payments').insert({ studio_id: a.studioId, invoice_id: ids.deposit, method: 'other', amount: 700, received_at: t, created_at: t }));
    await afterWrite(() => fresh.db('invoice_payments').where({ invoice_id: ids.deposit, method: 'other' }).delete());
    const cash = (await cached.db('invoice_payments').where({ invoice_id: ids.deposit, method: 'cash' }).first('id')).id as number;
    await afterWrite(() => cached.db('invoice_refunds').insert({ studio_id: a.studioId, invoice_id: ids.deposit, payment_id: cash, amount: 300, reason: 'Straight in.', created_at: t }));
    await afterWrite(() => fresh.db('invoice_refunds').where({ payment_id: cash }).update({ amount: 400 }));
    const ownerId = (await cached.db('users').where({ email: 'owner-a@studio.test' }).first('id')).id as number;
    const timer = { studio_id: a.studioId, commission_id: ids.first, figure_id: figureIds[0], stage_id: stages[2].id, user_id: ownerId, source: 'timer', started_at: t, created_at: t, updated_at: t };
    await afterWrite(() => cached.db('time_entries').insert(timer));
    await afterWrite(() => fresh.db('time_entries').where({ user_id: ownerId }).whereNull('ended_at').update({ started_at: '2026-03-30T09:00:00.000Z' }));
    await afterWrite(() => cached.db('time_entries').where({ user_id: ownerId }).whereNull('ended_at').delete());
    const invoice = (await cached.db('invoices').where({ id: ids.custom }).first()) as Record<string, unknown>;
    const { id: _invoiceId, ...invoiceCopy } = invoice;
    await afterWrite(() => cached.db('invoices').insert({ ...invoiceCopy, number: 'STRAIGHT-1', total: 1234 }));
    await afterWrite(() => fresh.db('invoices').where({ number: 'STRAIGHT-1' }).delete());
  });

  it('the other studio on the default table: its currency, then a table of its own', async () => {
    // B's own table removed: the defaults in the studio's currency from then on.
    await afterWrite(() => fresh.db('price_tables').where({ studio_id: b.studioId }).delete());
    await afterWrite(() => cached.db('studios').where({ id: b.studioId }).update({ currency: 'GBP' }));
    // And a table of its own again, straight in.
    const t = cached.clock.now().toISOString();
    await afterWrite(() => fresh.db('price_tables').insert({ studio_id: b.studioId, table_json: JSON.stringify({ ...defaultPriceTable('USD'), hourlyRate: 4100 }), updated_at: t }));
  });

  it('the clock moving across a day and a month, with no write', async () => {
    await cached.db('invoices').where({ id: ids.custom }).update({ due_date: '2026-03-30' });
    // 23:59 on Monday 30 March in Berlin, then 00:01 on the 31st: the invoice due the 30th is overdue.
    at('2026-03-30T21:59:00.000Z');
    const day = await books('cached');
    expect(day).toEqual(await books('fresh'));
    at('2026-03-30T22:01:00.000Z');
    const nextDay = await books('cached');
    expect(nextDay).toEqual(await books('fresh'));
    expect((nextDay.home as { invoices: { overdue: { count: number } } }).invoices.overdue.count).toBe((day.home as { invoices: { overdue: { count: number } } }).invoices.overdue.count + 1);
    // 23:59 on 31 March, then 00:01 on 1 April: the default window moves on a month.
    at('2026-03-31T21:59:00.000Z');
    const march = await books('cached');
    expect(march).toEqual(await books('fresh'));
    at('2026-03-31T22:01:00.000Z');
    const april = await books('cached');
    expect(april).toEqual(await books('fresh'));
    expect([(march.earnings as { to: string }).to, (april.earnings as { to: string }).to]).toEqual(['2026-03', '2026-04']);
    // And back (two machines' clocks may disagree): March again.
    at('2026-03-31T21:59:30.000Z');
    const again = await books('cached');
    expect(again).toEqual(await books('fresh'));
    expect(again.earnings).toEqual(march.earnings);
  });
});

/** What a request reads beyond the signed-in floor (session, user, membership) and the version. */
const versionReads = (sql: string[]) => sql.filter((s) => /books_version/.test(s));
const booksReads = (sql: string[]) => sql.filter((s) => !/books_version/.test(s) && !isFloorRead(s));

describe('reading unchanged books', () => {
  const urls = (): [Who, string][] => [
    ...earningShapes.map((s): [Who, string] => ['owner', `${base}/reports/earnings${s}`]),
    ['owner', `${base}/reports/actuals`],
    ['owner', `${base}/dashboard`],
    ['painter', `${base}/dashboard`],
    ['client', `${base}/dashboard`],
  ];

  it('the second identical request reads the version and nothing else; the uncached instance reads it all again', async () => {
    for (const [who, url] of urls()) {
      await ok(callers.fresh.owner.patch(`${base}/commissions/${ids.second}`, { title: `Reed skiff ${who} ${url.length}` }));
      const first = (await withQueries(cached.db, () => ok(callers.cached[who].get(url)))).sql;
      const second = (await withQueries(cached.db, () => ok(callers.cached[who].get(url)))).sql;
      expect(booksReads(first).length).toBeGreaterThanOrEqual(2);
      expect(versionReads(first).length).toBeGreaterThanOrEqual(1);
      expect(booksReads(second)).toEqual([]);
      expect(versionReads(second)).toHaveLength(1);
      expect(second.length).toBeGreaterThanOrEqual(4); // session, user, membership, version: the floor was seen
      const uncached = (await withQueries(fresh.db, () => ok(callers.fresh[who].get(url)))).sql;
      expect(booksReads(uncached).length).toBeGreaterThanOrEqual(2);
      expect(versionReads(uncached)).toEqual([]);
    }
  });

  it('requests that arrive together after a write share one read', async () => {
    await ok(callers.fresh.owner.put(`${base}/reports/settings`, { cardFeeBp: 120, cardFeeFixedMinor: 20 }));
    const { value, sql } = await withQueries(cached.db, () => Promise.all([1, 2, 3, 4, 5].map(() => ok(callers.cached.owner.get(`${base}/reports/actuals`)))));
    expect(sql.filter((s) => /from [`"]stages[`"] as [`"]s[`"]/.test(s) && /[`"]t[`"]\.[`"]minutes[`"]/.test(s))).toHaveLength(1);
    for (const r of value) expect(r.body).toEqual(value[0].body);
    expect(value[0].body).toEqual((await ok(callers.fresh.owner.get(`${base}/reports/actuals`))).body);
  });

  it('never answers one studio with another studio’s books, even at the same version', async () => {
    await cached.db('studios').whereIn('id', [a.studioId, b.studioId]).update({ schedule_version: 4242, books_version: 4242 });
    for (const path of ['reports/earnings', 'reports/actuals', 'dashboard']) {
      const mine = (await ok(callers.cached.owner.get(`${base}/${path}`))).body;
      const theirs = (await ok(callers.cached.otherOwner.get(`/api/studios/${b.studioId}/${path}`))).body;
      expect(theirs).toEqual((await ok(callers.fresh.otherOwner.get(`/api/studios/${b.studioId}/${path}`))).body);
      expect(mine).toEqual((await ok(callers.fresh.owner.get(`${base}/${path}`))).body);
      expect(theirs).not.toEqual(mine);
    }
  });
});
