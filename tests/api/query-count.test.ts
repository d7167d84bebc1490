import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Caller, startTestApp, twoStudios, withQueries, type TestApp } from '../support/app';
import { images, upload } from '../support/fixtures';

/**
 * Every list endpoint reads a page in a fixed number of SQL queries, however many rows the studio holds:
 * studio A gets 3 of everything, studio B 30, and each list is asked for in both while the Knex 'query'
 * events are counted. The lists are written out by hand below; a last check calls every GET route on the
 * router and fails when one that answers an array or a page ({ items: [...] }) is not among them.
 */

type Role = 'owner' | 'painter' | 'client' | 'anon';
type Answer = { body: unknown; text: string; headers: Record<string, string> };
type ListEndpoint = {
  /** the route as the router lists it */
  route: string;
  as: Role;
  query?: string;
  /** how many rows the answer holds, to check that studio B's answer really is the bigger one */
  rows: (res: Answer) => number;
  /** why the answer cannot grow with the data, when it cannot */
  fixedSize?: string;
  /** tables the list must not read at all (its totals are kept on its own rows), and why */
  readsNone?: { tables: string[]; why: string };
};

/** A page ({ items, total }) or an object with `total` (the board, the timeline). */
const page = (res: Answer) => (res.body as { total: number }).total;
/** A list that answers a bare array: the page's rows in the body, all of them counted in X-Total-Count. */
const array = (res: Answer) => {
  expect(Array.isArray(res.body), 'a bare array').toBe(true);
  return Number(res.headers['x-total-count']);
};
const len = (path: (b: Record<string, unknown>) => unknown) => (res: Answer) => (path(res.body as Record<string, unknown>) as unknown[]).length;
const lines = (res: Answer) => res.text.trim().split('\n').length;
const count = (res: Answer) => (res.body as unknown[]).length;

const keptTotals = { tables: ['stages', 'figures'], why: 'figure and stage totals are columns of the commission row (migrations/20270120120000-commission-totals.ts)' };

const lists: ListEndpoint[] = [
  { route: '/api/studios/:studioId/commissions', as: 'owner', rows: page, readsNone: keptTotals },
  // The client portal: the client's own commissions, quotes, invoices and place in the queue.
  { route: '/api/studios/:studioId/commissions', as: 'client', rows: page, readsNone: keptTotals },
  { route: '/api/studios/:studioId/clients', as: 'owner', rows: page },
  { route: '/api/studios/:studioId/members', as: 'owner', rows: array },
  { route: '/api/studios/:studioId/invitations', as: 'owner', rows: array },
  { route: '/api/studios/:studioId/commissions/:commissionId/activity', as: 'owner', rows: array },
  { route: '/api/studios/:studioId/stages/:stageId/time', as: 'painter', rows: array },
  { route: '/api/studios/:studioId/board', as: 'owner', rows: page },
  { route: '/api/studios/:studioId/board', as: 'painter', rows: page },
  { route: '/api/studios/:studioId/commissions/:commissionId/photos', as: 'owner', rows: array },
  { route: '/api/studios/:studioId/commissions/:commissionId/photos', as: 'client', rows: array },
  { route: '/api/studios/:studioId/commissions/:commissionId/comments', as: 'owner', rows: array },
  { route: '/api/studios/:studioId/commissions/:commissionId/comments', as: 'client', rows: array },
  { route: '/api/studios/:studioId/commissions/:commissionId/approvals', as: 'client', rows: array },
  { route: '/api/studios/:studioId/commissions/:commissionId/scheme', as: 'owner', rows: len((b) => b.entries) },
  { route: '/api/studios/:studioId/commissions/:commissionId/shopping-list', as: 'owner', rows: len((b) => b.restock) },
  {
    route: '/api/studios/:studioId/commissions/:commissionId/shipments',
    as: 'owner',
    rows: count,
    fixedSize: 'a commission has at most one shipment (commission_id is unique in shipments)',
  },
  // The studio's own settings lists: as long as the owner makes them, whatever work the studio holds.
  { route: '/api/studios/:studioId/stage-template', as: 'owner', rows: count, fixedSize: 'the stage template is a setting, not work' },
  { route: '/api/studios/:studioId/hazards', as: 'client', rows: count, fixedSize: 'the hazard texts are a setting, not work' },
  { route: '/api/studios/:studioId/capacity', as: 'owner', rows: len((b) => b.painters) },
  { route: '/api/studios/:studioId/schedule', as: 'owner', rows: page },
  { route: '/api/studios/:studioId/schedule', as: 'client', rows: page },
  { route: '/api/calendar/:token.ics', as: 'anon', rows: (res) => res.text.split('BEGIN:VEVENT').length - 1 },
  { route: '/api/studios/:studioId/dashboard', as: 'owner', rows: (res) => (res.body as { invoices: { unpaid: { count: number } } }).invoices.unpaid.count },
  { route: '/api/studios/:studioId/dashboard', as: 'painter', rows: len((b) => b.weekStages) },
  { route: '/api/studios/:studioId/dashboard', as: 'client', rows: len((b) => b.commissions) },
  { route: '/api/studios/:studioId/reports/actuals', as: 'owner', rows: (res) => (res.body as { doneStages: number }).doneStages },
  { route: '/api/studios/:studioId/reports/earnings', as: 'owner', rows: len((b) => b.commissions) },
  { route: '/api/studios/:studioId/paints', as: 'owner', rows: array },
  { route: '/api/studios/:studioId/paints/export', as: 'owner', rows: lines },
  { route: '/api/studios/:studioId/recipes', as: 'painter', rows: array },
  { route: '/api/studios/:studioId/enquiries', as: 'owner', rows: page },
  { route: '/api/studios/:studioId/quotes', as: 'owner', rows: page },
  { route: '/api/studios/:studioId/quotes', as: 'client', rows: page },
  { route: '/api/studios/:studioId/invoices', as: 'owner', rows: page },
  { route: '/api/studios/:studioId/invoices', as: 'client', rows: page },
  { route: '/api/studios/:studioId/invoices/export.csv', as: 'owner', rows: lines },
  { route: '/api/studios/:studioId/money', as: 'owner', rows: len((b) => b.outstandingByClient) },
];

