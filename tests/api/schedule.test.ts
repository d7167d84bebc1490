import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { secondClient, userId } from '../support/fixtures';
import { idOf, startTestApp, twoStudios, type Caller, type TestApp } from '../support/app';

// The forecast endpoint from database rows, with hand-worked dates. Studio A is in Europe/Berlin; its
// painter works 09:00–15:00 Monday to Friday. In March 2026 Berlin is on UTC+1 until Sunday the 29th
// (then UTC+2), so 09:00–15:00 local is 08:00Z–14:00Z before and 07:00Z–13:00Z after. 2026-03-02 is a Monday.
// Commission A: paint 8 h, then varnish 2 h followed by 24 h of curing. Commission B: paint 4 h.

let sw: TestApp;
let owner: Caller;
let painter: Caller;
let client: Caller;
let studioId: number;
let clientId: number;
let painterId: number;
let base: string;


async function commission(title: string, stages: { key: string; minutes: number; wait?: number; status?: string; doneAt?: string }[], over: Record<string, unknown> = {}) {
  const now = sw.clock.now().toISOString();
  const c = idOf(
    (await sw.db('commissions').insert({ studio_id: studioId, client_id: clientId, title, status: 'booked', priority: 'normal', created_at: now, updated_at: now, ...over }).returning('id'))[0],
  );
  const f = idOf(
    (
      await sw
        .db('figures')
        .insert({ studio_id: studioId, commission_id: c, name: `${title} figure`, quantity: 1, size_class: '28', tier: 'tabletop', painter_id: painterId, created_at: now, updated_at: now })
        .returning('id')
    )[0],
  );
  const stageIds: number[] = [];
  for (const [position, s] of stages.entries()) {
    const [row] = await sw
      .db('stages')
      .insert({
        studio_id: studioId,
        commission_id: c,
        figure_id: f,
        template_key: s.key,
        name: s.key,
        position,
        status: s.status ?? 'todo',
        estimate_minutes: s.minutes,
        wait_minutes: s.wait ?? 0,
        done_at: s.doneAt ?? null,
        updated_at: now,
      })
      .returning('id');
    stageIds.push(idOf(row));
  }
  return { id: c, figureId: f, stageIds };
}

const schedule = async (who: Caller = owner) => {
  const res = await who.get(`${base}/schedule`);
  expect(res.status).toBe(200);
  return res.body as { commissions: { id: number; title: string; start: string; finish: string; finishDate: string; late: boolean; slackDays: number | null; queuePosition: number | null; figures: { blocks?: { start: string; end: string; stageName: string }[]; painter: unknown }[] }[] };
};
const byTitle = async (who: Caller = owner) => Object.fromEntries((await schedule(who)).commissions.map((c) => [c.title, c]));

beforeAll(async () => {
  sw = await startTestApp();
  const { a } = await twoStudios(sw);
  ({ owner, painter, client, studioId, clientId } = a);
  painterId = await userId(sw, 'painter-a@studio.test');
  base = `/api/studios/${studioId}`;
  const days = Object.fromEntries([1, 2, 3, 4, 5].map((d) => [String(d), [{ start: '09:00', end: '15:00' }]]));
  const res = await owner.put(`${base}/capacity/painters/${painterId}/hours`, { hours: days });
  expect(res.status).toBe(200);
});
afterAll(() => sw.stop());

beforeEach(async () => {
  await sw.db('commissions').where({ studio_id: studioId }).delete();
  await sw.db('capacity_days_off').where({ studio_id: studioId }).delete();
  sw.clock.set('2026-03-02T07:00:00.000Z'); // Monday 08:00 in Berlin, before the working day
});

const A = () => commission('A', [{ key: 'paint', minutes: 480 }, { key: 'varnish', minutes: 120, wait: 1440 }], { due_date: '2026-03-04' });
const B = () => commission('B', [{ key: 'paint', minutes: 240 }], { due_date: '2026-03-05' });

