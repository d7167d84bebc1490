import { DAY, HOUR, iso } from '../server/lib/clock';
import { addDays, isoWeek, localDateOf } from '../shared/dates';
import { mulDiv } from '../shared/money';
import { quoteFigures, type FigureQuoteLine } from '../shared/pricing';
import { defaultPriceTable, priceTable, type PriceTable } from '../shared/schemas/price-table';
import type { DemoContext } from './demo';

const MINUTE = 60_000;

// mulberry32: a fixed-seed generator, so the demo's logged times are the same on every start.
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

type Fig = { name: string; quantity: number; sizeClass: string; tier: string; extras?: string[]; painter: 'owner' | 'painter' | null };

/**
 * The studio's calendar and books, in two steps. `booksHistoryDemo` (before the money step, so its invoice
 * numbers come first, as their dates do): eight months of finished commissions with their time logged,
 * quotes, deposits and balances, priced with the table the studio had then. `capacityDemo` (after it):
 * when Wren and Tobin work and when they do not, and three more booked commissions so the queue fills the
 * next weeks. Everything is invented. The studio's batches run a little faster than its table assumes (a
 * learning rate of about 0.85 against the table's 0.9), its layering slower and its basecoats quicker, so
 * the books have suggestions to make.
 */
async function demoKit(ctx: DemoContext, opts: { table?: PriceTable } = {}) {
  const { db, studioId, users, clients } = ctx;
  const end = ctx.clock.now().getTime();
  const now = iso(new Date(end));
  const studio = await db('studios').where({ id: studioId }).first('timezone', 'currency');
  const tz: string = studio.timezone;
  const today = localDateOf(end, tz);
  const rand = rng(20260302);
  const idOf = (row: unknown) => (typeof row === 'object' && row !== null ? (row as { id: number }).id : (row as number));
  const insert = async (table: string, row: Record<string, unknown>) => idOf((await db(table).insert(row).returning('id'))[0]);
  const who = (p: Fig['painter']) => (p === null ? null : users[p]);

  // --- the price table and stage template the figures follow -------------------------------------
  const saved = await db('price_tables').where({ studio_id: studioId }).first('table_json');
  const parsed = saved ? priceTable.safeParse(JSON.parse(saved.table_json)) : null;
  const table: PriceTable = opts.table ?? (parsed?.success ? parsed.data : defaultPriceTable(studio.currency));
  const template = (await db('stage_templates').where({ studio_id: studioId }).orderBy('position').select('key', 'name', 'wait_minutes', 'hazards')) as {
    key: string;
    name: string;
    wait_minutes: number;
    hazards: string;
  }[];

  const invoiceNumber = async (at: number) => {
    const year = Number(localDateOf(at, tz).slice(0, 4));
    await db('invoice_counters').insert({ studio_id: studioId, year, last: 0 }).onConflict(['studio_id', 'year']).ignore();
    await db('invoice_counters').where({ studio_id: studioId, year }).increment('last', 1);
    const row = await db('invoice_counters').where({ studio_id: studioId, year }).first('last');
    return `${year}-${String(row.last).padStart(4, '0')}`;
  };

  /** A deposit or balance invoice for part of the quote; its tax is the quote's share, as the invoices feature words it. */
  async function invoice(
    c: { id: number; clientId: number; quoteId: number; result: ReturnType<typeof quoteFigures> },
    kind: 'deposit' | 'balance',
    amount: number,
    issuedAt: number,
    paid: { method: 'card' | 'bank'; at: number } | null,
    dueInDays = 14,
  ) {
    const number = await invoiceNumber(issuedAt);
    const t = iso(new Date(issuedAt));
    const label = kind === 'deposit' ? 'Deposit' : 'Balance';
    const tax = c.result.total > 0 ? mulDiv(amount, c.result.tax.amount, c.result.total) : 0;
    const subtotal = table.tax.pricesIncludeTax ? amount : amount - tax;
    const id = await insert('invoices', {
      studio_id: studioId,
      commission_id: c.id,
      client_id: c.clientId,
      quote_id: c.quoteId,
      kind,
      status: paid ? 'paid' : 'open',
      number,
      currency: table.currency,
      lines_json: JSON.stringify([{ description: label, quantity: 1, unitMinor: subtotal, amountMinor: subtotal, taxBp: table.tax.rateBp }]),
      tax_inclusive: table.tax.pricesIncludeTax,
      tax_label: table.tax.label,
      tax_id: table.tax.taxId,
      subtotal,
      tax,
      total: amount,
      paid: paid ? amount : 0,
      issued_at: t,
      due_date: localDateOf(issuedAt + dueInDays * DAY, tz),
      created_by: users.owner,
      created_at: t,
      updated_at: t,
    });
    if (paid) {
      const at = iso(new Date(paid.at));
      await insert('invoice_payments', { studio_id: studioId, invoice_id: id, method: paid.method, amount, received_at: at, reference: paid.method === 'bank' ? `Transfer ${number}` : null, recorded_by: users.owner, created_at: at });
    }
  }

  /** The accepted quote of a commission's figures, priced by the engine on the table, as sent at `at`. */
  async function acceptQuote(id: number, clientId: number, figs: Omit<Fig, 'painter'>[], at: number) {
    const t = iso(new Date(at));
    const quoteDate = localDateOf(at, tz);
    const figures = figs.map((f) => ({ name: f.name, quantity: f.quantity, sizeClass: f.sizeClass as '28', tier: f.tier, extras: f.extras ?? [] }));
    const result = quoteFigures({ priceTable: table, figures, today: quoteDate, dueDate: null });
    const quoteId = await insert('quotes', {
      studio_id: studioId,
      commission_id: id,
      client_id: clientId,
      version: 1,
      status: 'accepted',
      input_json: JSON.stringify({ figures, extraLines: [], dueDate: null }),
      price_table_json: JSON.stringify(table),
      result_json: JSON.stringify(result),
      currency: table.currency,
      total: result.total,
      deposit: result.deposit.amount,
      balance: result.balance,
      quote_date: quoteDate,
      valid_until: result.validUntil,
      show_hours: false,
      terms: table.terms,
      sent_at: t,
      decided_at: iso(new Date(at + 2 * HOUR)),
      decided_by: null,
      accepted_name: null,
      created_by: users.owner,
      created_at: t,
      updated_at: t,
    });
    return { quoteId, result };
  }

  /** A commission as its accepted quote prices it: figures, stages with the quote's batch minutes, quote, deposit. */
  async function quoted(spec: { title: string; clientId: number; status: string; figures: Fig[]; createdAt: number; dueDate: string | null; brief: string }) {
    const t = iso(new Date(spec.createdAt));
    const id = await insert('commissions', {
      studio_id: studioId,
      client_id: spec.clientId,
      title: spec.title,
      brief: spec.brief,
      due_date: spec.dueDate,
      priority: 'normal',
      status: spec.status,
      created_by: users.owner,
      created_at: t,
      updated_at: t,
    });
    const { quoteId, result } = await acceptQuote(id, spec.clientId, spec.figures, spec.createdAt);
    const lines = result.lines.filter((l): l is FigureQuoteLine => l.type === 'figure');
    const made: { figureId: number; fig: Fig; line: FigureQuoteLine; stages: { id: number; key: string; minutes: number }[] }[] = [];
    for (const [i, fig] of spec.figures.entries()) {
      const line = lines[i];
      const figureId = await insert('figures', {
        studio_id: studioId,
        commission_id: id,
        name: fig.name,
        quantity: fig.quantity,
        size_class: fig.sizeClass,
        footprint: fig.sizeClass === 'large' ? '120 × 80 mm' : null,
        tier: fig.tier,
        extras: JSON.stringify(fig.extras ?? []),
        sub_assemblies: '[]',
        painter_id: who(fig.painter),
        position: i + 1,
        created_at: t,
        updated_at: t,
      });
      const stages: { id: number; key: string; minutes: number }[] = [];
      for (const [p, s] of template.entries()) {
        const minutes = line.batchStageMinutes[s.key] ?? 0;
        const sid = await insert('stages', {
          studio_id: studioId,
          commission_id: id,
          figure_id: figureId,
          template_key: s.key,
          name: s.name,
          position: p + 1,
          status: minutes > 0 ? 'todo' : 'skipped',
          estimate_minutes: minutes,
          wait_minutes: s.wait_minutes,
          hazards: s.hazards,
          updated_at: t,
        });
        stages.push({ id: sid, key: s.key, minutes });
      }
      made.push({ figureId, fig, line, stages });
    }
    await invoice({ id, clientId: spec.clientId, quoteId, result }, 'deposit', result.deposit.amount, spec.createdAt + 2 * HOUR, { method: 'card', at: spec.createdAt + 5 * HOUR });
    return { id, quoteId, result, made };
  }

  // How this studio really works against its table (invented): basecoats quicker, layering slower.
  const pace: Record<string, number> = { basecoat: 0.85, layer: 1.3, details: 1.1, prep: 1.0 };
  const realRate = 0.85;

  /** Every stage done between `from` and `to` (ms), its time logged by the figure's painter. */
  async function workThrough(c: Awaited<ReturnType<typeof quoted>>, from: number, to: number) {
    const all = c.made.flatMap((m) => m.stages.filter((s) => s.minutes > 0).map((s) => ({ m, s })));
    for (const [k, { m, s }] of all.entries()) {
      const doneAt = Math.round(from + ((to - from) * (k + 1)) / (all.length + 1));
      const unit = m.line.unitStageMinutes[s.key] ?? 0;
      const batch = unit * m.fig.quantity ** (1 + Math.log2(realRate));
      const logged = Math.max(3, Math.round(batch * (pace[s.key] ?? 1.05) * (0.92 + rand() * 0.16)));
      const userId = who(m.fig.painter) ?? users.painter;
      const at = iso(new Date(doneAt));
      await db('stages').where({ id: s.id }).update({ status: 'done', done_by: userId, done_at: at, updated_at: at });
      await insert('time_entries', {
        studio_id: studioId,
        commission_id: c.id,
        figure_id: m.figureId,
        stage_id: s.id,
        user_id: userId,
        source: 'manual',
        started_at: iso(new Date(doneAt - logged * MINUTE)),
        ended_at: at,
        minutes: logged,
        created_at: at,
        updated_at: at,
      });
    }
  }

  return { db, studioId, users, clients, end, now, tz, today, rand, insert, quoted, workThrough, invoice, table };
}

