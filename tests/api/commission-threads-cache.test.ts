import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createThreadVersionTriggers, dropThreadVersionTriggers, threadVersionTriggers } from '../../migrations/20270209120000-thread-version';
import { idOf, signInAs, startTestApp, twoStudios, withQueries, type Caller, type TestApp } from '../support/app';
import { secondClient, secondPainter, userId } from '../support/fixtures';
import { afterEachWrite, bothClocks, isFloorRead, ok } from '../support/kept-reads';

// A commission's comments, its activity and a stage's time are kept in memory per commission, thread version
// and page (server/features/comments/comments.service.ts, activity/activity.service.ts, time/time.service.ts;
// commissions.thread_version, moved by migrations/20270209120000-thread-version.ts). Two app instances share
// one database (one SQLite file, or one PostgreSQL database with DATABASE_URL): `cached` with the caches on,
// `fresh` with them off (listsCacheRows: 0), so its answers are read from the database every time. After each
// kind of write these answers read, the cached answers must be the fresh ones, and something else than before
// (else the write proved nothing). Every trigger has a write straight to the database that only it sees, and
// with that trigger dropped the cached answers stay as they were: no trigger can go without a test failing.

let cached: TestApp;
let fresh: TestApp;
const { advance } = bothClocks(() => [cached, fresh]);
type Side = Awaited<ReturnType<typeof twoStudios>>['a'];
let a: Side;
let b: Side;
let base: string;
const ids: Record<string, number> = {};

type Role = 'owner' | 'painter' | 'client';
const callers = { cached: {}, fresh: {} } as Record<'cached' | 'fresh', Record<'a' | 'b', Record<Role, Caller>>>;

/** Every thread of studio A's two commissions (owner, painter and client) and of studio B's, from one instance. */
async function lists(on: 'cached' | 'fresh') {
  const out: Record<string, unknown> = {};
  const page = async (who: Caller, url: string) => {
    const r = await ok(who.get(url));
    return { items: r.body, total: Number(r.headers['x-total-count']) };
  };
  for (const tag of ['a', 'b'] as const) {
    const c = callers[on][tag];
    const S = `/api/studios/${(tag === 'a' ? a : b).studioId}`;
    for (const cid of tag === 'a' ? [ids.first, ids.second] : [ids.other]) {
      out[`${tag} ${cid} comments`] = await page(c.owner, `${S}/commissions/${cid}/comments`);
      out[`${tag} ${cid} comments client`] = await page(c.client, `${S}/commissions/${cid}/comments`);
      out[`${tag} ${cid} comments ?limit=1&offset=1`] = await page(c.painter, `${S}/commissions/${cid}/comments?limit=1&offset=1`);
      out[`${tag} ${cid} activity`] = await page(c.owner, `${S}/commissions/${cid}/activity`);
      out[`${tag} ${cid} activity ?limit=2`] = await page(c.painter, `${S}/commissions/${cid}/activity?limit=2`);
    }
    for (const sid of tag === 'a' ? [ids.stage, ids.stage2, ids.secondStage] : [ids.otherStage]) {
      out[`${tag} ${sid} time`] = await page(c.owner, `${S}/stages/${sid}/time`);
      out[`${tag} ${sid} time ?limit=1&offset=1`] = await page(c.painter, `${S}/stages/${sid}/time?limit=1&offset=1`);
    }
  }
  return out;
}

/** Reads everything on the cached instance, moves the clocks on a minute, writes, compares. */
const afterWrite = afterEachWrite(lists, () => advance(60_000));

const now = () => cached.clock.now().toISOString();
let renames = 0;
const insertId = async (table: string, row: Record<string, unknown>) => idOf((await cached.db(table).insert(row).returning('id'))[0]);
/** The second painter's membership (removed through the API before the straight writes; they have a comment on the first commission). */
const memberRow = () => cached.db('memberships').where({ studio_id: a.studioId, user_id: ids.extraUser });

/**
 * Writes straight to the database, one per trigger, each seen by that trigger alone (so with it dropped the
 * kept answers stay as they were). In order: each delete removes what its insert added.
 */
