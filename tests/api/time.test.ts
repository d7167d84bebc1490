import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HOUR } from '../../server/lib/clock';
import { Caller, PASSWORD, startTestApp, twoStudios, type TestApp } from '../support/app';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let A: string;
let painterAId: number;

type Stage = { id: number; loggedHours: number; status: string };
let c: { id: number; figures: { id: number; stages: Stage[] }[] };

const MIN = 60_000;

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  A = `/api/studios/${s.a.studioId}`;
  painterAId = (await s.a.painter.get('/api/auth/me')).body.user.id;
  const res = await s.a.owner.post(`${A}/commissions`, {
    clientId: s.a.clientId,
    title: 'Time test',
    figures: [
      { name: 'Peat wardens', quantity: 4, sizeClass: '32', tier: 'enhanced' },
      { name: 'Reed witch', quantity: 1, sizeClass: '40', tier: 'display' },
    ],
  });
  c = res.body;
  for (const to of ['quoted', 'booked', 'on_bench']) await s.a.owner.post(`${A}/commissions/${c.id}/transitions`, { to });
});
afterAll(() => sw.stop());

const detail = async () => (await s.a.owner.get(`${A}/commissions/${c.id}`)).body;

describe('the timer', () => {
  it('runs on the server: start, survive a reload, a second start stops the first, stop, totals', async () => {
    const [w1, w2] = c.figures[0].stages;
    const started = await s.a.painter.post(`${A}/stages/${w1.id}/timer`);
    expect(started.status).toBe(201);
    expect(started.body).toMatchObject({
      stageId: w1.id,
      source: 'timer',
      startedAt: sw.clock.now().toISOString(),
      endedAt: null,
      hours: null,
      user: { id: painterAId, name: 'Painter a' },
      stage: { id: w1.id, name: 'Prep & clean' },
      figure: { id: c.figures[0].id, name: 'Peat wardens' },
      commission: { id: c.id, title: 'Time test' },
    });
    // a stage still to do becomes working when its timer starts
    expect((await detail()).figures[0].stages[0].status).toBe('working');

    sw.clock.advance(45 * MIN);
    // another device (a fresh session) sees the same running timer
    const phone = new Caller(sw.app);
    await phone.post('/api/auth/login', { email: 'painter-a@studio.test', password: PASSWORD });
    const seen = await phone.get(`${A}/timer`);
    expect(seen.body.running).toMatchObject({ id: started.body.id, stageId: w1.id, endedAt: null });

    const second = await phone.post(`${A}/stages/${w2.id}/timer`);
    expect(second.status).toBe(201);
    expect(second.body.stageId).toBe(w2.id);
    const first = await s.a.painter.get(`${A}/stages/${w1.id}/time`);
    expect(first.body).toEqual([expect.objectContaining({ id: started.body.id, hours: 0.75, endedAt: sw.clock.now().toISOString() })]);
    expect((await s.a.painter.get(`${A}/timer`)).body.running.id).toBe(second.body.id);
    expect(await sw.db('time_entries').where({ user_id: painterAId }).whereNull('ended_at').count({ n: '*' }).first()).toEqual({ n: 1 });

    // starting the timer that already runs keeps it
    expect((await s.a.painter.post(`${A}/stages/${w2.id}/timer`)).body.id).toBe(second.body.id);

    sw.clock.advance(90 * MIN);
    const stopped = await s.a.painter.post(`${A}/timer/stop`);
    expect(stopped.status).toBe(200);
    expect(stopped.body).toMatchObject({ id: second.body.id, hours: 1.5, endedAt: sw.clock.now().toISOString() });
    expect((await s.a.painter.get(`${A}/timer`)).body).toEqual({ running: null });
    const none = await s.a.painter.post(`${A}/timer/stop`);
    expect(none.status).toBe(409);
    expect(none.body.error.code).toBe('no_timer');

    const d = await detail();
    expect(d.figures[0].stages[0].loggedHours).toBe(0.75);
    expect(d.figures[0].stages[1].loggedHours).toBe(1.5);
    expect(d.figures[0].loggedHours).toBe(2.25);
    expect(d.loggedHours).toBe(2.25);
    const act = (await s.a.owner.get(`${A}/commissions/${c.id}/activity`)).body.filter((e: { action: string }) => e.action === 'time.added');
    expect(act.map((e: { summary: string }) => e.summary)).toEqual([
      'Painter a logged 1.5 h on Assembly of “Peat wardens” with the timer.',
      'Painter a logged 0.75 h on Prep & clean of “Peat wardens” with the timer.',
    ]);
  });

  it("each person has their own timer; the owner's does not stop the painter's", async () => {
    const st = c.figures[1].stages[0];
    await s.a.painter.post(`${A}/stages/${st.id}/timer`);
    await s.a.owner.post(`${A}/stages/${st.id}/timer`);
    expect((await s.a.painter.get(`${A}/timer`)).body.running.stageId).toBe(st.id);
    expect((await s.a.owner.get(`${A}/timer`)).body.running.stageId).toBe(st.id);
    sw.clock.advance(30 * MIN);
    await s.a.painter.post(`${A}/timer/stop`);
    sw.clock.advance(30 * MIN);
    await s.a.owner.post(`${A}/timer/stop`);
    const entries = (await s.a.owner.get(`${A}/stages/${st.id}/time`)).body;
    expect(entries.map((e: { user: { name: string }; hours: number }) => [e.user.name, e.hours])).toEqual([
      ['Painter a', 0.5],
      ['Test Person', 1],
    ]);
  });

  it('starting timers from two devices at the same moment leaves one running', async () => {
    const [first, second] = c.figures[1].stages.slice(1, 3);
    const phone = new Caller(sw.app);
    await phone.post('/api/auth/login', { email: 'painter-a@studio.test', password: PASSWORD });
    // On PostgreSQL the two requests' transactions run side by side (SQLite takes them one after the other).
    const answers = await Promise.all([s.a.painter.post(`${A}/stages/${first.id}/timer`), phone.post(`${A}/stages/${second.id}/timer`), s.a.painter.post(`${A}/stages/${first.id}/timer`)]);
    for (const r of answers) expect(r.status, JSON.stringify(r.body)).toBeLessThan(300);
    const running = await sw.db('time_entries').where({ user_id: painterAId }).whereNull('ended_at');
    expect(running).toHaveLength(1);
    await s.a.painter.post(`${A}/timer/stop`);
  });
});

