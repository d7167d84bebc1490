import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { insertCommission, insertFigure, secondClient } from '../support/fixtures';
import { PASSWORD, signInAs, startTestApp, twoStudios, withQueries, type Caller, type TestApp } from '../support/app';
import { afterEachWrite, bothClocks, isFloorRead } from '../support/kept-reads';

// The commission list keeps what it read in memory per studio, schedule version and query, the client's
// scope included (server/features/commissions/commissions.service.ts). Two app instances share one
// database (one SQLite file, or one PostgreSQL database with DATABASE_URL), as docs/scaling.md runs them:
// `cached` with the list cache, `fresh` with it off (commissionListCacheRows: 0), so every answer of
// `fresh` is read from the database. After each kind of write that can change a list row, made through
// either instance or straight to the database, the cached instance must answer every query shape exactly
// as the fresh one, and something else than before the write (else the write proved nothing).

let cached: TestApp;
let fresh: TestApp;
const { at, advance } = bothClocks(() => [cached, fresh]);
let studioId: number;
let otherStudioId: number;
let clientId: number;
let client2Id: number;
let base: string;
type Who = 'owner' | 'painter' | 'client' | 'client2' | 'otherOwner';
const callers: Record<'cached' | 'fresh', Record<Who, Caller>> = { cached: {} as Record<Who, Caller>, fresh: {} as Record<Who, Caller> };
const ids: Record<string, number> = {};

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- answers compared whole
const ok = async (res: Promise<{ status: number; body: any }>, status = 200) => {
  const r = await res;
  if (r.status !== status) throw new Error(`${r.status}: ${JSON.stringify(r.body)}`);
  return r;
};

/** The owner's query shapes: the default page, status filters, searches over title and client name, a page cut, a client filter. */
const ownerShapes = () => ['', '?limit=50', '?status=booked', '?status=on_bench,booked', '?q=marsh', '?q=SECOND', '?limit=2&offset=1', `?clientId=${client2Id}`, '?status=quoted&q=reed'];
/** A client's own list: whole, and a page cut. */
const clientShapes = ['', '?limit=1&offset=1', '?q=reed'];

/** Every query shape of studio A's list for the owner, the painter and both clients, and studio B's, from one instance. */
async function lists(on: 'cached' | 'fresh') {
  const c = callers[on];
  const out: Record<string, unknown> = {};
  for (const s of ownerShapes()) out[`owner${s}`] = (await ok(c.owner.get(`${base}/commissions${s}`))).body;
  out.painter = (await ok(c.painter.get(`${base}/commissions`))).body;
  for (const s of clientShapes) {
    out[`client${s}`] = (await ok(c.client.get(`${base}/commissions${s}`))).body;
    out[`client2${s}`] = (await ok(c.client2.get(`${base}/commissions${s}`))).body;
  }
  out.otherStudio = (await ok(c.otherOwner.get(`/api/studios/${otherStudioId}/commissions`))).body;
  return out;
}

/**
 * Reads every list on the cached instance (so its cache holds them), moves the clock on a minute (so a
 * write's `updated_at` is new), writes, then expects the cached answers to be the fresh ones and new.
 */
const afterWrite = afterEachWrite(lists, () => advance(60_000));

const figuresOf = async (commissionId: number) => ((await cached.db('figures').where({ commission_id: commissionId }).orderBy('id').select('id')) as { id: number }[]).map((f) => f.id);
const stagesOf = async (figureId: number) => ((await cached.db('stages').where({ figure_id: figureId }).orderBy('position').select('id')) as { id: number }[]).map((s) => s.id);

beforeAll(async () => {
  cached = await startTestApp();
  fresh = await startTestApp({ dataDir: cached.dataDir, commissionListCacheRows: 0 });
  at('2026-03-02T09:30:00.000Z');
  const { a, b } = await twoStudios(cached);
  studioId = a.studioId;
  otherStudioId = b.studioId;
  clientId = a.clientId;
  base = `/api/studios/${studioId}`;
  const second = await secondClient(cached, a.owner, studioId, 'client2-a@studio.test');
  client2Id = second.clientId;
  callers.cached = { owner: a.owner, painter: a.painter, client: a.client, client2: second.caller, otherOwner: b.owner };
  callers.fresh = {
    owner: await signInAs(fresh, 'owner-a@studio.test', PASSWORD),
    painter: await signInAs(fresh, 'painter-a@studio.test', PASSWORD),
    client: await signInAs(fresh, 'client-a@studio.test', PASSWORD),
    client2: await signInAs(fresh, 'client2-a@studio.test', PASSWORD),
    otherOwner: await signInAs(fresh, 'owner-b@studio.test', PASSWORD),
  };
  // Created a minute apart, so the list's order (newest first) is fixed.
  const made = async (name: string, client: number, over: Record<string, unknown>, figures: number) => {
    advance(60_000);
    ids[name] = await insertCommission(cached, studioId, client, over);
    for (let i = 0; i < figures; i++) await insertFigure(cached, studioId, ids[name]);
  };
  await made('marsh', clientId, { title: 'Marsh wardens', status: 'on_bench', due_date: '2026-03-04' }, 2);
  await made('reed', clientId, { title: 'Reed skiff', status: 'booked', due_date: '2026-03-12' }, 1);
  await made('heron', client2Id, { title: 'Heron totem', status: 'booked' }, 2);
  await made('peat', client2Id, { title: 'Peat golem, reed crown', status: 'quoted' }, 1);
  ids.other = await insertCommission(cached, otherStudioId, b.clientId, { title: 'Salt barge', status: 'booked' });
});
afterAll(async () => {
  await fresh?.stop();
  await cached?.stop();
});