const straight: Record<string, () => Promise<unknown>> = {
  thread_version_comments_insert: async () =>
    (ids.sqlComment = await insertId('comments', { studio_id: a.studioId, commission_id: ids.first, user_id: ids.painterUser, body: 'Straight comment', created_at: now() })),
  thread_version_comments_update: () => cached.db('comments').where({ id: ids.sqlComment }).update({ body: 'Straight comment, edited' }),
  thread_version_comments_delete: () => cached.db('comments').where({ id: ids.sqlComment }).delete(),
  thread_version_activity_insert: async () =>
    (ids.sqlActivity = await insertId('activity', { studio_id: a.studioId, commission_id: ids.first, user_id: ids.painterUser, action: 'straight.note', detail: JSON.stringify({ summary: 'wrote straight.' }), at: now() })),
  thread_version_activity_update: () => cached.db('activity').where({ id: ids.sqlActivity }).update({ detail: JSON.stringify({ summary: 'wrote straight again.' }) }),
  thread_version_activity_delete: () => cached.db('activity').where({ id: ids.sqlActivity }).delete(),
  thread_version_time_entries_insert: async () =>
    (ids.sqlTime = await insertId('time_entries', {
      studio_id: a.studioId,
      commission_id: ids.first,
      figure_id: ids.figure,
      stage_id: ids.stage,
      user_id: ids.painterUser,
      source: 'manual',
      started_at: '2026-03-02T09:00:00.000Z',
      ended_at: '2026-03-02T09:30:00.000Z',
      minutes: 30,
      created_at: now(),
      updated_at: now(),
    })),
  thread_version_time_entries_update: () => cached.db('time_entries').where({ id: ids.sqlTime }).update({ note: 'Straight note' }),
  thread_version_time_entries_delete: () => cached.db('time_entries').where({ id: ids.sqlTime }).delete(),
  // A stage's time is kept under the stage's commission: moved away, its time changed (which moves the
  // commission it is in then), and moved back, its old commission must have moved too.
  thread_version_stages_update: async () => {
    const entry = (await cached.db('time_entries').where({ stage_id: ids.stage2 }).first('id')).id as number;
    await cached.db('stages').where({ id: ids.stage2 }).update({ commission_id: ids.second });
    await cached.db('time_entries').where({ id: entry }).update({ note: `Moved ${++renames}` });
    await cached.db('stages').where({ id: ids.stage2 }).update({ commission_id: ids.first });
  },
  thread_version_users_update: () => cached.db('users').where({ id: ids.painterUser }).update({ name: `Painter a, renamed ${++renames}` }),
  thread_version_memberships_insert: () => cached.db('memberships').insert({ studio_id: a.studioId, user_id: ids.extraUser, role: 'painter', created_at: now() }),
  thread_version_memberships_update: () => memberRow().update({ role: 'owner' }),
  thread_version_memberships_delete: () => memberRow().delete(),
};

beforeAll(async () => {
  cached = await startTestApp();
  fresh = await startTestApp({ dataDir: cached.dataDir, listsCacheRows: 0 });
  cached.clock.set('2026-03-30T10:00:00.000Z');
  fresh.clock.set('2026-03-30T10:00:00.000Z');
  ({ a, b } = await twoStudios(cached));
  for (const [tag, side] of [['a', a], ['b', b]] as const) {
    callers.cached[tag] = { owner: side.owner, painter: side.painter, client: side.client };
    callers.fresh[tag] = {
      owner: await signInAs(fresh, `owner-${tag}@studio.test`),
      painter: await signInAs(fresh, `painter-${tag}@studio.test`),
      client: await signInAs(fresh, `client-${tag}@studio.test`),
    };
  }
  ids.painterUser = await userId(cached, 'painter-a@studio.test');
  base = `/api/studios/${a.studioId}`;
  const make = async (s: Side, title: string) => {
    const res = await ok(s.owner.post(`/api/studios/${s.studioId}/commissions`, { clientId: s.clientId, title, figures: [{ name: 'Warden', quantity: 2, sizeClass: '28', tier: 'tabletop' }] }), 201);
    return res.body as { id: number; figures: { id: number; stages: { id: number }[] }[] };
  };
  const first = await make(a, 'Marsh wardens');
  ids.first = first.id;
  ids.figure = first.figures[0].id;
  ids.stage = first.figures[0].stages[0].id;
  ids.stage2 = first.figures[0].stages[1].id;
  const second = await make(a, 'Reed skiff');
  ids.second = second.id;
  ids.secondStage = second.figures[0].stages[0].id;
  const other = await make(b, 'Other studio barge');
  ids.other = other.id;
  ids.otherStage = other.figures[0].stages[0].id;
  // Something in every list to begin with: two comments each, time on two stages.
  for (const [s, cid] of [[a, ids.first], [a, ids.second], [b, ids.other]] as const) {
    await ok(s.owner.post(`/api/studios/${s.studioId}/commissions/${cid}/comments`, { body: 'Primed and ready.' }), 201);
    await ok(s.painter.post(`/api/studios/${s.studioId}/commissions/${cid}/comments`, { body: 'Basecoat tonight.' }), 201);
  }
  for (const sid of [ids.stage, ids.stage2]) {
    await ok(a.painter.post(`${base}/stages/${sid}/time`, { hours: 1, note: 'First pass' }), 201);
    await ok(a.owner.post(`${base}/stages/${sid}/time`, { hours: 0.5 }), 201);
  }
  await ok(b.painter.post(`/api/studios/${b.studioId}/stages/${ids.otherStage}/time`, { hours: 2 }), 201);
});
afterAll(async () => {
  await fresh?.stop();
  await cached?.stop();
});

