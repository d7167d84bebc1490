import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { userId } from '../support/fixtures';
import { Caller, idOf, PASSWORD, signInAs, startTestApp, twoStudios, withQueries, type TestApp } from '../support/app';
import { secondPainter } from '../support/fixtures';
import { afterEachWrite, bothClocks } from '../support/kept-reads';

// The studio forecast is kept in memory per studio under the schedule version the database moves on
// every write it depends on. Two app instances share one database (one SQLite file, or one PostgreSQL
// database with DATABASE_URL), as docs/scaling.md runs them: `cached` with the forecast cache, `fresh`
// with it off (forecastCacheStages: 0), so every answer of `fresh` is worked out from the database.
// After each kind of write, made through either instance, every consumer of the forecast must answer
// on `cached` exactly what `fresh` answers, and something else than before the write (else the write
// proved nothing). Studio A is in Europe/Berlin (UTC+1 in early March 2026); its painters work
// 09:00–15:00 Monday to Friday; 2026-03-02 is a Monday.

let cached: TestApp;
let fresh: TestApp;
const { at, advance } = bothClocks(() => [cached, fresh]);
let studioId: number;
let otherStudioId: number;
let clientId: number;
let painterId: number;
let painter2Id: number;
let base: string;
type Who = 'owner' | 'painter' | 'client' | 'otherOwner';
const callers: Record<'cached' | 'fresh', Record<Who, Caller>> = { cached: {} as Record<Who, Caller>, fresh: {} as Record<Who, Caller> };
const feeds: { owner: string; painter: string } = { owner: '', painter: '' };
const ids: Record<string, number> = {};