describe('GET /schedule: the forecast from the database', () => {
  it('books A then B into the painter’s hours; A is ready when its varnish has cured, B works while it cures', async () => {
    await A();
    await B();
    const s = await byTitle();
    // A paint Mon 08–14Z (6 h) + Tue 08–10Z (2 h); varnish Tue 10–12Z; cured 24 h later, Wed 12:00Z.
    expect(s.A.figures[0].blocks!.map((b) => [b.stageName, b.start, b.end])).toEqual([
      ['paint', '2026-03-02T08:00:00.000Z', '2026-03-02T14:00:00.000Z'],
      ['paint', '2026-03-03T08:00:00.000Z', '2026-03-03T10:00:00.000Z'],
      ['varnish', '2026-03-03T10:00:00.000Z', '2026-03-03T12:00:00.000Z'],
    ]);
    expect([s.A.start, s.A.finish, s.A.finishDate, s.A.late, s.A.slackDays]).toEqual(['2026-03-02T08:00:00.000Z', '2026-03-04T12:00:00.000Z', '2026-03-04', false, 0]);
    // B Tue 12–14Z (2 h) + Wed 08–10Z (2 h).
    expect([s.B.start, s.B.finish, s.B.finishDate, s.B.late, s.B.slackDays]).toEqual(['2026-03-03T12:00:00.000Z', '2026-03-04T10:00:00.000Z', '2026-03-04', false, 1]);
    expect([s.A.queuePosition, s.B.queuePosition]).toEqual([1, 2]);
  });

  it('a day off on Tuesday moves both one working day later, and A becomes late', async () => {
    await A();
    await B();
    const off = await painter.post(`${base}/capacity/days-off`, { userId: painterId, kind: 'day_off', from: '2026-03-03', to: '2026-03-03' });
    expect(off.status).toBe(201);
    const s = await byTitle();
    // A paint Mon 08–14Z + Wed 08–10Z; varnish Wed 10–12Z; cured Thu 12:00Z, after its due date (Wed).
    expect([s.A.finish, s.A.finishDate, s.A.late, s.A.slackDays]).toEqual(['2026-03-05T12:00:00.000Z', '2026-03-05', true, -1]);
    // B Wed 12–14Z + Thu 08–10Z: Thursday, its due date, so on time.
    expect([s.B.finish, s.B.finishDate, s.B.late]).toEqual(['2026-03-05T10:00:00.000Z', '2026-03-05', false]);
  });

  it('a studio closed day has the same effect', async () => {
    await A();
    await B();
    expect((await owner.post(`${base}/capacity/days-off`, { userId: null, kind: 'closed', from: '2026-03-03', to: '2026-03-03', note: 'Town festival' })).status).toBe(201);
    const s = await byTitle();
    expect([s.A.finish, s.B.finish]).toEqual(['2026-03-05T12:00:00.000Z', '2026-03-05T10:00:00.000Z']);
  });

  it('reordering the queue changes the forecast, and the order is kept', async () => {
    const a = await A();
    const b = await B();
    const res = await owner.put(`${base}/schedule/queue`, { commissionIds: [b.id, a.id] });
    expect(res.status).toBe(200);
    expect(res.body.commissions.map((c: { title: string }) => c.title)).toEqual(['B', 'A']);
    const s = await byTitle();
    // B first: Mon 08–12Z. A paint Mon 12–14Z + Tue 08–14Z; varnish Wed 08–10Z; cured Thu 10:00Z: late.
    expect(s.B.finish).toBe('2026-03-02T12:00:00.000Z');
    expect([s.A.start, s.A.finish, s.A.late]).toEqual(['2026-03-02T12:00:00.000Z', '2026-03-05T10:00:00.000Z', true]);
    expect([s.B.queuePosition, s.A.queuePosition]).toEqual([1, 2]);
  });

  it('refuses an order that does not hold exactly the queue', async () => {
    const a = await A();
    const b = await B();
    const missing = await owner.put(`${base}/schedule/queue`, { commissionIds: [a.id] });
    expect(missing.status).toBe(409);
    expect(missing.body.error.code).toBe('queue_changed');
    expect(missing.body.error.queue).toEqual([a.id, b.id]);
    expect((await owner.put(`${base}/schedule/queue`, { commissionIds: [a.id, a.id, b.id] })).status).toBe(400);
    expect((await painter.put(`${base}/schedule/queue`, { commissionIds: [b.id, a.id] })).status).toBe(403);
  });

  it('counts only the time not yet logged, and waits out a stage finished earlier', async () => {
    // A's paint has 2 h logged: 6 h left, Mon 08–14Z; varnish Tue 08–10Z; cured Wed 10:00Z.
    const a = await A();
    const logged = await painter.post(`${base}/stages/${a.stageIds[0]}/time`, { hours: 2 });
    expect(logged.status).toBe(201);
    // C was primed (done) Monday 07:00Z and must dry 3 h: its basecoat (1 h) may start at 10:00Z, but the
    // painter is on A all Monday (08–14Z) and Tuesday 08–10Z, so C's basecoat goes Tue 10–11Z.
    await commission('C', [
      { key: 'prime', minutes: 30, wait: 180, status: 'done', doneAt: '2026-03-02T07:00:00.000Z' },
      { key: 'basecoat', minutes: 60 },
    ]);
    const s = await byTitle();
    expect(s.A.finish).toBe('2026-03-04T10:00:00.000Z');
    expect(s.C.figures[0].blocks!.map((b) => [b.stageName, b.start, b.end])).toEqual([['basecoat', '2026-03-03T10:00:00.000Z', '2026-03-03T11:00:00.000Z']]);
  });

  it('keeps 09:00 local across the clock change at the end of March', async () => {
    sw.clock.set('2026-03-27T08:00:00.000Z'); // Friday 09:00 CET
    await A();
    const s = await byTitle();
    // Fri 08–14Z (6 h); Monday 30th is summer time: 09:00 CEST = 07:00Z. Paint 07–09Z, varnish 09–11Z; cured Tue 11:00Z.
    expect(s.A.figures[0].blocks!.map((b) => [b.start, b.end])).toEqual([
      ['2026-03-27T08:00:00.000Z', '2026-03-27T14:00:00.000Z'],
      ['2026-03-30T07:00:00.000Z', '2026-03-30T09:00:00.000Z'],
      ['2026-03-30T09:00:00.000Z', '2026-03-30T11:00:00.000Z'],
    ]);
    expect([s.A.finish, s.A.finishDate]).toEqual(['2026-03-31T11:00:00.000Z', '2026-03-31']);
  });

  it('leaves out enquiries, quotes, held and finished commissions', async () => {
    await A();
    await commission('Held', [{ key: 'paint', minutes: 60 }], { status: 'on_hold', status_before_hold: 'booked' });
    await commission('Quoted', [{ key: 'paint', minutes: 60 }], { status: 'quoted' });
    await commission('Ready', [{ key: 'paint', minutes: 60, status: 'done', doneAt: '2026-03-01T10:00:00.000Z' }], { status: 'ready_to_ship' });
    expect((await schedule()).commissions.map((c) => c.title)).toEqual(['A']);
  });

  it('shows a client only their own commissions, without painters or work blocks', async () => {
    await A();
    const other = await secondClient(sw, owner, studioId, 'second-client@studio.test');
    await commission('Other client', [{ key: 'paint', minutes: 120 }], { client_id: other.clientId });
    const mine = await schedule(client);
    expect(mine.commissions.map((c) => c.title)).toEqual(['A']);
    expect(mine.commissions[0].finish).toBe('2026-03-04T12:00:00.000Z');
    expect(mine.commissions[0].queuePosition).toBeNull();
    expect(mine.commissions[0].figures[0].painter).toBeNull();
    expect(mine.commissions[0].figures[0].blocks).toBeUndefined();
    const theirs = await schedule(other.caller);
    expect(theirs.commissions.map((c) => c.title)).toEqual(['Other client']);
    // The team sees both.
    expect((await schedule(painter)).commissions.map((c) => c.title)).toEqual(['A', 'Other client']);
  });
});