const freshCaller = (email: string) => signInAs(fresh, email);

describe('the kept comments, activity and stage time after each write they read', () => {
  it('answer as a fresh read does from the start', async () => {
    const first = await lists('cached');
    expect(first).toEqual(await lists('fresh'));
    expect(await lists('cached')).toEqual(first);
    expect((first[`a ${ids.first} comments`] as { total: number }).total).toBe(2);
    expect((first[`a ${ids.stage} time`] as { total: number }).total).toBe(2);
    expect((first[`a ${ids.first} activity`] as { total: number }).total).toBeGreaterThan(0);
  });
  it('comments written by the studio and the client through either instance', async () => {
    await afterWrite(() => ok(a.client.post(`${base}/commissions/${ids.first}/comments`, { body: 'Could the cloak be darker?' }), 201));
    const freshOwner = await freshCaller('owner-a@studio.test');
    await afterWrite(() => ok(freshOwner.post(`${base}/commissions/${ids.second}/comments`, { body: 'Darker it is.' }), 201));
  });
  it('time logged, timed, stopped, edited and deleted through either instance', async () => {
    const freshPainter = await freshCaller('painter-a@studio.test');
    const added = await afterWrite(async () => (ids.manual = (await ok(freshPainter.post(`${base}/stages/${ids.stage}/time`, { hours: 1.5, note: 'Shading' }), 201)).body.id));
    expect(added.after).not.toEqual(added.before);
    await afterWrite(() => ok(a.painter.post(`${base}/stages/${ids.secondStage}/timer`), 201));
    advance(25 * 60_000);
    await afterWrite(() => ok(freshPainter.post(`${base}/timer/stop`)));
    await afterWrite(() => ok(a.painter.patch(`${base}/time/${ids.manual}`, { hours: 2, note: 'Shading, both coats' })));
    await afterWrite(() => ok(callers.fresh.a.owner.delete(`${base}/time/${ids.manual}`), 204));
  });
  it('changes the activity logs: a stage done, a figure added, the commission edited', async () => {
    await afterWrite(() => ok(a.painter.patch(`${base}/stages/${ids.stage}`, { status: 'done' })));
    await afterWrite(() => ok(callers.fresh.a.owner.post(`${base}/commissions/${ids.second}/figures`, { name: 'Boatman', quantity: 1, sizeClass: '28', tier: 'tabletop' }), 201));
    await afterWrite(() => ok(a.owner.patch(`${base}/commissions/${ids.first}`, { brief: 'Marsh greens, dark cloaks.' })));
  });
  it('a person renamed, and a painter removed from the studio', async () => {
    await afterWrite(() => ok(a.painter.patch('/api/auth/me', { name: 'Painter a, the marsh one' })));
    const extra = await secondPainter(cached, a.owner, a.studioId, 'painter-extra@studio.test');
    await ok(extra.post(`${base}/commissions/${ids.first}/comments`, { body: 'I can help with the bases.' }), 201);
    ids.extraUser = await userId(cached, 'painter-extra@studio.test');
    await afterWrite(() => ok(callers.fresh.a.owner.delete(`${base}/members/${ids.extraUser}`), 204));
  });
  it('each trigger: a write straight to the database that only it sees', async () => {
    expect(Object.keys(straight).sort()).toEqual(threadVersionTriggers().map((t) => t.name).sort());
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
      const tables = new Map(threadVersionTriggers().map((t) => [t.name, t.table]));
      for (const t of Object.keys(straight).map((name) => ({ name, table: tables.get(name)! }))) {
        const before = await lists('cached');
        await db.raw(isPg ? `drop trigger ${t.name} on ${t.table}` : `drop trigger ${t.name}`);
        advance(60_000);
        await straight[t.name]();
        expect(await lists('cached'), t.name).toEqual(before);
        expect(await lists('fresh'), t.name).not.toEqual(before);
        await dropThreadVersionTriggers(db);
        await createThreadVersionTriggers(db);
        // Any later write moves the versions again, and the kept answers with them.
        await db('commissions').whereIn('id', [ids.first, ids.second]).increment('thread_version', 1);
        expect(await lists('cached')).toEqual(await lists('fresh'));
      }
    } finally {
      await dropThreadVersionTriggers(db);
      await createThreadVersionTriggers(db);
    }
  }, 180_000);
});

