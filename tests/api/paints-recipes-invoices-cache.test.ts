import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createListsVersionTriggers, dropListsVersionTriggers, listsVersionTriggers } from '../../migrations/20270207120000-lists-version';
import { idOf, signInAs, startTestApp, withQueries, type Caller, type TestApp } from '../support/app';
import { afterEachWrite, bothClocks, isFloorRead, ok } from '../support/kept-reads';
import { acceptedQuote, commission, invoicesOf, moneyStudios, type Side } from './money-flow';

// The paint rack, its CSV, the recipe list, the invoice list and the invoices' CSV are kept in memory per
// studio, lists version and query (server/features/paints/paints.service.ts, recipes/recipes.service.ts,
// invoices/invoices.service.ts; studios.lists_version, moved by migrations/20270207120000-lists-version.ts).
// Two app instances share one database (one SQLite file, or one PostgreSQL database with DATABASE_URL), as
// docs/scaling.md runs them: every write goes through either one or straight to the database; the answers of
// `cached` (caches on) answers are compared with those of `fresh`, whose lists caches are off
// (listsCacheRows: 0), so its answers are read from the database every time. After each
// kind of write the lists read, the cached answers must be the fresh ones, and something else than before
// (else the write proved nothing). Every trigger has a write straight to the database that only it sees, and
// with that trigger dropped the cached answer stays as it was: no trigger can go without a test failing.

let cached: TestApp;
let fresh: TestApp;
const { at, advance } = bothClocks(() => [cached, fresh]);
let a: Side;
let b: Side;
let base: string;
const ids: Record<string, number> = {};

const recipeShapes = ['', '?limit=1&offset=1', '?q=marsh'];
const paintShapes = ['', '?limit=2&offset=1', '?type=layer', '?stock=short', '?q=bone'];
const invoiceShapes = () => ['', '?status=open', '?limit=1&offset=1', '?q=marsh', `?commissionId=${ids.first}`, '?kind=deposit'];
const clientInvoiceShapes = ['', '?limit=1'];
const exportShapes = ['', '?from=2026-03-30&to=2026-03-31', '?to=2026-03-29'];

type Role = 'owner' | 'painter' | 'client';
/** Each studio's people signed in on each instance. */
const callers = { cached: {}, fresh: {} } as Record<'cached' | 'fresh', Record<'a' | 'b', Record<Role, Caller>>>;

/** Every list of studio A (owner, painter and client) and of studio B, from one instance. */
async function lists(on: 'cached' | 'fresh') {
  const out: Record<string, unknown> = {};
  for (const s of [a, b]) {
    const S = `/api/studios/${s.studioId}`;
    const tag = s === a ? 'a' : 'b';
    const c = callers[on][tag];
    const page = async (who: Caller, url: string) => {
      const r = await ok(who.get(url));
      return { items: r.body, total: Number(r.headers['x-total-count']) };
    };
    for (const q of recipeShapes) out[`${tag} recipes${q}`] = await page(c.painter, `${S}/recipes${q}`);
    for (const q of paintShapes) out[`${tag} paints${q}`] = await page(c.owner, `${S}/paints${q}`);
    out[`${tag} paints csv`] = (await ok(c.owner.get(`${S}/paints/export`))).text;
    for (const q of invoiceShapes()) out[`${tag} invoices${q}`] = (await ok(c.owner.get(`${S}/invoices${q}`))).body;
    for (const q of clientInvoiceShapes) out[`${tag} client invoices${q}`] = (await ok(c.client.get(`${S}/invoices${q}`))).body;
    for (const q of exportShapes) out[`${tag} invoices csv${q}`] = (await ok(c.owner.get(`${S}/invoices/export.csv${q}`))).text;
  }
  return out;
}

/** Reads everything on the cached instance, moves the clocks on a minute (so `updated_at` is new), writes, compares. */
const afterWrite = afterEachWrite(lists, () => advance(60_000));

const now = () => cached.clock.now().toISOString();
let renames = 0;
const insertId = async (table: string, row: Record<string, unknown>) => idOf((await cached.db(table).insert(row).returning('id'))[0]);

/**
 * Writes straight to the database, one per trigger, each seen by that trigger alone (so with it dropped the
 * kept answers stay as they were). In order: each delete removes what its insert added.
 */