/** The studio's prices before the current table (invented): the default table with VAT included at 19 %. */
function earlierTable(currency: string): PriceTable {
  const t = defaultPriceTable(currency);
  t.tax = { rateBp: 1900, label: 'VAT', pricesIncludeTax: true, taxId: '' };
  return t;
}

export async function capacityDemo(ctx: DemoContext) {
  const { db, studioId, users, clients, end, now, tz, today, quoted } = await demoKit(ctx);

  // --- working hours, days off, closed days ----------------------------------------------------
  const range = (start: string, endAt: string) => ({ start_time: start, end_time: endAt });
  const hours: (readonly [number, number, { start_time: string; end_time: string }])[] = [
    // Tobin: four long days with a lunch break and a short Friday (32 h).
    ...[1, 2, 3, 4].flatMap((d) => [[users.painter, d, range('08:30', '12:30')] as const, [users.painter, d, range('13:15', '16:15')] as const]),
    [users.painter, 5, range('08:30', '12:30')],
    // Wren paints every weekday until mid-afternoon and runs the studio after that (30 h).
    ...[1, 2, 3, 4, 5].map((d) => [users.owner, d, range('09:00', '15:00')] as const),
  ];
  await db('capacity_hours').insert(hours.map(([user_id, weekday, r]) => ({ studio_id: studioId, user_id, weekday, ...r, updated_at: now })));
  const nextMonday = addDays(today, 8 - isoWeek(today).weekday);
  await db('capacity_days_off').insert([
    { studio_id: studioId, user_id: users.painter, kind: 'holiday', date_from: addDays(nextMonday, 21), date_to: addDays(nextMonday, 25), note: 'Walking the coast path', created_by: users.owner, created_at: now },
    { studio_id: studioId, user_id: users.owner, kind: 'day_off', date_from: addDays(nextMonday, 9), date_to: addDays(nextMonday, 9), note: 'Games fair in the next town', created_by: users.owner, created_at: now },
    { studio_id: studioId, user_id: null, kind: 'closed', date_from: addDays(nextMonday, 17), date_to: addDays(nextMonday, 17), note: 'Local holiday: the bakery street fair', created_by: users.owner, created_at: now },
  ]);
  // Card payments: the owner's own figures for their payment service (invented, not any service's price list).
  await db('books_settings').insert({ studio_id: studioId, card_fee_bp: 150, card_fee_fixed: 25, updated_at: now }).onConflict('studio_id').merge();

  // --- the queue for the coming weeks ----------------------------------------------------------------
  const due = (days: number) => localDateOf(end + days * DAY, tz);
  const skiff = await quoted({
    title: 'Tidewrack skiff and crew',
    clientId: clients.client2,
    status: 'booked',
    createdAt: end - 3 * DAY,
    dueDate: due(18),
    brief: 'A river skiff with three crew, needed for a campaign weekend.',
    figures: [
      { name: 'Tidewrack skiff', quantity: 1, sizeClass: 'large', tier: 'tabletop', extras: ['assembly'], painter: null },
      { name: 'Skiff crew', quantity: 3, sizeClass: '28', tier: 'tabletop', painter: 'painter' },
    ],
  });
  const lancers = await quoted({
    title: 'Reedmarch heron lancers',
    clientId: clients.client,
    status: 'booked',
    createdAt: end - 2 * DAY,
    dueDate: due(60),
    brief: 'Eight lancers on herons to go with the heron-knight.',
    figures: [{ name: 'Heron lancers', quantity: 8, sizeClass: '40', tier: 'enhanced', extras: ['magnetising'], painter: 'painter' }],
  });
  const bats = await quoted({
    title: 'Sootwing bat swarm',
    clientId: clients.walkIn,
    status: 'booked',
    createdAt: end - 1 * DAY,
    dueDate: due(42),
    brief: 'Six bats on flying stands; whoever is free may paint them.',
    figures: [{ name: 'Sootwing bats', quantity: 6, sizeClass: '25', tier: 'tabletop', painter: null }],
  });

  // Queue order: the warband on the bench first, then the tournament militia (due soonest), the skiff,
  // the bats and the lancers; anything else already booked follows.
  const queued = (await db('commissions').where({ studio_id: studioId }).whereIn('status', ['booked', 'on_bench']).orderBy('created_at').select('id', 'title', 'status')) as {
    id: number;
    title: string;
    status: string;
  }[];
  const first = queued.filter((c) => c.status === 'on_bench').map((c) => c.id);
  const militia = queued.filter((c) => c.status === 'booked' && ![skiff.id, lancers.id, bats.id].includes(c.id)).map((c) => c.id);
  const order = [...first, ...militia, skiff.id, bats.id, lancers.id];
  for (const [i, id] of order.entries()) await db('commissions').where({ studio_id: studioId, id }).update({ queue_position: i + 1 });
}

