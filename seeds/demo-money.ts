import { DAY, HOUR, type Clock } from '../server/lib/clock';
import type { Payments } from '../server/lib/payments/index';
import { activityRepository } from '../server/features/activity/activity.repository';
import { activityService } from '../server/features/activity/activity.service';
import { commissionsRepository } from '../server/features/commissions/commissions.repository';
import { commissionsService } from '../server/features/commissions/commissions.service';
import { figuresRepository } from '../server/features/figures/figures.repository';
import { figuresService } from '../server/features/figures/figures.service';
import { invoicesRepository } from '../server/features/invoices/invoices.repository';
import { invoicesService } from '../server/features/invoices/invoices.service';
import { priceTableRepository } from '../server/features/price-table/price-table.repository';
import { priceTableService } from '../server/features/price-table/price-table.service';
import { quotesRepository } from '../server/features/quotes/quotes.repository';
import { quotesService, type Actor } from '../server/features/quotes/quotes.service';
import { studioSetupRepository } from '../server/features/studio-setup/studio-setup.repository';
import { studioSetupService } from '../server/features/studio-setup/studio-setup.service';
import { defaultPriceTable, type PriceTable } from '../shared/schemas/price-table';
import type { DemoContext } from './demo';

/** The demo records money by hand (bank transfers, cash); it never calls the payment service. */
const noPayments = new Proxy({} as Payments, {
  get: (_t, key) => (key === 'mode' ? 'fake' : () => Promise.reject(new Error('The demo scenario does not call the payment service'))),
});
/** Demo mail would only fill the local inbox with messages nobody asked for. */
const noMail = { enqueue: async () => 0, kick: () => undefined };

/** The demo studio's prices: invented figures in EUR with German-style VAT included in the prices. */
export function demoPriceTable(): PriceTable {
  const t = defaultPriceTable('EUR');
  t.hourlyRate = 2800; // €28.00
  t.tax = { rateBp: 1900, label: 'VAT', pricesIncludeTax: true, taxId: 'DEMO-VAT-0042' };
  t.materialsPerFigure = 150;
  t.minimumOrder = 6000;
  t.depositBp = 4000;
  t.discounts = [
    { minTotal: 60000, bp: 500 },
    { minTotal: 150000, bp: 1000 },
  ];
  t.presetLines = [
    { key: 'shipping', label: 'Tracked, insured parcel', kind: 'shipping', amount: 1490, taxable: true },
    { key: 'insurance', label: 'Extra insurance above €500', kind: 'insurance', amount: 900, taxable: false },
    { key: 'models', label: 'Models bought for you', kind: 'models', amount: 0, taxable: true },
  ];
  return t;
}

/**
 * The money side of the demo studio: a filled price table, quotes in every state (draft, sent, accepted,
 * changes asked, declined, expired, replaced) and paid, part-paid, open and overdue invoices for the demo
 * commissions. Runs after the commissions step through the real services on a clock of its own that walks
 * the weeks before the demo's "now"; the commissions' statuses are left as that step made them.
 */
