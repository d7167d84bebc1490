import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { secondPainter, userId } from '../support/fixtures';
import { idOf, PASSWORD, signInAs, startTestApp, twoStudios, withQueries, type Caller, type TestApp } from '../support/app';
import { afterEachWrite, bothClocks, isFloorRead } from '../support/kept-reads';

// The bench board keeps what it read in memory per studio, schedule version and query
// (server/features/board/board.service.ts). Two app instances share one database (one SQLite file, or one
// PostgreSQL database with DATABASE_URL), as docs/scaling.md runs them: `cached` with the board cache,
// `fresh` with it off (boardCacheRows: 0), so every answer of `fresh` is read from the database. After each
// kind of write that can change a card, made through either instance or straight to the database, the
// cached instance must answer every query shape exactly as the fresh one, and something else than before
// the write (else the write proved nothing).

let cached: TestApp;
let fresh: TestApp;
const { at, advance } = bothClocks(() => [cached, fresh]);
let studioId: number;
let otherStudioId: number;
let clientId: number;
let painterId: number;
let painter2Id: number;
let base: string;
type Who = 'owner' | 'painter' | 'otherOwner';
const callers: Record<'cached' | 'fresh', Record<Who, Caller>> = { cached: {} as Record<Who, Caller>, fresh: {} as Record<Who, Caller> };
const ids: Record<string, number> = {};
let templateKeys: string[] = [];