async function commission(sw: TestApp, studio: number, client: number, title: string, status: string, figures: { painter: number | null; stages: { minutes: number; wait?: number }[] }[], due: string | null = null) {
  const now = sw.clock.now().toISOString();
  const c = idOf((await sw.db('commissions').insert({ studio_id: studio, client_id: client, title, status, priority: 'normal', due_date: due, created_at: now, updated_at: now }).returning('id'))[0]);
  for (const [i, f] of figures.entries()) {
    const fig = idOf(
      (await sw.db('figures').insert({ studio_id: studio, commission_id: c, name: `${title} ${i + 1}`, quantity: 1, size_class: '28', tier: 'tabletop', painter_id: f.painter, position: i, created_at: now, updated_at: now }).returning('id'))[0],
    );
    for (const [position, s] of f.stages.entries()) {
      await sw.db('stages').insert({ studio_id: studio, commission_id: c, figure_id: fig, template_key: `s${position}`, name: `Stage ${position + 1}`, position, estimate_minutes: s.minutes, wait_minutes: s.wait ?? 0, updated_at: now });
    }
  }
  return c;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- answers of many shapes, checked by comparing them whole
const ok = async (res: Promise<{ status: number; body: any; text?: string }>, status = 200) => {
  const r = await res;
  if (r.status !== status) throw new Error(`${r.status}: ${JSON.stringify(r.body)}`);
  return r;
};

/** Every answer built on the forecast, from one instance. */
async function everything(on: 'cached' | 'fresh') {
  const c = callers[on];
  const app = on === 'cached' ? cached : fresh;
  const get = async (who: Who, url: string) => (await ok(c[who].get(url))).body;
  const feed = async (token: string) => (await ok(new Caller(app.app).get(new URL(token).pathname))).text;
  return {
    // A short page first: the kept run then holds one place, and the longer pages after it need more.
    firstPlace: await get('owner', `${base}/schedule?limit=1`),
    secondPlace: await get('owner', `${base}/schedule?limit=1&offset=1`),
    schedule: await get('owner', `${base}/schedule`),
    clientSchedule: await get('client', `${base}/schedule`),
    ownerHome: await get('owner', `${base}/dashboard`),
    painterHome: await get('painter', `${base}/dashboard`),
    clientHome: await get('client', `${base}/dashboard`),
    ownerFeed: await feed(feeds.owner),
    painterFeed: await feed(feeds.painter),
    earliestHours: await get('owner', `${base}/schedule/earliest-delivery?hours=3&waitHours=2`),
    earliestQueued: await get('owner', `${base}/schedule/earliest-delivery?commissionId=${ids.second}`),
    earliestQuoted: await get('owner', `${base}/schedule/earliest-delivery?commissionId=${ids.quoted}`),
    otherStudio: await get('otherOwner', `/api/studios/${otherStudioId}/dashboard`),
  };
}

const afterWrite = afterEachWrite(everything);

/** SQL of the queries `run` makes on the cached instance's database. */
const queriesOf = async (run: () => Promise<unknown>) => (await withQueries(cached.db, run)).sql;
/** The forecast's own reads (the queue, hours, days off, figures, stages, closed time), quoted either engine's way. */
const q = '[`"]';
const forecastReadPatterns = [`${q}queue_position${q}`, `from ${q}capacity_hours${q}`, `from ${q}capacity_days_off${q}`, `${q}painter_id${q}, ${q}position${q} from ${q}figures${q}`, `${q}wait_minutes${q}`, `sum\\(${q}minutes${q}\\)`].map(
  (p) => new RegExp(p),
);
const forecastReads = (sql: string[]) => sql.filter((s) => forecastReadPatterns.some((p) => p.test(s)));
/** Reads only a forecast run makes (earliest delivery of a commission not queued reads its own figures and stages). */
const runOnlyReads = (sql: string[]) => forecastReads(sql).filter((s) => /capacity_hours|capacity_days_off|status. in/.test(s));
const readsAllOfTheForecast = (sql: string[]) => forecastReadPatterns.every((p) => sql.some((s) => p.test(s)));

beforeAll(async () => {
  cached = await startTestApp();
  fresh = await startTestApp({ dataDir: cached.dataDir, forecastCacheStages: 0 });
  at('2026-03-02T09:30:20.000Z'); // Monday 10:30:20 in Berlin, inside the working day and not on a minute
  const { a, b } = await twoStudios(cached);
  studioId = a.studioId;
  otherStudioId = b.studioId;
  clientId = a.clientId;
  base = `/api/studios/${studioId}`;
  painterId = await userId(cached, 'painter-a@studio.test');
  await secondPainter(cached, a.owner, studioId, 'painter2-a@studio.test');
  painter2Id = await userId(cached, 'painter2-a@studio.test');
  callers.cached = { owner: a.owner, painter: a.painter, client: a.client, otherOwner: b.owner };
  callers.fresh = {
    owner: await signInAs(fresh, 'owner-a@studio.test', PASSWORD),
    painter: await signInAs(fresh, 'painter-a@studio.test', PASSWORD),
    client: await signInAs(fresh, 'client-a@studio.test', PASSWORD),
    otherOwner: await signInAs(fresh, 'owner-b@studio.test', PASSWORD),
  };
  const days = Object.fromEntries([1, 2, 3, 4, 5].map((d) => [String(d), [{ start: '09:00', end: '15:00' }]]));
  for (const p of [painterId, painter2Id]) await ok(a.owner.put(`${base}/capacity/painters/${p}/hours`, { hours: days }));
  const otherPainter = await userId(cached, 'painter-b@studio.test');
  await ok(b.owner.put(`/api/studios/${otherStudioId}/capacity/painters/${otherPainter}/hours`, { hours: days }));

  ids.first = await commission(cached, studioId, clientId, 'Marsh wardens', 'on_bench', [{ painter: painterId, stages: [{ minutes: 120, wait: 60 }, { minutes: 240 }] }], '2026-03-04');
  ids.second = await commission(cached, studioId, clientId, 'Reed skiff', 'booked', [{ painter: null, stages: [{ minutes: 180 }, { minutes: 120 }] }], '2026-03-03');
  ids.third = await commission(cached, studioId, clientId, 'Heron totem', 'booked', [
    { painter: painterId, stages: [{ minutes: 60 }] },
    { painter: painter2Id, stages: [{ minutes: 90, wait: 24 * 60 }] },
  ]);
  ids.quoted = await commission(cached, studioId, clientId, 'Peat golem', 'quoted', [{ painter: painter2Id, stages: [{ minutes: 300 }] }]);
  ids.other = await commission(cached, otherStudioId, b.clientId, 'Salt barge', 'booked', [{ painter: otherPainter, stages: [{ minutes: 300 }] }], '2026-03-05');
  feeds.owner = (await ok(a.owner.post(`${base}/calendar-feed`), 201)).body.url;
  feeds.painter = (await ok(a.painter.post(`${base}/calendar-feed`), 201)).body.url;
});
afterAll(async () => {
  await fresh?.stop();
  await cached?.stop();
});

const stagesOf = async (commissionId: number) => (await cached.db('stages').where({ commission_id: commissionId }).orderBy([{ column: 'figure_id' }, { column: 'position' }]).select('id', 'figure_id')) as { id: number; figure_id: number }[];

describe('the kept forecast after each write it depends on', () => {
  it('answers as a fresh computation does from the start, for every consumer', async () => {
    const a = await everything('cached');
    expect(a).toEqual(await everything('fresh'));
    // The timeline has all three queued commissions, and the forecast runs as of the start of the minute.
    expect((a.schedule as { commissions: unknown[]; now: string }).commissions).toHaveLength(3);
    expect((a.schedule as { now: string }).now).toBe('2026-03-02T09:30:00.000Z');
  });

  it('a stage ticked done', async () => {
    const [s] = await stagesOf(ids.first);
    await afterWrite(() => ok(callers.cached.painter.patch(`${base}/stages/${s.id}`, { status: 'done' })));
  });

  it("a stage's estimate changed (on the other instance)", async () => {
    const [, s] = await stagesOf(ids.second);
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/stages/${s.id}`, { estimateHours: 7.5 })));
  });

  it('a stage whose wait changed', async () => {
    const [s] = await stagesOf(ids.third);
    await afterWrite(() => ok(callers.cached.owner.patch(`${base}/stages/${s.id}`, { waitHours: 30 })));
  });

  it('a figure added', async () => {
    await afterWrite(() => ok(callers.fresh.owner.post(`${base}/commissions/${ids.third}/figures`, { name: 'Heron chick', quantity: 2, sizeClass: '28', tier: 'tabletop', painterId: painter2Id }), 201));
  });

  it('a figure given to another painter', async () => {
    const [s] = await stagesOf(ids.second);
    await afterWrite(() => ok(callers.cached.owner.patch(`${base}/figures/${s.figure_id}`, { painterId: painter2Id })));
  });

  it('a figure removed', async () => {
    const figures = [...new Set((await stagesOf(ids.third)).map((s) => s.figure_id))];
    await afterWrite(() => ok(callers.cached.owner.delete(`${base}/figures/${figures[0]}`), 204));
  });

  it('the queue reordered (on the other instance)', async () => {
    await afterWrite(() => ok(callers.fresh.owner.put(`${base}/schedule/queue`, { commissionIds: [ids.third, ids.second, ids.first] })));
  });

  it("a commission's due date changed", async () => {
    await afterWrite(() => ok(callers.cached.owner.patch(`${base}/commissions/${ids.third}`, { dueDate: '2026-03-03' })));
  });

  it("a client's name changed", async () => {
    await afterWrite(() => ok(callers.fresh.owner.patch(`${base}/clients/${clientId}`, { name: 'Client of the marsh' })));
  });

  it('a commission leaving the queue and coming back (status changes)', async () => {
    await afterWrite(() => ok(callers.cached.owner.post(`${base}/commissions/${ids.second}/transitions`, { to: 'on_hold' })));
    await afterWrite(() => ok(callers.fresh.owner.post(`${base}/commissions/${ids.second}/transitions`, { to: 'booked' })));
  });

  it("a painter's hours changed", async () => {
    const hours = Object.fromEntries([1, 2, 3, 4].map((d) => [String(d), [{ start: '10:00', end: '14:00' }]]));
    await afterWrite(() => ok(callers.cached.painter.put(`${base}/capacity/painters/${painterId}/hours`, { hours })));
  });

  it('a day off added, and taken away again (on the other instance)', async () => {
    await afterWrite(() => ok(callers.cached.owner.post(`${base}/capacity/days-off`, { userId: painterId, kind: 'day_off', from: '2026-03-03', to: '2026-03-03' }), 201));
    const [row] = await cached.db('capacity_days_off').where({ studio_id: studioId }).select('id');
    await afterWrite(() => ok(callers.fresh.owner.delete(`${base}/capacity/days-off/${row.id}`), 204));
  });

  it('a studio closed day', async () => {
    await afterWrite(() => ok(callers.fresh.owner.post(`${base}/capacity/days-off`, { userId: null, kind: 'closed', from: '2026-03-04', to: '2026-03-04' }), 201));
  });

  it('time logged by hand', async () => {
    const [, s] = await stagesOf(ids.first);
    await afterWrite(() => ok(callers.cached.painter.post(`${base}/stages/${s.id}/time`, { hours: 1.5 }), 201));
  });

  it('a timer stopped', async () => {
    const [, s] = await stagesOf(ids.first);
    await ok(callers.cached.painter.post(`${base}/stages/${s.id}/timer`), 201);
    advance(45 * 60_000);
    // The running timer counts for nothing yet; stopping it closes 45 minutes on the stage.
    await afterWrite(() => ok(callers.fresh.painter.post(`${base}/timer/stop`)));
  });

  it("a painter's name changed", async () => {
    await afterWrite(() => ok(callers.fresh.painter.patch('/api/auth/me', { name: 'Painter of reeds' })));
  });

  it('a painter leaving the studio (their figures stay, unplaced)', async () => {
    await afterWrite(() => ok(callers.cached.owner.delete(`${base}/members/${painter2Id}`), 204));
  });

  it("the studio's time zone changed", async () => {
    await afterWrite(() => ok(callers.fresh.owner.patch(base, { timezone: 'Europe/Lisbon' })));
  });

  it('writes made straight to the database (no app code) as well', async () => {
    const [s] = await stagesOf(ids.second);
    await afterWrite(() => fresh.db('stages').where({ id: s.id }).update({ estimate_minutes: 600 }));
  });
});

describe('reading an unchanged studio', () => {
  it('the second read reads only the version, not the work', async () => {
    at('2026-03-09T10:15:05.000Z');
    for (const who of ['client', 'owner', 'painter'] as const) {
      const url = `${base}/dashboard`;
      await ok(callers.fresh.owner.patch(`${base}/commissions/${ids.first}`, { dueDate: who === 'owner' ? '2026-03-11' : who === 'client' ? '2026-03-12' : '2026-03-13' }));
      const first = await queriesOf(() => ok(callers.cached[who].get(url)));
      const second = await queriesOf(() => ok(callers.cached[who].get(url)));
      expect(readsAllOfTheForecast(first)).toBe(true);
      expect(forecastReads(second)).toEqual([]);
      expect(second.length).toBeLessThan(first.length);
      expect(second.filter((s) => /schedule_version/.test(s))).toHaveLength(1);
    }
  });

  it('a later second in the same minute keeps the answer; the next minute works it out again', async () => {
    at('2026-03-09T10:20:10.000Z'); // Monday 10:20 in Lisbon (UTC+0 until the end of March): painters at work
    const first = await everything('cached');
    expect(first).toEqual(await everything('fresh'));
    advance(30_000);
    let later: typeof first | undefined;
    const sql = await queriesOf(async () => (later = await everything('cached')));
    expect(runOnlyReads(sql)).toEqual([]);
    expect(later).toEqual(await everything('fresh'));
    expect(later!.schedule).toEqual(first.schedule);
    expect(later!.ownerHome).toEqual(first.ownerHome);
    advance(60_000);
    const next = await everything('cached');
    expect(next).toEqual(await everything('fresh'));
    expect(next).not.toEqual(first);
  });

  it('the team’s timeline text kept per query: the same text as a fresh instance with queries in turn, for owner and painter, and a write moves it', async () => {
    at('2026-03-09T11:40:10.000Z');
    const text = async (on: 'cached' | 'fresh', who: Who, url: string) => (await ok(callers[on][who].get(url))).text!;
    // Three queries in turn, twice (more than the two texts kept beside a run), and a client between them.
    const urls = [`${base}/schedule`, `${base}/schedule?limit=1&offset=1`, `${base}/schedule?weeks=2&from=2026-03-16`];
    const seen: string[] = [];
    for (let round = 0; round < 2; round++) {
      for (const url of urls) {
        const owner = await text('cached', 'owner', url);
        expect(owner).toBe(await text('fresh', 'owner', url));
        expect(await text('cached', 'painter', url)).toBe(owner);
        expect(await text('cached', 'client', url)).toBe(await text('fresh', 'client', url));
        if (round === 0) seen.push(owner);
        else expect(owner).toBe(seen[urls.indexOf(url)]);
      }
    }
    expect(new Set(seen).size).toBe(3);
    // A write on the other instance: the kept text is not answered again.
    await ok(callers.fresh.owner.patch(`${base}/commissions/${ids.second}`, { dueDate: '2026-03-20' }));
    const after = await text('cached', 'owner', urls[0]);
    expect(after).not.toBe(seen[0]);
    expect(after).toBe(await text('fresh', 'owner', urls[0]));
    expect(after).toContain('"dueDate":"2026-03-20"');
  });

  it('the next day gives the next day’s forecast', async () => {
    at('2026-03-09T18:00:00.000Z');
    const monday = await everything('cached');
    advance(24 * 3_600_000);
    const tuesday = await everything('cached');
    expect(tuesday).toEqual(await everything('fresh'));
    expect((monday.ownerHome as { today: string }).today).toBe('2026-03-09');
    expect((tuesday.ownerHome as { today: string }).today).toBe('2026-03-10');
    expect((tuesday.clientHome as { today: string }).today).toBe('2026-03-10');
  });

  it('never answers one studio with another studio’s forecast, even at the same version', async () => {
    await cached.db('studios').whereIn('id', [studioId, otherStudioId]).update({ schedule_version: 4242 });
    const a = (await ok(callers.cached.owner.get(`${base}/dashboard`))).body;
    const b = (await ok(callers.cached.otherOwner.get(`/api/studios/${otherStudioId}/dashboard`))).body;
    expect(b).toEqual((await ok(callers.fresh.otherOwner.get(`/api/studios/${otherStudioId}/dashboard`))).body);
    expect(a).toEqual((await ok(callers.fresh.owner.get(`${base}/dashboard`))).body);
    expect(b).not.toEqual(a);
  });
});

describe('the schedule version under concurrent writes', () => {
  it('a queue reordered while stages of the same studio change: every write succeeds, and the version moves', async () => {
    const queue = async () => ((await ok(callers.cached.owner.get(`${base}/schedule`))).body as { commissions: { id: number }[] }).commissions.map((c) => c.id);
    const stages = [...(await stagesOf(ids.first)), ...(await stagesOf(ids.second)), ...(await stagesOf(ids.third))];
    const version = async () => Number((await cached.db('studios').where({ id: studioId }).first('schedule_version')).schedule_version);
    const before = await version();
    // One CSRF token per session before the burst (requests racing to make the first would overwrite it).
    await callers.cached.owner.csrf();
    await callers.fresh.owner.csrf();
    for (let round = 0; round < 4; round++) {
      const order = await queue();
      const answers = await Promise.all([
        callers.cached.owner.put(`${base}/schedule/queue`, { commissionIds: [...order].reverse() }),
        ...stages.map((s, i) => (i % 2 ? callers.fresh : callers.cached).owner.patch(`${base}/stages/${s.id}`, { estimateHours: 1 + round + i / 4 })),
        callers.fresh.owner.put(`${base}/capacity/painters/${painterId}/hours`, { hours: { 1: [{ start: '09:00', end: `${12 + round}:00` }] } }),
      ]);
      expect(answers.map((a) => a.status)).toEqual(answers.map(() => 200));
    }
    expect(await version()).toBeGreaterThan(before);
    expect(await everything('cached')).toEqual(await everything('fresh'));
  });
});