/** Queries some GET routes need to answer at all, for the shape check. */
const probeQuery: Record<string, string> = {
  '/api/studios/:studioId/schedule/earliest-delivery': 'hours=3',
  '/api/studios/:studioId/paints/nearest': 'hex=336699',
  '/api/studios/:studioId/reference-photos/:referencePhotoId/point': 'x=0.5&y=0.5',
};

/** GET routes this file does not call for their shape, and why. */
const notCalled: Record<string, string> = {
  '/api/invitations/:token': 'needs the secret token of an invitation; answers one invitation',
  '/api/studios/:studioId/photos/:photoId/:size': 'an image file',
  '/api/studios/:studioId/enquiries/:enquiryId/photos/:enquiryPhotoId/:size': 'an image file',
  '/api/studios/:studioId/invoices/:invoiceId/pdf': 'a PDF of one invoice',
};

type Ctx = { studioId: number; callers: Record<Role, Caller>; ids: Record<string, string> };

let sw: TestApp;
let small: Ctx;
let large: Ctx;

function ok<T = Record<string, unknown>>(res: { status: number; body: unknown }, what: string): T {
  if (res.status < 200 || res.status > 299) throw new Error(`${what}: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body as T;
}

/**
 * n of everything in one studio: clients, team members, pending invitations, paints and recipes,
 * enquiries, commissions of the studio's client with two figures each on the bench (one stage done with
 * time logged, a sent quote, an issued invoice, every other one paid in part), and on the first of them
 * n comments, photos, approval rounds, time entries, scheme entries and activity entries.
 */
async function grow(side: Awaited<ReturnType<typeof twoStudios>>['a'], tag: string, n: number): Promise<Ctx> {
  const S = `/api/studios/${side.studioId}`;
  const { owner, painter, client } = side;
  const painterId = ok<{ user: { id: number } }>(await painter.get('/api/auth/me'), 'me').user.id;
  const now = sw.clock.now().toISOString();
  const idOf = (r: unknown) => (typeof r === 'object' && r !== null ? (r as { id: number }).id : (r as number));

  for (let i = 0; i < n; i++) ok(await owner.post(`${S}/clients`, { name: `Grown client ${tag}${i}`, email: `grown-${tag}-${i}@clients.test` }), 'client');
  // Team members straight into the tables: the invitation flow has its own tests.
  for (let i = 0; i < n; i++) {
    const [u] = await sw.db('users').insert({ email: `team-${tag}-${i}@studio.test`, name: `Team ${tag}${i}`, password_hash: 'x', email_notices: false, created_at: now, updated_at: now }).returning('id');
    await sw.db('memberships').insert({ studio_id: side.studioId, user_id: idOf(u), role: 'painter', created_at: now });
  }
  for (let i = 0; i < n; i++) ok(await owner.post(`${S}/invitations`, { email: `pending-${tag}-${i}@studio.test`, role: 'painter' }), 'invitation');

  const paints: number[] = [];
  for (let i = 0; i < n; i++) paints.push(ok<{ id: number }>(await owner.post(`${S}/paints`, { name: `Grown paint ${i}`, type: 'base', hex: `#${(0x102030 + i * 0x050301).toString(16).slice(-6)}`, stock: i % 3 }), 'paint').id);
  const recipes: number[] = [];
  for (let i = 0; i < n; i++) {
    const r = await owner.post(`${S}/recipes`, { name: `Grown recipe ${i}`, steps: [{ technique: 'basecoat', paints: [{ paintId: paints[i] }] }, { technique: 'layer', paints: [{ paintId: paints[(i + 1) % n] }] }] });
    recipes.push(ok<{ id: number }>(r, 'recipe').id);
  }
  for (let i = 0; i < n; i++) {
    const [e] = await sw
      .db('enquiries')
      .insert({ studio_id: side.studioId, status: 'new', name: `Visitor ${i}`, email: `visitor-${tag}-${i}@visitors.test`, extras: '[]', currency: 'EUR', consent_at: now, created_at: now })
      .returning('id');
    await sw.db('enquiry_figures').insert({ studio_id: side.studioId, enquiry_id: idOf(e), position: 1, name: 'Wished figure', quantity: 2, size_class: '28' });
  }

  // Working hours for the painter, so the forecast plans their bench.
  const week = Object.fromEntries(['1', '2', '3', '4', '5'].map((d) => [d, [{ start: '09:00', end: '17:00' }]]));
  ok(await owner.put(`${S}/capacity/painters/${painterId}/hours`, { hours: week }), 'hours');

  // Every other commission is the signed-in client's (their portal grows), the rest go to the grown clients.
  const clientIds = ok<{ items: { id: number }[] }>(await owner.get(`${S}/clients?limit=200`), 'clients').items.map((c) => c.id).filter((id) => id !== side.clientId);
  const commissions: { id: number; stages: number[] }[] = [];
  for (let i = 0; i < n; i++) {
    const c = ok<{ id: number; figures: { stages: { id: number }[] }[] }>(
      await owner.post(`${S}/commissions`, {
        clientId: i % 2 ? clientIds[i] : side.clientId,
        title: `Grown commission ${i}`,
        dueDate: `2027-0${1 + (i % 9)}-1${i % 10}`,
        figures: [
          { name: 'Grown scouts', quantity: 2, sizeClass: '28', tier: 'tabletop', painterId },
          { name: 'Grown captain', quantity: 1, sizeClass: '28', tier: 'tabletop' },
        ],
      }),
      'commission',
    );
    commissions.push({ id: c.id, stages: c.figures.flatMap((f) => f.stages.map((s) => s.id)) });
    const quote = ok<{ id: number }>(await owner.post(`${S}/commissions/${c.id}/quotes`, {}), 'quote');
    ok(await owner.post(`${S}/quotes/${quote.id}/send`), 'send quote'); // the commission is quoted now
    for (const to of ['booked', ...(i % 2 ? ['on_bench'] : [])]) ok(await owner.post(`${S}/commissions/${c.id}/transitions`, { to }), to);
    const invoice = ok<{ id: number }>(await owner.post(`${S}/invoices`, { commissionId: c.id, kind: 'custom', lines: [{ description: 'Grown line', quantity: 1, unitMinor: 5000 + i }] }), 'invoice');
    ok(await owner.post(`${S}/invoices/${invoice.id}/issue`), 'issue');
    if (i % 2 === 0) ok(await owner.post(`${S}/invoices/${invoice.id}/payments`, { method: 'bank', amountMinor: 1000 }), 'payment');
    ok(await painter.patch(`${S}/stages/${commissions[i].stages[0]}`, { status: 'done' }), 'stage done');
    ok(await painter.post(`${S}/stages/${commissions[i].stages[0]}/time`, { hours: 0.5 }), 'time');
  }

  const main = commissions[0];
  for (let i = 0; i < n; i++) {
    ok(await (i % 2 ? client : owner).post(`${S}/commissions/${main.id}/comments`, { body: `Grown comment ${i}` }), 'comment');
    ok(await painter.post(`${S}/stages/${main.stages[1]}/time`, { hours: 0.25 }), 'time');
    ok(await owner.post(`${S}/commissions/${main.id}/scheme`, { area: `Area ${i}`, recipeId: recipes[i] }), 'scheme entry');
    const a = ok<{ id: number }>(await owner.post(`${S}/commissions/${main.id}/approvals`, { subject: 'scheme', note: `Round ${i}` }), 'approval');
    ok(await client.post(`${S}/approvals/${a.id}/request-changes`, { comment: `Change ${i}` }), 'request changes');
  }
  const jpeg = await images.twoTone(48, 32);
  for (let done = 0; done < n; done += 10) {
    const files = Array.from({ length: Math.min(10, n - done) }, (_, k) => ({ data: jpeg, name: `grown-${done + k}.jpg` }));
    ok(await upload(owner, `${S}/commissions/${main.id}/photos`, files, { kind: 'progress', shared: 'true' }), 'photos');
  }
  ok(await owner.post(`${S}/commissions/${main.id}/shipments`, {}), 'shipment');
  ok(await owner.put(`${S}/public-page`, { enabled: true, turnaroundSource: 'text' }), 'public page');
  const feed = ok<{ url: string }>(await painter.post(`${S}/calendar-feed`), 'calendar feed');
  const reference = ok<{ id: number }[]>(await upload(client, `${S}/commissions/${main.id}/photos`, [{ data: jpeg, name: 'ref.jpg' }], { kind: 'reference' }), 'reference');

  const first = async (table: string) => String((await sw.db(table).where({ studio_id: side.studioId }).orderBy('id').first('id')).id);
  const anon = new Caller(sw.app);
  return {
    studioId: side.studioId,
    callers: { owner, painter, client, anon },
    ids: {
      studioId: String(side.studioId),
      commissionId: String(main.id),
      stageId: String(main.stages[1]),
      clientId: String(side.clientId),
      photoId: await first('photos'),
      size: 'thumb',
      paintId: String(paints[0]),
      recipeId: String(recipes[0]),
      referencePhotoId: String(reference[0].id),
      enquiryId: await first('enquiries'),
      quoteId: await first('quotes'),
      invoiceId: await first('invoices'),
      painterId: String(painterId),
      slug: (await sw.db('studios').where({ id: side.studioId }).first('slug')).slug,
      token: feed.url.match(/calendar\/([^/]+)\.ics$/)![1],
    },
  };
}

const urlOf = (ctx: Ctx, route: string, query?: string) => route.replace(/:(\w+)/g, (_m, k: string) => ctx.ids[k] ?? `unknown-${k}`) + (query ? `?${query}` : '');

/** The queries one request makes, the least of three runs (so that a write done once, such as expiring a quote, does not count). */
async function queriesOf(ctx: Ctx, e: ListEndpoint) {
  let best = Infinity;
  const sql: string[] = [];
  let res!: { status: number; body: unknown; text: string; headers: Record<string, string> };
  for (let run = 0; run < 3; run++) {
    const { value, sql: seen } = await withQueries(sw.db, () => ctx.callers[e.as].get(urlOf(ctx, e.route, e.query)));
    res = value;
    best = Math.min(best, seen.length);
    sql.push(...seen);
    if (process.env.QUERY_COUNT_SQL && e.route.includes(process.env.QUERY_COUNT_SQL)) console.log(seen.join('\n'));
  }
  return { count: best, sql, status: res.status, rows: e.rows({ body: res.body, text: res.text ?? '', headers: res.headers }) };
}

beforeAll(async () => {
  sw = await startTestApp();
  const { a, b } = await twoStudios(sw);
  small = await grow(a, 'a', 3);
  large = await grow(b, 'b', 30);
  // Mail goes out in passes the app starts after a request commits (mailer.kick), which run on while later
  // requests are counted; on PostgreSQL, with a pool of connections, they overlap them. They are not a
  // list's work: from here on no request starts one, and the outbox is emptied (behind the passes already
  // started) before the counting begins.
  sw.mailer.kick = () => undefined;
  while ((await sw.jobs.deliverMail()) > 0);
}, 300_000);
afterAll(() => sw?.stop());

describe('list endpoints make a fixed number of queries', () => {
  it.each(lists.map((e) => [`${e.route}${e.query ? `?${e.query}` : ''} as ${e.as}`, e] as const))('%s', async (_name, e) => {
    const few = await queriesOf(small, e);
    const many = await queriesOf(large, e);
    if (process.env.QUERY_COUNT_REPORT) console.log(`| ${e.route}${e.query ? `?${e.query}` : ''} | ${e.as} | ${few.rows} → ${many.rows} | ${few.count} → ${many.count} |`);
    expect(few.status, `${e.route} answered ${few.status}`).toBe(200);
    expect(many.status).toBe(200);
    if (e.fixedSize) expect(many.rows).toBe(few.rows);
    else expect(many.rows, 'the bigger studio answers more rows').toBeGreaterThan(few.rows);
    expect({ queries: many.count }).toEqual({ queries: few.count });
    for (const table of e.readsNone?.tables ?? []) {
      const named = new RegExp(`\\b(from|join)\\s+[\`"]?${table}[\`"]?(\\s|$)`, 'i');
      expect([...few.sql, ...many.sql].filter((q) => named.test(q)), `${table}: ${e.readsNone!.why}`).toEqual([]);
    }
    // Session, user and membership take four; a list needs a handful more, the dashboard's many sections some twenty.
    expect(many.count).toBeLessThanOrEqual(30);
  });
});

/** The rows on one page, whatever the list's shape. */
function onPage(body: unknown): number {
  if (Array.isArray(body)) return body.length;
  const b = body as { items?: unknown[]; columns?: { cards: unknown[] }[]; commissions?: unknown[] };
  if (b.items) return b.items.length;
  if (b.columns) return b.columns.reduce((n, c) => n + c.cards.length, 0);
  return b.commissions!.length;
}

describe('list endpoints answer pages', () => {
  const paged = lists.filter((e) => e.rows === page || e.rows === array);
  it.each(paged.map((e) => [`${e.route} as ${e.as}`, e] as const))('%s: limit and offset, at most 200 a page', async (_name, e) => {
    const caller = large.callers[e.as];
    const url = (q: string) => urlOf(large, e.route, [e.query, q].filter(Boolean).join('&'));
    const whole = await caller.get(url(''));
    const total = e.rows({ body: whole.body, text: whole.text, headers: whole.headers });
    const first = await caller.get(url('limit=2'));
    const second = await caller.get(url('limit=2&offset=2'));
    expect(onPage(first.body)).toBe(2);
    expect(e.rows({ body: first.body, text: first.text, headers: first.headers }), 'the total counts every page').toBe(total);
    expect(onPage(second.body)).toBe(Math.min(2, total - 2));
    expect(JSON.stringify(second.body)).not.toBe(JSON.stringify(first.body));
    expect((await caller.get(url('limit=201'))).status).toBe(400);
    expect((await caller.get(url('limit=0'))).status).toBe(400);
  });
});

describe('the list of list endpoints', () => {
  it('holds every GET route that answers an array or a page, and only routes on the router', async () => {
    const gets = sw
      .routes()
      .filter((r) => r.method === 'GET')
      .map((r) => r.path);
    const counted = new Set(lists.map((e) => e.route));
    for (const route of counted) expect(gets, `${route} is not on the router`).toContain(route);
    for (const route of [...Object.keys(notCalled), ...Object.keys(probeQuery)]) expect(gets, `${route} is not on the router`).toContain(route);

    const missing: string[] = [];
    const unknown: string[] = [];
    for (const route of gets) {
      if (counted.has(route) || route in notCalled) continue;
      const url = urlOf(large, route, probeQuery[route]);
      let answered = false;
      for (const role of ['owner', 'client'] as const) {
        const res = await large.callers[role].get(url);
        if (res.status !== 200) continue;
        answered = true;
        const body = res.body as { items?: unknown };
        if (Array.isArray(body) || Array.isArray(body?.items)) missing.push(`${route} (as ${role})`);
      }
      if (!answered) unknown.push(route);
    }
    expect(missing, 'list endpoints without a query count: add them to `lists`').toEqual([]);
    expect(unknown, 'GET routes that answered neither the owner nor the client: give them ids, or say why in `notCalled`').toEqual([]);
  });
});