export async function booksHistoryDemo(ctx: DemoContext) {
  const studio = await ctx.db('studios').where({ id: ctx.studioId }).first('currency');
  const { clients, end, tz, rand, quoted, workThrough, invoice } = await demoKit(ctx, { table: earlierTable(studio.currency) });
  // --- eight months of finished work ---------------------------------------------------------------
  const history: { title: string; clientId: number; startDaysAgo: number; days: number; figures: Fig[]; brief: string }[] = [
    { title: 'Cinder-wight patrol', clientId: clients.client2, startDaysAgo: 240, days: 26, brief: 'Ten ash-grey wights with ember eyes.', figures: [{ name: 'Cinder wights', quantity: 10, sizeClass: '28', tier: 'tabletop', painter: 'painter' }] },
    { title: 'Marsh-hag coven', clientId: clients.client, startDaysAgo: 205, days: 24, brief: 'Three hags around a cauldron.', figures: [{ name: 'Marsh hags', quantity: 3, sizeClass: '32', tier: 'enhanced', painter: 'painter' }] },
    { title: 'Thornback boar riders', clientId: clients.walkIn, startDaysAgo: 175, days: 30, brief: 'Five riders on armoured boars.', figures: [{ name: 'Boar riders', quantity: 5, sizeClass: '40', tier: 'tabletop', extras: ['magnetising'], painter: 'painter' }] },
    { title: 'Glass-eyed oracle', clientId: clients.client, startDaysAgo: 150, days: 18, brief: 'A display piece with a glowing orb.', figures: [{ name: 'Glass-eyed oracle', quantity: 1, sizeClass: '28', tier: 'display', extras: ['light-effects'], painter: 'owner' }] },
    { title: 'Reed-pike levy', clientId: clients.client2, startDaysAgo: 120, days: 34, brief: 'Twenty pikemen for a league.', figures: [{ name: 'Reed-pike levy', quantity: 20, sizeClass: '25', tier: 'tabletop', painter: 'painter' }, { name: 'Levy captain', quantity: 1, sizeClass: '28', tier: 'tabletop', painter: 'painter' }] },
    { title: 'Ember-salamander', clientId: clients.walkIn, startDaysAgo: 95, days: 16, brief: 'One salamander on a lava base.', figures: [{ name: 'Ember-salamander', quantity: 1, sizeClass: '50', tier: 'enhanced', painter: 'owner' }] },
    { title: 'Weir-keeper wardens', clientId: clients.client, startDaysAgo: 78, days: 22, brief: 'Six wardens in sluice-green cloaks.', figures: [{ name: 'Weir-keeper wardens', quantity: 6, sizeClass: '28', tier: 'enhanced', painter: 'painter' }] },
    { title: 'Ferryman and his lantern', clientId: clients.client2, startDaysAgo: 62, days: 12, brief: 'A small gift piece.', figures: [{ name: 'Ferryman', quantity: 1, sizeClass: '32', tier: 'tabletop', painter: 'painter' }] },
    { title: 'Bramble-imp swarm', clientId: clients.walkIn, startDaysAgo: 55, days: 14, brief: 'Three bases of imps.', figures: [{ name: 'Bramble imps', quantity: 3, sizeClass: '25', tier: 'tabletop', painter: 'painter' }] },
  ];
  for (const h of history) {
    const start = end - h.startDaysAgo * DAY;
    const finish = start + h.days * DAY;
    const c = await quoted({ title: h.title, clientId: h.clientId, status: 'closed', figures: h.figures, createdAt: start, dueDate: localDateOf(finish + 5 * DAY, tz), brief: h.brief });
    await workThrough(c, start + 2 * DAY, finish);
    await invoice({ id: c.id, clientId: h.clientId, quoteId: c.quoteId, result: c.result }, 'balance', c.result.balance, finish, { method: rand() < 0.5 ? 'card' : 'bank', at: finish + 2 * DAY });
    await ctx.db('commissions').where({ id: c.id }).update({ updated_at: iso(new Date(finish + 6 * DAY)) });
  }

}
