// SQL metacharacters in the searches and text fields of the main lists and forms: stored and returned literally,
// a search for % or _ finds only what contains that character, and no query string makes the server fail.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Caller, startTestApp, twoStudios, type TestApp } from '../support/app';
import { fill, studioRecords, type RouteIds, type StudioMembers } from '../support/route-fixtures';

const META = ["'", '"', ';--', '%', '_', '\\', "' OR 1=1 --"];

let sw: TestApp;
let A: StudioMembers;
let ids: RouteIds;
const base = () => `/api/studios/${A.studioId}`;
/** Items of a list answer, paged ({items}) or not (an array). */
const itemsOf = (body: unknown): Record<string, unknown>[] => (Array.isArray(body) ? body : ((body as { items: Record<string, unknown>[] }).items ?? []));
/** Whether any string anywhere in a value equals or contains `text`. */
function holds(v: unknown, text: string, exact = false): boolean {
  if (typeof v === 'string') return exact ? v === text : v.includes(text);
  if (Array.isArray(v)) return v.some((x) => holds(x, text, exact));
  if (v && typeof v === 'object') return Object.values(v).some((x) => holds(x, text, exact));
  return false;
}

// One record per metacharacter in each list, plus a plain one, so "everything" and "the right one" differ.
const named = (prefix: string) => [...META.map((m, i) => `${prefix} ${m} ${i}`), `${prefix} plain 99`];
const clientNames = named('Ada');
const titles = named('Order');
const paintNames = named('Ink');
const recipeNames = named('Wash');

beforeAll(async () => {
  sw = await startTestApp();
  ({ a: A } = await twoStudios(sw));
  ids = await studioRecords(sw, A, 'a');
  const plainClient = await A.owner.post(`${base()}/clients`, { name: 'Plain Person', email: 'plain@sql.test' });
  for (const [i, name] of clientNames.entries()) {
    expect((await A.owner.post(`${base()}/clients`, { name, email: `m${i}@sql.test`, notes: `notes ${name}` })).status).toBe(201);
  }
  for (const title of titles) {
    const c = await A.owner.post(`${base()}/commissions`, { clientId: plainClient.body.id, title, brief: `brief ${title}`, figures: [{ name: `Fig ${title}`, quantity: 1, sizeClass: '28', tier: 'tabletop' }] });
    expect(c.status).toBe(201);
    expect((await A.owner.post(`${base()}/commissions/${c.body.id}/quotes`, {})).status).toBe(201);
    const inv = await A.owner.post(`${base()}/invoices`, { commissionId: c.body.id, kind: 'custom', lines: [{ description: `Line ${title}`, quantity: 1, unitMinor: 100 }] });
    expect(inv.status).toBe(201);
  }
  for (const name of paintNames) expect((await A.owner.post(`${base()}/paints`, { name, maker: `Maker ${name}`, type: 'base', hex: '#112233', notes: `n ${name}` })).status).toBe(201);
  for (const name of recipeNames) expect((await A.owner.post(`${base()}/recipes`, { name, description: `d ${name}` })).status).toBe(201);
}, 180_000);
afterAll(() => sw.stop());