const straight: Record<string, () => Promise<unknown>> = {
  lists_version_paints_insert: async () =>
    (ids.sqlPaint = await insertId('paints', { studio_id: a.studioId, name: 'Straight ochre', type: 'layer', hex: '#C8902E', stock: 2, match_key: 'straight ochre|', created_at: now(), updated_at: now() })),
  lists_version_paints_update: () => cached.db('paints').where({ id: ids.sqlPaint }).update({ stock: 0 }),
  lists_version_paints_delete: () => cached.db('paints').where({ id: ids.sqlPaint }).delete(),
  lists_version_recipes_insert: async () => (ids.sqlRecipe = await insertId('recipes', { studio_id: a.studioId, name: 'Straight glaze', created_at: now(), updated_at: now() })),
  lists_version_recipes_update: () => cached.db('recipes').where({ id: ids.sqlRecipe }).update({ name: 'Straight marsh glaze' }),
  lists_version_recipes_delete: () => cached.db('recipes').where({ id: ids.sqlRecipe }).delete(),
  lists_version_recipe_steps_insert: async () =>
    (ids.sqlStep = await insertId('recipe_steps', { studio_id: a.studioId, recipe_id: ids.recipe, position: 9, technique: 'glaze', airbrush: false })),
  lists_version_recipe_steps_update: () => cached.db('recipe_steps').where({ id: ids.sqlStep }).update({ technique: 'drybrush' }),
  lists_version_recipe_steps_delete: () => cached.db('recipe_steps').where({ id: ids.sqlStep }).delete(),
  lists_version_recipe_step_paints_insert: async () =>
    (ids.sqlStepPaint = await insertId('recipe_step_paints', { studio_id: a.studioId, step_id: ids.mixStep, paint_id: ids.bone, position: 5, parts: 1 })),
  lists_version_recipe_step_paints_update: () => cached.db('recipe_step_paints').where({ id: ids.sqlStepPaint }).update({ parts: 4 }),
  lists_version_recipe_step_paints_delete: () => cached.db('recipe_step_paints').where({ id: ids.sqlStepPaint }).delete(),
  lists_version_schemes_insert: async () =>
    (ids.sqlScheme = await insertId('schemes', { studio_id: a.studioId, commission_id: ids.first, area: 'Straight cloak', recipe_id: ids.recipe, position: 7, created_at: now(), updated_at: now() })),
  lists_version_schemes_update: () => cached.db('schemes').where({ id: ids.sqlScheme }).update({ recipe_id: ids.recipe2 }),
  lists_version_schemes_delete: () => cached.db('schemes').where({ id: ids.sqlScheme }).delete(),
  lists_version_invoices_insert: async () =>
    (ids.sqlInvoice = await insertId('invoices', {
      studio_id: a.studioId,
      commission_id: ids.first,
      client_id: a.clientId,
      kind: 'custom',
      status: 'draft',
      currency: 'EUR',
      lines_json: JSON.stringify([{ description: 'Straight line', quantity: 1, unitMinor: 700, amountMinor: 700, taxBp: 0 }]),
      tax_inclusive: true,
      tax_label: 'VAT',
      subtotal: 700,
      tax: 0,
      total: 700,
      created_at: now(),
      updated_at: now(),
    })),
  lists_version_invoices_update: () => cached.db('invoices').where({ id: ids.sqlInvoice }).update({ note: 'Straight note' }),
  lists_version_invoices_delete: () => cached.db('invoices').where({ id: ids.sqlInvoice }).delete(),
  lists_version_invoice_payments_insert: async () =>
    (ids.sqlPayment = await insertId('invoice_payments', { studio_id: a.studioId, invoice_id: ids.deposit, method: 'bank', amount: 100, received_at: now(), reference: 'Straight transfer', created_at: now() })),
  lists_version_invoice_payments_update: () => cached.db('invoice_payments').where({ id: ids.sqlPayment }).update({ reference: 'Straight transfer, corrected' }),
  lists_version_invoice_payments_delete: () => cached.db('invoice_payments').where({ id: ids.sqlPayment }).delete(),
  lists_version_payment_events_insert: () =>
    cached.db('payment_events').insert({ id: 'evt_straight', type: 'checkout.completed', studio_id: a.studioId, invoice_id: ids.deposit, session_id: 'cs_straight', outcome: 'flagged', reason: 'No checkout of this session.', payload: '{}', received_at: now() }),
  lists_version_payment_events_update: () => cached.db('payment_events').where({ id: 'evt_straight' }).update({ reason: 'Amount does not match.' }),
  lists_version_payment_events_delete: () => cached.db('payment_events').where({ id: 'evt_straight' }).delete(),
  lists_version_commissions_update: () => cached.db('commissions').where({ id: ids.first }).update({ title: `Marsh wardens, renamed ${++renames}` }),
  lists_version_clients_update: () => cached.db('clients').where({ id: a.clientId }).update({ name: `Client A, renamed ${++renames}` }),
};