describe('the kept commission list after each write a row depends on', () => {
  it('answers as a fresh read does from the start, every query shape and every reader', async () => {
    const a = await lists('cached');
    expect(a).toEqual(await lists('fresh'));
    const owner = a.owner as { total: number; items: { title: string }[] };
    expect(owner.total).toBe(4);
    expect(owner.items.map((i) => i.title)).toEqual(['Peat golem, reed crown', 'Heron totem', 'Reed skiff', 'Marsh wardens']);
    // Each client sees only their own; the searches and filters cut the list.
    expect((a.client as { total: number }).total).toBe(2);
    expect((a.client2 as { items: { title: string }[] }).items.map((i) => i.title)).toEqual(['Peat golem, reed crown', 'Heron totem']);
    expect((a['owner?q=SECOND'] as { total: number }).total).toBe(2);
    expect((a['owner?status=on_bench,booked'] as { total: number }).total).toBe(3);
  });

  it("a commission's title, due date and priority (each instance)", async () => {
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/commissions/${ids.reed}`, { title: 'Reed skiff, rigged' })));
    await afterWrite(() => ok(callers.cached.owner.patch(`${base}/commissions/${ids.reed}`, { dueDate: '2026-03-03' })));
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/commissions/${ids.marsh}`, { priority: 'high' })));
  });

  it('a brief edit, which moves only the row’s updated_at of what the list shows', async () => {
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/commissions/${ids.heron}`, { brief: 'Grey and teal, weathered bronze.' })));
  });

  it("the client's own scheme notes, in the client's view", async () => {
    const { after } = await afterWrite(() => ok(callers.fresh.client2.patch(`${base}/commissions/${ids.heron}/scheme-notes`, { schemeNotes: 'Teal a shade darker, please.' })));
    expect((after.client2 as { items: { updatedAt: string }[] }).items[1].updatedAt).toBe(fresh.clock.now().toISOString());
  });

  it("updated_at alone, written straight to the database", async () => {
    await afterWrite(() => fresh.db('commissions').where({ id: ids.marsh }).update({ updated_at: fresh.clock.now().toISOString() }));
  });

  it('a status change, out of a filter and back', async () => {
    await afterWrite(() => ok(callers.cached.owner.post(`${base}/commissions/${ids.reed}/transitions`, { to: 'on_hold' })));
    await afterWrite(() => ok(callers.fresh.owner.post(`${base}/commissions/${ids.reed}/transitions`, { to: 'booked' })));
  });

  it("a client's rename (shown and searched)", async () => {
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/clients/${client2Id}`, { name: 'Marsh Keeper' })));
  });

  it('a figure added, its quantity changed and one removed', async () => {
    await afterWrite(() => ok(callers.fresh.owner.post(`${base}/commissions/${ids.reed}/figures`, { name: 'Oarsman', quantity: 2, sizeClass: '28', tier: 'tabletop' }), 201));
    const [f1, f2] = await figuresOf(ids.marsh);
    await afterWrite(() => ok(callers.cached.owner.patch(`${base}/figures/${f1}`, { quantity: 3 })));
    await afterWrite(() => ok(callers.fresh.owner.delete(`${base}/figures/${f2}`), 204));
  });

  it("a stage's status and estimate", async () => {
    const [f] = await figuresOf(ids.heron);
    const [s1, s2] = await stagesOf(f);
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/stages/${s1}`, { estimateHours: 2 })));
    await afterWrite(() => ok(callers.cached.painter.patch(`${base}/stages/${s1}`, { status: 'done' })));
    await afterWrite(() => ok(callers.fresh.painter.patch(`${base}/stages/${s2}`, { status: 'skipped' })));
  });

  it('a stage total written straight to the database moves with its stage', async () => {
    const [f] = await figuresOf(ids.peat);
    const [s1] = await stagesOf(f);
    await afterWrite(() => fresh.db('stages').where({ id: s1 }).update({ status: 'done', estimate_minutes: 45 }));
  });

  it('a new commission, for a client', async () => {
    const { after } = await afterWrite(() => ok(callers.fresh.owner.post(`${base}/commissions`, { clientId: client2Id, title: 'Reed lantern', figures: [{ name: 'Lantern', quantity: 1, sizeClass: '28', tier: 'tabletop' }] }), 201));
    expect((after.client2 as { items: { title: string }[] }).items[0].title).toBe('Reed lantern');
  });
});

/** The signed-in floor every request makes (session, user, membership; a session's expiry moved on) and the version read. */
const q = '[`"]';
const versionReads = (sql: string[]) => sql.filter((s) => /schedule_version/.test(s));
/** What a list request reads beyond the floor and the version: the list itself (page and count). */
const listReads = (sql: string[]) => sql.filter((s) => !/schedule_version/.test(s) && !isFloorRead(s));
const pageReads = (sql: string[]) => sql.filter((s) => new RegExp(`from ${q}commissions${q} as ${q}c${q}`).test(s) && /order by/.test(s));

describe('reading an unchanged list', () => {
  it('the second identical request reads the version and nothing of the list; the uncached instance reads it all again', async () => {
    const urls = [...ownerShapes().map((s) => ['owner', s] as const), ...clientShapes.map((s) => ['client', s] as const)];
    for (const [who, s] of urls) {
      const url = `${base}/commissions${s}`;
      await ok(callers.fresh.owner.patch(`${base}/commissions/${ids.reed}`, { title: `Reed skiff ${who} ${s.length}` }));
      const first = (await withQueries(cached.db, () => ok(callers.cached[who].get(url)))).sql;
      const second = (await withQueries(cached.db, () => ok(callers.cached[who].get(url)))).sql;
      expect(listReads(first).length).toBeGreaterThanOrEqual(2);
      expect(pageReads(first)).toHaveLength(1);
      expect(versionReads(first)).toHaveLength(1);
      expect(listReads(second)).toEqual([]);
      expect(versionReads(second)).toHaveLength(1);
      expect(second.length).toBeGreaterThanOrEqual(4); // session, user, membership, version: the floor was seen
      const uncached = (await withQueries(fresh.db, () => ok(callers.fresh[who].get(url)))).sql;
      expect(listReads(uncached)).toEqual(listReads(first));
      expect(versionReads(uncached)).toEqual([]);
    }
  });

  it('queries the database answers alike share an entry (statuses in another order, a search in other case); others do not', async () => {
    await ok(callers.fresh.owner.patch(`${base}/commissions/${ids.reed}`, { title: 'Reed skiff, shared' }));
    const read = async (s: string) => {
      const { value, sql } = await withQueries(cached.db, () => ok(callers.cached.owner.get(`${base}/commissions${s}`)));
      expect(value.body).toEqual((await ok(callers.fresh.owner.get(`${base}/commissions${s}`))).body);
      return listReads(sql).length;
    };
    expect(await read('?status=on_bench,booked')).toBeGreaterThan(0);
    expect(await read('?status=booked,on_bench,booked')).toBe(0);
    expect(await read('?q=Reed')).toBeGreaterThan(0);
    expect(await read('?q=rEED')).toBe(0);
    expect(await read('?q=reed&limit=1')).toBeGreaterThan(0);
    expect(await read('?status=booked')).toBeGreaterThan(0);
  });

  it("a client never gets another client's kept list, nor the owner's", async () => {
    await ok(callers.fresh.owner.patch(`${base}/commissions/${ids.reed}`, { title: 'Reed skiff, scoped' }));
    const owner = (await ok(callers.cached.owner.get(`${base}/commissions`))).body;
    const one = (await ok(callers.cached.client.get(`${base}/commissions`))).body;
    const two = (await ok(callers.cached.client2.get(`${base}/commissions`))).body;
    expect(one).toEqual((await ok(callers.fresh.client.get(`${base}/commissions`))).body);
    expect(two).toEqual((await ok(callers.fresh.client2.get(`${base}/commissions`))).body);
    expect(one).not.toEqual(owner);
    expect(two).not.toEqual(one);
  });

  it('requests that arrive together after a write share one read', async () => {
    await ok(callers.fresh.owner.patch(`${base}/commissions/${ids.reed}`, { title: 'Reed skiff, together' }));
    const { value, sql } = await withQueries(cached.db, () => Promise.all([1, 2, 3, 4, 5].map(() => ok(callers.cached.owner.get(`${base}/commissions`)))));
    expect(pageReads(sql)).toHaveLength(1);
    for (const r of value) expect(r.body).toEqual(value[0].body);
    expect(value[0].body).toEqual((await ok(callers.fresh.owner.get(`${base}/commissions`))).body);
  });

  it('never answers one studio with another studio’s list, even at the same version', async () => {
    await cached.db('studios').whereIn('id', [studioId, otherStudioId]).update({ schedule_version: 4242 });
    const a = (await ok(callers.cached.owner.get(`${base}/commissions`))).body;
    const b = (await ok(callers.cached.otherOwner.get(`/api/studios/${otherStudioId}/commissions`))).body;
    expect(b).toEqual((await ok(callers.fresh.otherOwner.get(`/api/studios/${otherStudioId}/commissions`))).body);
    expect(a).toEqual((await ok(callers.fresh.owner.get(`${base}/commissions`))).body);
    expect(b).not.toEqual(a);
  });
});