describe('SQL metacharacters', () => {
  it('text fields are stored and returned exactly as typed', async () => {
    const clients = itemsOf((await A.owner.get(`${base()}/clients?limit=200`)).body);
    for (const name of clientNames) {
      const c = clients.find((x) => x.name === name);
      expect(c, name).toBeTruthy();
      const detail = (await A.owner.get(`${base()}/clients/${c!.id}`)).body;
      expect(detail.notes).toBe(`notes ${name}`);
    }
    const commissions = itemsOf((await A.owner.get(`${base()}/commissions?limit=200`)).body);
    for (const title of titles) {
      const c = commissions.find((x) => x.title === title);
      expect(c, title).toBeTruthy();
      const detail = (await A.owner.get(`${base()}/commissions/${c!.id}`)).body;
      expect(detail.brief).toBe(`brief ${title}`);
      expect(holds(detail, `Fig ${title}`, true)).toBe(true);
    }
    const paints = itemsOf((await A.owner.get(`${base()}/paints?limit=200`)).body);
    for (const name of paintNames) {
      const p = paints.find((x) => x.name === name);
      expect(p, name).toBeTruthy();
      expect(p!.maker).toBe(`Maker ${name}`);
    }
    const recipes = itemsOf((await A.owner.get(`${base()}/recipes?limit=200`)).body);
    for (const name of recipeNames) {
      const r = recipes.find((x) => x.name === name);
      expect(r, name).toBeTruthy();
      expect((await A.owner.get(`${base()}/recipes/${r!.id}`)).body.description).toBe(`d ${name}`);
    }
    const invoices = itemsOf((await A.owner.get(`${base()}/invoices?limit=200`)).body);
    for (const title of titles) {
      const inv = invoices.find((x) => holds(x, title, true));
      expect(inv, title).toBeTruthy();
      expect(holds((await A.owner.get(`${base()}/invoices/${inv!.id}`)).body, `Line ${title}`, true)).toBe(true);
    }
  });

  // Each list's search, and the texts it searches in, as the list answers them.
  const lists = [
    { name: 'clients', path: '/clients', texts: clientNames, text: (x: Record<string, unknown>) => String(x.name) },
    { name: 'commissions', path: '/commissions', texts: titles, text: (x: Record<string, unknown>) => String(x.title) },
    { name: 'paints', path: '/paints', texts: paintNames, text: (x: Record<string, unknown>) => String(x.name) },
    { name: 'recipes', path: '/recipes', texts: recipeNames, text: (x: Record<string, unknown>) => String(x.name) },
    { name: 'quotes', path: '/quotes', texts: titles, text: (x: Record<string, unknown>) => titles.find((t) => holds(x, t, true)) ?? '' },
    { name: 'invoices', path: '/invoices', texts: titles, text: (x: Record<string, unknown>) => titles.find((t) => holds(x, t, true)) ?? '' },
  ];

  it.each(lists)('the $name search finds exactly the records that contain the characters, % and _ included', async ({ path, texts, text }) => {
    const everything = itemsOf((await A.owner.get(`${base()}${path}?limit=200`)).body).map(text).filter(Boolean);
    for (const t of texts) expect(everything).toContain(t);
    for (const m of META) {
      const res = await A.owner.get(`${base()}${path}`).query({ q: m, limit: 200 });
      expect(res.status, m).toBe(200);
      const found = itemsOf(res.body).map(text).filter(Boolean).sort();
      const expected = texts.filter((t) => t.toLowerCase().includes(m.toLowerCase())).sort();
      expect(found, `q=${m}`).toEqual(expected);
      expect(found.length).toBeLessThan(texts.length);
    }
  });

  it('id filters in query strings take plain decimal ids in range: 0x1, 1e0, +1 and 2^31 are 400, a real id filters', async () => {
    const filters: [path: string, key: string, real: string][] = [
      ['/commissions', 'clientId', ids.clientId],
      ['/board', 'painterId', ids.painterId],
      ['/board', 'commissionId', ids.commissionId],
      ['/invoices', 'clientId', ids.clientId],
      ['/invoices', 'commissionId', ids.commissionId],
      ['/quotes', 'commissionId', ids.commissionId],
      ['/schedule/earliest-delivery', 'commissionId', ids.commissionId],
      ['/schedule/earliest-delivery?hours=3', 'painterId', ids.painterId],
    ];
    for (const [path, key, real] of filters) {
      const url = (v: string) => `${base()}${path}${path.includes('?') ? '&' : '?'}${key}=${encodeURIComponent(v)}`;
      expect((await A.owner.get(url(real))).status, `${path} ${key}=${real}`).toBe(200);
      // 2^31 is one past PostgreSQL's integer: unchecked, it reaches the database and fails there
      for (const v of ['0x1', '1e0', '+1', String(2 ** 31), '1.0']) expect((await A.owner.get(url(v))).status, `${path} ${key}=${v}`).toBe(400);
    }
  });

  it('hostile query strings on every GET route of the router never make the server fail', async () => {
    const failures: string[] = [];
    let checked = 0;
    const owner = A.owner;
    const users = async () => Number((await sw.db('users').count({ n: '*' }).first())!.n);
    const usersBefore = await users();
    const anon = new Caller(sw.app);
    for (const r of sw.routes().filter((x) => x.method === 'GET')) {
      const url = fill(r.path, ids);
      for (const m of [...META, '1; drop table users', '%00', '\u0000', String(2 ** 31), '-1']) {
        const query = Object.fromEntries(['q', 'status', 'sort', 'order', 'type', 'stock', 'from', 'to', 'limit', 'offset', 'clientId', 'commissionId', 'painterId', 'month'].map((k) => [k, m]));
        const res = await (r.policy?.kind === 'public' ? anon : owner).get(url).query(query);
        checked++;
        if (res.status >= 500) failures.push(`${r.path} ?…=${m} → ${res.status}`);
      }
    }
    expect(checked).toBeGreaterThan(0);
    expect(failures).toEqual([]);
    expect(await users()).toBe(usersBefore);
  }, 300_000);
});