beforeAll(async () => {
  cached = await startTestApp();
  fresh = await startTestApp({ dataDir: cached.dataDir, listsCacheRows: 0 });
  // Monday 30 March 2026, 12:00 in Berlin.
  at('2026-03-30T10:00:00.000Z');
  ({ a, b } = await moneyStudios(cached));
  for (const [tag, side] of [['a', a], ['b', b]] as const) {
    callers.cached[tag] = { owner: side.owner, painter: side.painter, client: side.client };
    callers.fresh[tag] = {
      owner: await signInAs(fresh, `owner-${tag}@studio.test`),
      painter: await signInAs(fresh, `painter-${tag}@studio.test`),
      client: await signInAs(fresh, `client-${tag}@studio.test`),
    };
  }
  base = `/api/studios/${a.studioId}`;
  ids.bone = (await ok(a.owner.post(`${base}/paints`, { name: 'Bone white', type: 'layer', hex: '#EEE8D5', stock: 3, lowStockThreshold: 2 }), 201)).body.id;
  ids.green = (await ok(a.owner.post(`${base}/paints`, { name: 'Marsh green', type: 'base', hex: '#2E5E3A', stock: 1, lowStockThreshold: 2 }), 201)).body.id;
  ids.medium = (await ok(a.owner.post(`${base}/paints`, { name: 'Glaze medium', type: 'medium', stock: 0 }), 201)).body.id;
  await ok(b.owner.post(`/api/studios/${b.studioId}/paints`, { name: 'Other studio blue', type: 'base', hex: '#1F3A93' }), 201);
  const recipe = (
    await ok(
      a.painter.post(`${base}/recipes`, {
        name: 'Marsh cloak',
        steps: [
          { technique: 'basecoat', paints: [{ paintId: ids.green, parts: 2 }, { paintId: ids.bone, parts: 1 }] },
          { technique: 'layer', paints: [{ paintId: ids.green }, { paintId: ids.bone }], ladderSteps: 3 },
        ],
      }),
      201,
    )
  ).body;
  ids.recipe = recipe.id;
  ids.mixStep = recipe.steps[0].id;
  ids.recipe2 = (await ok(a.painter.post(`${base}/recipes`, { name: 'Bone trim', steps: [{ technique: 'highlight', paints: [{ paintId: ids.bone }] }] }), 201)).body.id;
  ids.first = (await commission(a, 'Marsh wardens')).id;
  ids.second = (await commission(a, 'Reed skiff')).id;
  await acceptedQuote(a, ids.first);
  ids.deposit = (await invoicesOf(a.owner, a.studioId, ids.first))[0].id;
});

afterAll(async () => {
  await fresh?.stop();
  await cached?.stop();
});