export async function moneyDemo(ctx: DemoContext) {
  const { db, studioId, users, clients } = ctx;
  const end = ctx.clock.now().getTime();
  let t = end;
  const clock: Clock = { now: () => new Date(t) };
  const on = (days: number, hours = 0) => {
    t = end - days * DAY + hours * HOUR;
  };

  const setup = studioSetupService({ db, repo: studioSetupRepository(db) });
  const activity = activityService({ repo: activityRepository(db), clock });
  const figures = figuresService({ db, repo: figuresRepository(db), setup, activity, clock });
  const commissions = commissionsService({ db, repo: commissionsRepository(db), figures, activity, clock });
  const priceTables = priceTableService({ db, repo: priceTableRepository(db), clock });
  const quotesRepo = quotesRepository(db);
  const invoices = invoicesService({
    db,
    repo: invoicesRepository(db),
    payments: noPayments,
    mailer: noMail,
    clock,
    publicUrl: 'http://localhost',
    priceTable: (s, trx) => priceTables.get(s, trx),
    acceptedQuote: (s, c, trx) => quotesRepo.accepted(s, c, trx),
    bookCommission: async (trx, by, id) => {
      await commissions.bookIfQuoted(trx, by, id);
    },
    cancelCommission: (actor, id, reason) => commissions.transition(actor, id, { to: 'cancelled', reason }),
  });
  const quotes = quotesService({
    db,
    repo: quotesRepo,
    priceTables,
    invoices,
    activity,
    mailer: noMail,
    clock,
    publicUrl: 'http://localhost',
    figuresOf: async (s, c, trx) => (await figures.views(s, { commissionIds: [c] }, false, trx)).figures,
    setStageEstimates: (trx, s, f, m) => figures.setStageEstimates(trx, s, f, m),
    moveCommission: (trx, by, c, to) => commissions.transitionIn(trx, by, c, to),
  });

  const owner: Actor = { studioId, role: 'owner', clientId: null, userId: users.owner };
  const priya = { actor: { studioId, role: 'client', clientId: clients.client, userId: users.client } as Actor, person: { id: users.client, name: 'Priya Castellane' } };
  const otto = { actor: { studioId, role: 'client', clientId: clients.client2, userId: users.client2 } as Actor, person: { id: users.client2, name: 'Otto Brandvold' } };

  const byTitle = new Map(((await db('commissions').where({ studio_id: studioId }).select('id', 'title')) as { id: number; title: string }[]).map((c) => [c.title, c.id]));
  const id = (title: string) => {
    const v = byTitle.get(title);
    if (!v) throw new Error(`The money demo expects the commission "${title}" from the commissions step`);
    return v;
  };
  const send = async (commissionId: number, body: Parameters<typeof quotes.create>[2] = {}) => {
    const q = await quotes.create(owner, commissionId, body);
    return quotes.send(owner, q.id);
  };
  const accept = (who: typeof priya, quoteId: number, name: string) => quotes.accept(who.actor, who.person, quoteId, { name, acceptTerms: true }, '192.0.2.10');
  const invoicesOf = async (commissionId: number) => (await invoices.list(owner, { commissionId, limit: 50, offset: 0 })).items;
  const pay = async (invoiceId: number, amountMinor: number, method: 'bank' | 'cash', reference?: string) => invoices.recordManualPayment(owner, invoiceId, { method, amountMinor, reference });
  const depositOf = async (commissionId: number) => (await invoicesOf(commissionId)).find((i) => i.kind === 'deposit')!;
  const shipping = [{ id: null, kind: 'shipping' as const, label: 'Tracked, insured parcel', quantity: 1, unitAmount: 1490, taxable: true }];

  // The price table, filled in a few days before the oldest commission.
  on(45);
  const table = demoPriceTable();
  await priceTables.put(studioId, users.owner, table);

  // Priya's warband (on the bench): version 1 replaced by version 2 before she accepted it; deposit paid;
  // now a version 3 with display plinths, on which she has asked for changes; models bought for her, overdue.
  on(39);
  const warband = id('Bog-lantern goblin warband');
  await send(warband);
  on(38, 4);
  const wv2 = await send(warband, { extraLines: shipping });
  on(38, 9);
  await accept(priya, wv2.id, 'Priya Castellane');
  on(37);
  const wd = await depositOf(warband);
  await pay(wd.id, wd.total, 'bank', 'Transfer PC-0412');
  on(25);
  const models = await invoices.create(owner, { commissionId: warband, kind: 'custom', lines: [{ description: 'Models bought for you: six more bog goblins (second-hand, unpainted)', quantity: 1, unitMinor: 3800 }] });
  await invoices.issue(owner, models.id);
  on(5);
  const wv3 = await send(warband, { extraLines: [...shipping, { id: null, kind: 'custom', label: 'Lantern-glow display plinths (3)', quantity: 3, unitAmount: 2400, taxable: true }] });
  on(4);
  await quotes.requestChanges(priya.actor, priya.person, wv3.id, { comment: 'Could the plinths match the fen troll’s base, peat and reeds rather than stone?' });

  // Otto's militia (booked): accepted, deposit paid.
  on(30);
  const militia = id('Saltmarsh militia for the spring tournament');
  const mq = await send(militia, { extraLines: shipping });
  on(29);
  await accept(otto, mq.id, 'Otto Brandvold');
  on(27);
  const md = await depositOf(militia);
  await pay(md.id, md.total, 'bank', 'Otto B. militia');
  // A dearer version with display bases for the banner bearer, which Otto turned down.
  on(10);
  const militiaFigures = await figures.views(studioId, { commissionIds: [militia] }, false);
  const mv2 = await send(militia, { extraLines: shipping, figureOverrides: [{ figureId: militiaFigures.figures[1].id, stageHours: { basing: 1.5 } }] });
  on(9);
  await quotes.decline(otto.actor, otto.person, mv2.id, { comment: 'Thanks, but the tournament bases are fine; keep the first version.' });

  // Otto's war-sledge (ready to ship): deposit paid; the balance invoiced when it was finished, still open.
  on(34);
  const sledge = id('Driftwood war-sledge');
  const sq = await send(sledge, { extraLines: shipping });
  on(34, 2);
  await accept(otto, sq.id, 'Otto Brandvold');
  on(33);
  const sd = await depositOf(sledge);
  await pay(sd.id, sd.total, 'bank', 'Otto B. sledge');
  on(4);
  await db.transaction((trx) => invoices.issueBalance(trx, { studioId, userId: users.owner }, sledge));

  // Otto's gull riders (on hold): deposit half paid in cash at a games evening; a cheaper version sent since.
  on(28);
  const riders = id('Gull-rider skirmishers');
  const rq = await send(riders);
  on(28, 5);
  await accept(otto, rq.id, 'Otto Brandvold');
  on(26);
  const rd = await depositOf(riders);
  await pay(rd.id, Math.floor(rd.total / 2), 'cash', 'Paid at the club night');
  on(11);
  const riderFigures = await figures.views(studioId, { commissionIds: [riders] }, false);
  await send(riders, { figureOverrides: [{ figureId: riderFigures.figures[0].id, omitStages: ['weathering'] }] });

  // Priya's heron-knight (an enquiry): a draft the owner is still working on.
  on(5);
  await quotes.create(owner, id('Heron-knight of the Reedmarch'), { extraLines: shipping });

  // Mara's bust (quoted): sent with the studio's short validity of the time, never answered, expired.
  on(9);
  await priceTables.put(studioId, users.owner, { ...table, quoteValidityDays: 7 });
  await send(id('Lichen golem bust'), { extraLines: shipping });
  await priceTables.put(studioId, users.owner, table);

  t = end;
  await quotes.expireDue();
}