const versionReads = (sql: string[]) => sql.filter((s) => /thread_version/.test(s));
const listReads = (sql: string[]) => sql.filter((s) => !/thread_version/.test(s) && !isFloorRead(s));
describe('reading unchanged threads', () => {
  it('the second identical request reads the version (the access check) and nothing else', async () => {
    for (const [who, url] of [
      [a.owner, `${base}/commissions/${ids.first}/comments`],
      [a.client, `${base}/commissions/${ids.first}/comments`],
      [a.owner, `${base}/commissions/${ids.first}/activity`],
      [a.painter, `${base}/stages/${ids.stage}/time`],
    ] as const) {
      await ok(who.get(url));
      const again = await withQueries(cached.db, () => ok(who.get(url)));
      expect(versionReads(again.sql), url).toHaveLength(1);
      expect(listReads(again.sql), url).toEqual([]);
    }
  });
  it('never answers another studio’s commission or stage, nor a client with another client’s thread, kept or not', async () => {
    const second = await secondClient(cached, a.owner, a.studioId, 'client-second@studio.test');
    const theirs = (await ok(a.owner.post(`${base}/commissions`, { clientId: second.clientId, title: 'Second client’s keep' }), 201)).body.id as number;
    await ok(a.owner.post(`${base}/commissions/${theirs}/comments`, { body: 'For the second client.' }), 201);
    for (const app of ['cached', 'fresh'] as const) {
      const c = callers[app];
      // Kept by the owner's read first: the client must still be refused.
      expect((await ok(c.a.owner.get(`${base}/commissions/${theirs}/comments`))).body).toHaveLength(1);
      expect((await c.a.client.get(`${base}/commissions/${theirs}/comments`)).status, app).toBe(404);
      expect((await ok(c.a.client.get(`${base}/commissions/${ids.first}/comments`))).body.length).toBeGreaterThan(0);
      // Studio B's owner asking studio A's ids under studio B, and studio A's under A for B's.
      const B = `/api/studios/${b.studioId}`;
      expect((await c.b.owner.get(`${B}/commissions/${ids.first}/comments`)).status, app).toBe(404);
      expect((await c.b.owner.get(`${B}/commissions/${ids.first}/activity`)).status, app).toBe(404);
      expect((await c.b.owner.get(`${B}/stages/${ids.stage}/time`)).status, app).toBe(404);
      expect((await c.a.owner.get(`${base}/commissions/${ids.other}/comments`)).status, app).toBe(404);
      expect((await c.a.owner.get(`${base}/stages/${ids.otherStage}/time`)).status, app).toBe(404);
      expect((await c.a.client.get(`${base}/commissions/${ids.first}/activity`)).status, app).toBe(403);
    }
  });
});