describe('the kept rack, recipes and invoices after each write they read', () => {
  it('answer as a fresh read does from the start', async () => {
    const first = await lists('cached');
    expect(first).toEqual(await lists('fresh'));
    expect(await lists('cached')).toEqual(first);
    expect((first['a recipes'] as { items: unknown[] }).items).toHaveLength(2);
    expect((first['a invoices'] as { items: unknown[] }).items).toHaveLength(1);
  });

  it('paints added, changed (a recipe’s colours with them), imported and removed through either instance', async () => {
    await afterWrite(() => ok(a.owner.post(`${base}/paints`, { name: 'Reed brown', type: 'layer', hex: '#6B4F2A', stock: 0 }), 201));
    const mine = (await ok(a.owner.get(`${base}/paints?q=reed`))).body[0].id as number;
    const freshOwner = await freshCaller('owner-a@studio.test');
    await afterWrite(() => ok(freshOwner.patch(`${base}/paints/${ids.bone}`, { hex: '#F4EEDC' })));
    await afterWrite(() => ok(a.owner.patch(`${base}/paints/${ids.green}`, { stock: 5 })));
    await afterWrite(() => ok(freshOwner.post(`${base}/paints/import`, { csv: 'Name,Type,Colour,Pots in stock\nBone white,Layer,#EEE8D5,4\nSilt grey,Base,#7A7A70,1\n' })));
    await afterWrite(() => ok(a.owner.delete(`${base}/paints/${mine}`), 204));
  });

  it('recipes added, replaced and removed, and a scheme using one', async () => {
    await afterWrite(async () => (ids.recipe3 = (await ok(a.painter.post(`${base}/recipes`, { name: 'Marsh water', steps: [{ technique: 'glaze', paints: [{ paintId: ids.medium }] }] }), 201)).body.id));
    const freshPainter = await freshCaller('painter-a@studio.test');
    await afterWrite(() =>
      ok(freshPainter.put(`${base}/recipes/${ids.recipe3}`, { name: 'Marsh water', steps: [{ technique: 'airbrush', psi: 20, paints: [{ paintId: ids.green }, { paintId: ids.medium, parts: 3 }] }] })),
    );
    const entry = await afterWrite(() => ok(a.owner.post(`${base}/commissions/${ids.first}/scheme`, { area: 'Cloak', recipeId: ids.recipe3 }), 201));
    expect(entry.after).not.toEqual(entry.before);
    const scheme = (await ok(a.owner.get(`${base}/commissions/${ids.first}/scheme`))).body as { entries?: { id: number }[] } | { id: number }[];
    const entryId = (Array.isArray(scheme) ? scheme : (scheme.entries ?? []))[0].id;
    await afterWrite(() => ok(freshPainter.patch(`/api/studios/${a.studioId}/scheme-entries/${entryId}`, { recipeId: ids.recipe2 })));
    await afterWrite(() => ok(a.owner.delete(`/api/studios/${a.studioId}/scheme-entries/${entryId}`)));
    await afterWrite(() => ok(a.painter.delete(`${base}/recipes/${ids.recipe3}`), 204));
  });

  it('invoices drafted, issued, paid, refunded and voided through either instance', async () => {
    const freshOwner = await freshCaller('owner-a@studio.test');
    await afterWrite(() => ok(freshOwner.post(`${base}/invoices/${ids.deposit}/payments`, { method: 'bank', amountMinor: 5000 })));
    await afterWrite(() => ok(a.owner.post(`${base}/invoices/${ids.deposit}/refunds`, { amountMinor: 1000, reason: 'Paid twice by mistake.' })));
    const draft = await afterWrite(async () => (ids.custom = (await ok(a.owner.post(`${base}/invoices`, { commissionId: ids.first, kind: 'custom', lines: [{ description: 'Display base', quantity: 1, unitMinor: 2500 }], dueDate: '2026-03-30' }), 201)).body.id));
    expect(draft.after).not.toEqual(draft.before);
    await afterWrite(() => ok(freshOwner.post(`${base}/invoices/${ids.custom}/issue`)));
    const progress = (await ok(freshOwner.post(`${base}/invoices`, { commissionId: ids.second, kind: 'progress', lines: [{ description: 'Half way', quantity: 1, unitMinor: 4000 }] }), 201)).body;
    await afterWrite(() => ok(a.owner.post(`${base}/invoices/${progress.id}/issue`)));
    await afterWrite(() => ok(freshOwner.post(`${base}/invoices/${progress.id}/void`)));
  });

  it('a client and a commission renamed through the API', async () => {
    await afterWrite(() => ok(a.owner.patch(`${base}/clients/${a.clientId}`, { name: 'Client A of the marsh' })));
    await afterWrite(() => ok(a.owner.patch(`${base}/commissions/${ids.second}`, { title: 'Reed skiff, marsh' })));
  });

  it('each trigger: a write straight to the database that only it sees', async () => {
    expect(Object.keys(straight).sort()).toEqual(listsVersionTriggers().map((t) => t.name).sort());
    for (const [trigger, write] of Object.entries(straight)) {
      const { after } = await afterWrite(write).catch((err: Error) => {
        throw new Error(`${trigger}: ${err.message}`);
      });
      expect(after, trigger).toBeDefined();
    }
  }, 120_000);

  it('with any one trigger dropped, its write leaves the kept answers as they were', async () => {
    const db = cached.db;
    const isPg = db.client.config.client === 'pg';
    try {
      const tables = new Map(listsVersionTriggers().map((t) => [t.name, t.table]));
      // In the writes' order: each delete finds what its insert added.
      for (const t of Object.keys(straight).map((name) => ({ name, table: tables.get(name)! }))) {
        const before = await lists('cached');
        await db.raw(isPg ? `drop trigger ${t.name} on ${t.table}` : `drop trigger ${t.name}`);
        advance(60_000);
        await straight[t.name]();
        expect(await lists('cached'), t.name).toEqual(before);
        expect(await lists('fresh'), t.name).not.toEqual(before);
        await dropListsVersionTriggers(db);
        await createListsVersionTriggers(db);
        // Any later write moves the version again, and the kept answers with it.
        await db('studios').where({ id: a.studioId }).increment('lists_version', 1);
        expect(await lists('cached')).toEqual(await lists('fresh'));
      }
    } finally {
      await dropListsVersionTriggers(db);
      await createListsVersionTriggers(db);
    }
    // 26 rounds of reading every list on both sides: about 15 s on SQLite, longer on PostgreSQL.
  }, 180_000);

  it('the clock moving across the day an invoice falls due, with no write', async () => {
    const due = ids.custom;
    await cached.db('invoices').where({ id: due }).update({ due_date: '2026-04-01' });
    // 23:59 on Wednesday 1 April in Berlin (UTC+2), then 00:01 on the 2nd: the invoice due the 1st is overdue.
    at('2026-04-01T21:59:00.000Z');
    const day = await lists('cached');
    expect(day).toEqual(await lists('fresh'));
    at('2026-04-01T22:01:00.000Z');
    const next = await lists('cached');
    expect(next).toEqual(await lists('fresh'));
    const overdue = (l: Record<string, unknown>) => (l['a invoices'] as { items: { id: number; overdue: boolean }[] }).items.find((i) => i.id === due)!.overdue;
    expect([overdue(day), overdue(next)]).toEqual([false, true]);
    // And back (two machines' clocks may disagree): not overdue again.
    at('2026-04-01T21:59:30.000Z');
    const again = await lists('cached');
    expect(again).toEqual(await lists('fresh'));
    expect(overdue(again)).toBe(false);
  });

  it('a change of the studio’s zone, with no other write', async () => {
    // The CSV's days are the studio's: an invoice issued at 22:30 UTC on 29 March is on the 30th in Berlin (UTC+2), the 29th in London (UTC+1).
    await cached.db('invoices').where({ id: ids.custom }).update({ issued_at: '2026-03-29T22:30:00.000Z' });
    const berlin = await lists('cached');
    expect(berlin).toEqual(await lists('fresh'));
    await cached.db('studios').where({ id: a.studioId }).update({ timezone: 'Europe/London' });
    const london = await lists('cached');
    expect(london).toEqual(await lists('fresh'));
    expect(london['a invoices csv?to=2026-03-29']).not.toEqual(berlin['a invoices csv?to=2026-03-29']);
  });
});