describe('GET /schedule/earliest-delivery: if booked today', () => {
  it('puts new work after the queue: 3 h after A and B end on Wednesday, 24 h of wait more makes it Thursday', async () => {
    await A();
    await B();
    // Free from Wed 10:00Z (B's end): 3 h → Wed 10–13Z.
    const plain = await owner.get(`${base}/schedule/earliest-delivery?hours=3`);
    expect(plain.status).toBe(200);
    expect(plain.body).toMatchObject({ date: '2026-03-04', finish: '2026-03-04T13:00:00.000Z', start: '2026-03-04T10:00:00.000Z', hours: 3, queueLength: 2, unscheduled: null });
    const cured = await owner.get(`${base}/schedule/earliest-delivery?hours=3&waitHours=24`);
    expect(cured.body).toMatchObject({ date: '2026-03-05', finish: '2026-03-05T13:00:00.000Z' });
  });

  it('takes a commission being quoted with its own stage estimates', async () => {
    await A();
    await B();
    const q = await commission('Being quoted', [{ key: 'paint', minutes: 120 }, { key: 'varnish', minutes: 60, wait: 1440 }], { status: 'quoted' });
    const res = await owner.get(`${base}/schedule/earliest-delivery?commissionId=${q.id}`);
    // Wed 10–12Z paint, 12–13Z varnish, cured Thu 13:00Z.
    expect(res.body).toMatchObject({ date: '2026-03-05', finish: '2026-03-05T13:00:00.000Z', hours: 3 });
    // A commission already booked keeps its place.
    const a = (await schedule()).commissions[0];
    const booked = await owner.get(`${base}/schedule/earliest-delivery?commissionId=${a.id}`);
    expect(booked.body).toMatchObject({ date: '2026-03-04', queueLength: 0 });
  });

  it('answers plainly when nobody has working hours', async () => {
    const res = await owner.get(`${base}/schedule/earliest-delivery?hours=3&painterId=${await userId(sw, 'owner-a@studio.test')}`);
    expect(res.body).toMatchObject({ date: null, unscheduled: 'no-working-hours' });
    expect((await owner.get(`${base}/schedule/earliest-delivery`)).status).toBe(400);
    expect((await owner.get(`${base}/schedule/earliest-delivery?hours=2&painterId=999999`)).status).toBe(400);
    expect((await owner.get(`${base}/schedule/earliest-delivery?commissionId=999999`)).status).toBe(404);
    expect((await painter.get(`${base}/schedule/earliest-delivery?hours=3`)).status).toBe(403);
  });
});