/** A commission straight in the database, its stages on the studio's template keys (one stage off the template when `offTemplate`). */
async function commission(studio: number, client: number, title: string, status: string, due: string | null, figures: { painter: number | null; stages: { minutes: number; wait?: number; status?: string; doneAt?: string }[] }[], offTemplate = false) {
  const sw = cached;
  const now = sw.clock.now().toISOString();
  const c = idOf((await sw.db('commissions').insert({ studio_id: studio, client_id: client, title, status, priority: 'normal', due_date: due, created_at: now, updated_at: now }).returning('id'))[0]);
  for (const [i, f] of figures.entries()) {
    const fig = idOf(
      (await sw.db('figures').insert({ studio_id: studio, commission_id: c, name: `${title} ${i + 1}`, quantity: 1, size_class: '28', tier: 'tabletop', painter_id: f.painter, position: i, created_at: now, updated_at: now }).returning('id'))[0],
    );
    for (const [position, s] of f.stages.entries()) {
      const key = offTemplate && position === f.stages.length - 1 ? 'retired-step' : templateKeys[position % templateKeys.length];
      await sw.db('stages').insert({
        studio_id: studio,
        commission_id: c,
        figure_id: fig,
        template_key: key,
        name: `Step ${position + 1}`,
        position,
        estimate_minutes: s.minutes,
        wait_minutes: s.wait ?? 0,
        status: s.status ?? 'todo',
        done_at: s.doneAt ?? null,
        hazards: position === 0 ? '["spray"]' : '[]',
        updated_at: now,
      });
    }
  }
  return c;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- answers compared whole
const ok = async (res: Promise<{ status: number; body: any }>, status = 200) => {
  const r = await res;
  if (r.status !== status) throw new Error(`${r.status}: ${JSON.stringify(r.body)}`);
  return r;
};

/** The board's query shapes (the painter's filter, a page cut inside the order, a due date, one commission). */
const shapes = () => ['', `?painterId=${painterId}`, '?limit=2&offset=1', '?dueBefore=2026-03-10', `?commissionId=${ids.first}`, '?limit=1&offset=3'];

/** Every query shape of studio A's board, and studio B's board, from one instance. */
async function boards(on: 'cached' | 'fresh') {
  const c = callers[on];
  const out: Record<string, unknown> = {};
  for (const s of shapes()) out[`owner${s}`] = (await ok(c.owner.get(`${base}/board${s}`))).body;
  out.painter = (await ok(c.painter.get(`${base}/board`))).body;
  out.otherStudio = (await ok(c.otherOwner.get(`/api/studios/${otherStudioId}/board`))).body;
  return out;
}

const afterWrite = afterEachWrite(boards);

const figuresOf = async (commissionId: number) => ((await cached.db('figures').where({ commission_id: commissionId }).orderBy('id').select('id')) as { id: number }[]).map((f) => f.id);
const stagesOf = async (figureId: number) =>
  (await cached.db('stages').where({ figure_id: figureId }).orderBy('position').select('id', 'position', 'status', 'wait_minutes')) as { id: number; position: number; status: string; wait_minutes: number }[];

beforeAll(async () => {
  cached = await startTestApp();
  fresh = await startTestApp({ dataDir: cached.dataDir, boardCacheRows: 0 });
  at('2026-03-02T09:30:20.000Z');
  const { a, b } = await twoStudios(cached);
  studioId = a.studioId;
  otherStudioId = b.studioId;
  clientId = a.clientId;
  base = `/api/studios/${studioId}`;
  painterId = await userId(cached, 'painter-a@studio.test');
  await secondPainter(cached, a.owner, studioId, 'painter2-a@studio.test');
  painter2Id = await userId(cached, 'painter2-a@studio.test');
  callers.cached = { owner: a.owner, painter: a.painter, otherOwner: b.owner };
  callers.fresh = {
    owner: await signInAs(fresh, 'owner-a@studio.test', PASSWORD),
    painter: await signInAs(fresh, 'painter-a@studio.test', PASSWORD),
    otherOwner: await signInAs(fresh, 'owner-b@studio.test', PASSWORD),
  };
  templateKeys = ((await ok(a.owner.get(`${base}/stage-template`))).body as { key: string }[]).map((s) => s.key);
  expect(templateKeys.length).toBeGreaterThanOrEqual(3);
  // The first figure's first stage is done and makes the next wait two hours (until 11:30 UTC).
  ids.first = await commission(studioId, clientId, 'Marsh wardens', 'on_bench', '2026-03-04', [
    { painter: painterId, stages: [{ minutes: 120, wait: 120, status: 'done', doneAt: '2026-03-02T09:30:00.000Z' }, { minutes: 240 }, { minutes: 60 }] },
    { painter: painter2Id, stages: [{ minutes: 30 }, { minutes: 30 }] },
  ]);
  ids.second = await commission(studioId, clientId, 'Reed skiff', 'booked', '2026-03-12', [{ painter: null, stages: [{ minutes: 180 }, { minutes: 120 }] }]);
  ids.third = await commission(studioId, clientId, 'Heron totem', 'booked', null, [
    { painter: painterId, stages: [{ minutes: 60, status: 'done', doneAt: '2026-03-01T09:00:00.000Z' }, { minutes: 60 }] },
    { painter: painter2Id, stages: [{ minutes: 90, status: 'done', doneAt: '2026-03-01T09:00:00.000Z' }] },
  ], true);
  ids.quoted = await commission(studioId, clientId, 'Peat golem', 'quoted', null, [{ painter: painter2Id, stages: [{ minutes: 300 }] }]);
  ids.other = await commission(otherStudioId, b.clientId, 'Salt barge', 'booked', '2026-03-05', [{ painter: null, stages: [{ minutes: 300 }] }]);
});
afterAll(async () => {
  await fresh?.stop();
  await cached?.stop();
});

describe('the kept board after each write a card depends on', () => {
  it('answers as a fresh read does from the start, every query shape', async () => {
    const a = await boards('cached');
    expect(a).toEqual(await boards('fresh'));
    const all = a.owner as { total: number; columns: { key: string; cards: { figureId: number; stage: { waitUntil: string | null } | null }[] }[] };
    expect(all.total).toBe(5);
    // The running wait shows on the first figure's card; the off-template stage gets its own column.
    const cards = all.columns.flatMap((c) => c.cards);
    expect(cards.some((c) => c.stage?.waitUntil === '2026-03-02T11:30:00.000Z')).toBe(true);
    expect(all.columns.map((c) => c.key)).toContain('retired-step');
  });

  it("a figure's name, quantity and painter (each instance)", async () => {
    const [f] = await figuresOf(ids.first);
    await afterWrite(() => ok(callers.cached.owner.patch(`${base}/figures/${f}`, { name: 'Warden captain' })));
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/figures/${f}`, { quantity: 3 })));
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/figures/${f}`, { painterId: painter2Id })));
  });

  it("the painter's own name", async () => {
    await afterWrite(() => ok(callers.fresh.painter.patch('/api/auth/me', { name: 'Painter of reeds' })));
  });

  it("a commission's title, due date and priority", async () => {
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/commissions/${ids.second}`, { title: 'Reed skiff, rigged' })));
    await afterWrite(() => ok(callers.cached.owner.patch(`${base}/commissions/${ids.second}`, { dueDate: '2026-03-03' })));
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/commissions/${ids.first}`, { dueDate: '2026-03-03' })));
    // Same due date: the priority orders them (first before second by id until then).
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/commissions/${ids.first}`, { priority: 'low' })));
  });

  it('a commission leaving the board and coming back (status)', async () => {
    await afterWrite(() => ok(callers.cached.owner.post(`${base}/commissions/${ids.second}/transitions`, { to: 'on_hold' })));
    await afterWrite(() => ok(callers.fresh.owner.post(`${base}/commissions/${ids.second}/transitions`, { to: 'booked' })));
  });

  it("a stage's status, estimate and wait", async () => {
    const [f1, f2] = await figuresOf(ids.first);
    const s1 = await stagesOf(f1);
    await afterWrite(() => ok(callers.fresh.painter.patch(`${base}/stages/${s1[0].id}`, { waitHours: 3 })));
    await afterWrite(() => ok(callers.cached.owner.patch(`${base}/stages/${s1[1].id}`, { estimateHours: 6 })));
    const s2 = await stagesOf(f2);
    await afterWrite(() => ok(callers.fresh.painter.patch(`${base}/stages/${s2[0].id}`, { status: 'working' })));
    await afterWrite(() => ok(callers.cached.painter.patch(`${base}/stages/${s2[0].id}`, { status: 'done' })));
  });

  it("a stage's hazards and column, written straight to the database", async () => {
    const [f1] = await figuresOf(ids.first);
    const s1 = await stagesOf(f1);
    await afterWrite(() => fresh.db('stages').where({ id: s1[1].id }).update({ hazards: '["solvent","spray"]' }));
    await afterWrite(() => fresh.db('stages').where({ id: s1[1].id }).update({ template_key: templateKeys[2] }));
  });

  it('the stage template renamed and reordered', async () => {
    const template = (await ok(callers.cached.owner.get(`${base}/stage-template`))).body as { key: string; name: string; defaultHours: number; waitHours: number; hazards: string[] }[];
    const stages = template.map(({ key, name, defaultHours, waitHours, hazards }) => ({ key, name, defaultHours, waitHours, hazards }));
    await afterWrite(() => ok(callers.fresh.owner.put(`${base}/stage-template`, { stages: stages.map((s, i) => (i === 0 ? { ...s, name: 'Clean and prime' } : s)) })));
    await afterWrite(() => ok(callers.cached.owner.put(`${base}/stage-template`, { stages: [...stages].reverse() })));
  });

  it('a figure added and one removed', async () => {
    await afterWrite(() => ok(callers.fresh.owner.post(`${base}/commissions/${ids.first}/figures`, { name: 'Warden hound', quantity: 2, sizeClass: '28', tier: 'tabletop', painterId }), 201));
    const [, f2] = await figuresOf(ids.third);
    await afterWrite(() => ok(callers.cached.owner.delete(`${base}/figures/${f2}`), 204));
  });

  it('a wait running out as the clock moves, with no write', async () => {
    // The first figure's first stage was done at 09:30 with a wait of 3 hours: it runs until 12:30.
    const waiting = (b: Record<string, unknown>) => JSON.stringify(b).includes('"waitUntil":"2026-03-02T12:30:00.000Z"');
    at('2026-03-02T12:29:00.000Z');
    const before = await boards('cached');
    expect(before).toEqual(await boards('fresh'));
    expect(waiting(before)).toBe(true);
    advance(60_000);
    const after = await boards('cached');
    expect(after).toEqual(await boards('fresh'));
    expect(waiting(after)).toBe(false);
    // And back (a clock set earlier, as two machines' clocks may disagree): the wait shows again.
    at('2026-03-02T12:00:00.000Z');
    const again = await boards('cached');
    expect(again).toEqual(await boards('fresh'));
    expect(waiting(again)).toBe(true);
  });
});

/** The signed-in floor every request makes (session, user, membership; a session's expiry moved on) and the version read. */
const versionReads = (sql: string[]) => sql.filter((s) => /schedule_version/.test(s));
/** What a board request reads beyond the floor and the version: the board itself (page, count, waits, template). */
const boardReads = (sql: string[]) => sql.filter((s) => !/schedule_version/.test(s) && !isFloorRead(s));

describe('reading an unchanged board', () => {
  it('the second identical request reads the version and nothing of the board; the uncached instance reads it all again', async () => {
    for (const s of shapes()) {
      const url = `${base}/board${s}`;
      await ok(callers.fresh.owner.patch(`${base}/commissions/${ids.third}`, { title: `Heron totem ${s.length}` }));
      const first = (await withQueries(cached.db, () => ok(callers.cached.owner.get(url)))).sql;
      const second = (await withQueries(cached.db, () => ok(callers.cached.owner.get(url)))).sql;
      expect(boardReads(first).length).toBeGreaterThanOrEqual(3);
      expect(versionReads(first)).toHaveLength(1);
      expect(boardReads(second)).toEqual([]);
      expect(versionReads(second)).toHaveLength(1);
      expect(second.length).toBeGreaterThanOrEqual(4); // session, user, membership, version: the floor was seen
      const uncached = (await withQueries(fresh.db, () => ok(callers.fresh.owner.get(url)))).sql;
      expect(boardReads(uncached)).toEqual(boardReads(first));
      expect(versionReads(uncached)).toEqual([]);
    }
  });

  it('requests that arrive together after a write share one read', async () => {
    await ok(callers.fresh.owner.patch(`${base}/commissions/${ids.third}`, { title: 'Heron totem, together' }));
    // One CSRF-free GET each; the sessions already exist.
    const { value, sql } = await withQueries(cached.db, () => Promise.all([1, 2, 3, 4, 5].map(() => ok(callers.cached.owner.get(`${base}/board`)))));
    const pageReads = sql.filter((s) => /as materialized/.test(s));
    expect(pageReads).toHaveLength(1);
    for (const r of value) expect(r.body).toEqual(value[0].body);
    expect(value[0].body).toEqual((await ok(callers.fresh.owner.get(`${base}/board`))).body);
  });

  it('never answers one studio with another studio’s board, even at the same version', async () => {
    await cached.db('studios').whereIn('id', [studioId, otherStudioId]).update({ schedule_version: 4242 });
    const a = (await ok(callers.cached.owner.get(`${base}/board`))).body;
    const b = (await ok(callers.cached.otherOwner.get(`/api/studios/${otherStudioId}/board`))).body;
    expect(b).toEqual((await ok(callers.fresh.otherOwner.get(`/api/studios/${otherStudioId}/board`))).body);
    expect(a).toEqual((await ok(callers.fresh.owner.get(`${base}/board`))).body);
    expect(b).not.toEqual(a);
  });
});