const versionReads = (sql: string[]) => sql.filter((s) => /lists_version/.test(s));
const listReads = (sql: string[]) => sql.filter((s) => !/lists_version/.test(s) && !isFloorRead(s));

describe('reading unchanged lists', () => {
  it('the second identical request reads the version and nothing else', async () => {
    for (const url of [`${base}/recipes`, `${base}/paints?limit=2`, `${base}/paints/export`, `${base}/invoices`, `${base}/invoices/export.csv`]) {
      const c = url.includes('recipes') ? a.painter : a.owner;
      await ok(c.get(url));
      const again = await withQueries(cached.db, () => ok(c.get(url)));
      expect(versionReads(again.sql), url).toHaveLength(1);
      expect(listReads(again.sql), url).toEqual([]);
    }
  });

  it('never answers one studio with another studio’s lists, nor the owner with a client’s', async () => {
    const mine = (await ok(a.owner.get(`${base}/paints`))).body;
    const theirs = (await ok(b.owner.get(`/api/studios/${b.studioId}/paints`))).body;
    expect(theirs).not.toEqual(mine);
    expect(theirs.map((p: { name: string }) => p.name)).toEqual(['Other studio blue']);
    await ok(a.owner.post(`${base}/invoices`, { commissionId: ids.first, kind: 'custom', lines: [{ description: 'Not issued yet', quantity: 1, unitMinor: 900 }] }), 201);
    const owners = (await ok(a.owner.get(`${base}/invoices`))).body;
    const clients = (await ok(a.client.get(`${base}/invoices`))).body;
    expect(clients.total).toBeLessThan(owners.total);
    expect(await ok(a.owner.get(`${base}/invoices`)).then((r) => r.body)).toEqual(owners);
  });
});

const freshCaller = (email: string) => signInAs(fresh, email);