describe('manual entries', () => {
  it('adds time by hours, on today or a past date, never a future one', async () => {
    const st = c.figures[1].stages[2];
    const today = await s.a.painter.post(`${A}/stages/${st.id}/time`, { hours: 1.25, note: 'Two thin coats' });
    expect(today.status).toBe(201);
    expect(today.body).toMatchObject({ source: 'manual', hours: 1.25, note: 'Two thin coats', endedAt: sw.clock.now().toISOString() });
    expect(new Date(today.body.endedAt).getTime() - new Date(today.body.startedAt).getTime()).toBe(75 * MIN);
    const past = await s.a.painter.post(`${A}/stages/${st.id}/time`, { hours: 0.5, date: '2026-02-20' });
    expect(past.status).toBe(201);
    // noon in the studio's timezone (Europe/Berlin, UTC+1 in February)
    expect(past.body.startedAt).toBe('2026-02-20T11:00:00.000Z');
    const future = await s.a.painter.post(`${A}/stages/${st.id}/time`, { hours: 0.5, date: '2099-01-01' });
    expect(future.status).toBe(400);
    expect(future.body.error.fields).toEqual({ date: 'Time cannot be logged on a future date.' });
    const bad = await s.a.painter.post(`${A}/stages/${st.id}/time`, { hours: 25, date: '20-02-2026' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toEqual({ hours: 'Use at most 24 hours.', date: 'Use a date such as 2026-05-31.' });
    expect((await s.a.painter.post(`${A}/stages/${st.id}/time`, { hours: 0 })).body.error.fields).toEqual({ hours: 'Use at least 0.01 hours.' });
    expect((await s.a.painter.post(`${A}/stages/999999/time`, { hours: 1 })).status).toBe(404);
    const d = await detail();
    expect(d.figures[1].stages[2].loggedHours).toBe(1.75);
  });

  it('edits are logged; only the author or an owner may change or delete an entry', async () => {
    const st = c.figures[1].stages[3];
    const mine = (await s.a.painter.post(`${A}/stages/${st.id}/time`, { hours: 1 })).body;
    const owners = (await s.a.owner.post(`${A}/stages/${st.id}/time`, { hours: 2 })).body;
    const edit = await s.a.painter.patch(`${A}/time/${mine.id}`, { hours: 1.5, note: 'Forgot the glaze' });
    expect(edit.status).toBe(200);
    expect(edit.body).toMatchObject({ hours: 1.5, note: 'Forgot the glaze' });
    expect((await s.a.painter.patch(`${A}/time/${owners.id}`, { hours: 0.5 })).status).toBe(403);
    expect((await s.a.painter.delete(`${A}/time/${owners.id}`)).status).toBe(403);
    expect((await s.a.owner.patch(`${A}/time/${mine.id}`, { hours: 1.25 })).status).toBe(200);
    expect((await s.a.owner.delete(`${A}/time/${owners.id}`)).status).toBe(204);
    expect((await s.a.owner.delete(`${A}/time/${owners.id}`)).status).toBe(404);
    const list = (await s.a.owner.get(`${A}/stages/${st.id}/time`)).body;
    expect(list.map((e: { id: number; hours: number }) => [e.id, e.hours])).toEqual([[mine.id, 1.25]]);
    const act = (await s.a.owner.get(`${A}/commissions/${c.id}/activity`)).body.map((e: { summary: string }) => e.summary);
    expect(act.slice(0, 3)).toEqual([
      'Test Person deleted a time entry of 2 h on Basecoat of “Reed witch”.',
      'Test Person edited a time entry on Basecoat of “Reed witch” (1.5 h → 1.25 h).',
      'Painter a edited a time entry on Basecoat of “Reed witch” (1 h → 1.5 h).',
    ]);
    expect((await s.a.painter.patch(`${A}/time/${mine.id}`, { hours: 'lots' })).body.error.fields).toEqual({ hours: 'Enter hours as a number.' });
  });

  it('a running timer cannot have its hours edited, and a closed commission takes no more time', async () => {
    const st = c.figures[1].stages[4];
    const run = (await s.a.painter.post(`${A}/stages/${st.id}/timer`)).body;
    const edit = await s.a.painter.patch(`${A}/time/${run.id}`, { hours: 2 });
    expect(edit.status).toBe(409);
    expect(edit.body.error.code).toBe('timer_running');
    sw.clock.advance(HOUR);
    await s.a.painter.post(`${A}/timer/stop`);

    const other = await s.a.owner.post(`${A}/commissions`, { clientId: s.a.clientId, title: 'Soon closed', figures: [{ name: 'Moss cairn', quantity: 1, sizeClass: '50', tier: 'tabletop' }] });
    const stage = other.body.figures[0].stages[0];
    const entry = (await s.a.painter.post(`${A}/stages/${stage.id}/time`, { hours: 1 })).body;
    await s.a.owner.post(`${A}/commissions/${other.body.id}/transitions`, { to: 'cancelled', reason: 'Changed their mind' });
    for (const res of [
      await s.a.painter.post(`${A}/stages/${stage.id}/timer`),
      await s.a.painter.post(`${A}/stages/${stage.id}/time`, { hours: 1 }),
      await s.a.painter.patch(`${A}/time/${entry.id}`, { hours: 2 }),
      await s.a.painter.patch(`${A}/stages/${stage.id}`, { status: 'done' }),
    ]) {
      expect(res.status).toBe(409);
      expect(res.body.error.code).toBe('commission_locked');
    }
  });

  it("another studio cannot see or change this studio's time", async () => {
    const st = c.figures[0].stages[0];
    const [entry] = (await s.a.owner.get(`${A}/stages/${st.id}/time`)).body;
    const B = `/api/studios/${s.b.studioId}`;
    expect((await s.b.owner.get(`${B}/stages/${st.id}/time`)).status).toBe(404);
    expect((await s.b.owner.patch(`${B}/time/${entry.id}`, { hours: 9 })).status).toBe(404);
    expect((await s.b.owner.delete(`${B}/time/${entry.id}`)).status).toBe(404);
    expect((await s.b.painter.get(`${A}/timer`)).status).toBe(404);
    expect((await s.a.owner.get(`${A}/stages/${st.id}/time`)).body[0].hours).toBe(entry.hours);
  });
});
