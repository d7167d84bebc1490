import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { userId } from '../support/fixtures';
import { startTestApp, twoStudios, type Caller, type TestApp } from '../support/app';

let sw: TestApp;
let owner: Caller;
let painter: Caller;
let client: Caller;
let base: string;
let ownerId: number;
let painterId: number;

beforeAll(async () => {
  sw = await startTestApp();
  const { a } = await twoStudios(sw);
  ({ owner, painter, client } = a);
  base = `/api/studios/${a.studioId}`;
  ownerId = await userId(sw, 'owner-a@studio.test');
  painterId = await userId(sw, 'painter-a@studio.test');
});
afterAll(() => sw.stop());

describe('capacity: working hours', () => {
  it('lists the owners and painters with no hours until they are set, and the studio timezone', async () => {
    const res = await owner.get(`${base}/capacity`);
    expect(res.status).toBe(200);
    expect(res.body.timeZone).toBe('Europe/Berlin');
    expect(res.body.painters.map((p: { userId: number; role: string; weeklyHours: number }) => [p.userId, p.role, p.weeklyHours])).toEqual([
      [ownerId, 'owner', 0],
      [painterId, 'painter', 0],
    ]);
    expect(res.body.closedDays).toEqual([]);
    expect((await client.get(`${base}/capacity`)).status).toBe(403);
  });

  it('keeps ranges per ISO weekday, several a day, and sums the week', async () => {
    const hours = {
      '1': [
        { start: '13:00', end: '17:30' },
        { start: '08:30', end: '12:00' },
      ],
      '3': [{ start: '09:00', end: '15:00' }],
      '6': [{ start: '20:00', end: '24:00' }],
    };
    const res = await owner.put(`${base}/capacity/painters/${painterId}/hours`, { hours });
    expect(res.status).toBe(200);
    const p = res.body.painters.find((x: { userId: number }) => x.userId === painterId);
    // 3.5 + 4.5 + 6 + 4 = 18 h
    expect(p.weeklyHours).toBe(18);
    expect(p.hours).toEqual({
      '1': [
        { start: '08:30', end: '12:00' },
        { start: '13:00', end: '17:30' },
      ],
      '3': [{ start: '09:00', end: '15:00' }],
      '6': [{ start: '20:00', end: '24:00' }],
    });
  });

  it('refuses overlapping ranges, an end before the start, bad times and weekdays', async () => {
    const put = (hours: unknown) => owner.put(`${base}/capacity/painters/${painterId}/hours`, { hours });
    const overlap = await put({ '2': [{ start: '09:00', end: '12:00' }, { start: '11:00', end: '14:00' }] });
    expect(overlap.status).toBe(400);
    expect(overlap.body.error.fields['hours.2.1.start']).toMatch(/overlaps/);
    expect((await put({ '2': [{ start: '12:00', end: '09:00' }] })).body.error.fields['hours.2.0.end']).toMatch(/End after the start/);
    expect((await put({ '2': [{ start: '9:00', end: '12:00' }] })).status).toBe(400);
    expect((await put({ '2': [{ start: '09:00', end: '24:30' }] })).status).toBe(400);
    expect((await put({ '8': [{ start: '09:00', end: '12:00' }] })).status).toBe(400);
  });

  it('lets a painter set their own hours but nobody else’s', async () => {
    const own = await painter.put(`${base}/capacity/painters/${painterId}/hours`, { hours: { '5': [{ start: '10:00', end: '14:00' }] } });
    expect(own.status).toBe(200);
    expect(own.body.painters.find((x: { userId: number }) => x.userId === painterId).weeklyHours).toBe(4);
    expect((await painter.put(`${base}/capacity/painters/${ownerId}/hours`, { hours: {} })).status).toBe(403);
    expect((await owner.put(`${base}/capacity/painters/999999/hours`, { hours: {} })).status).toBe(404);
  });
});

describe('capacity: days off, holidays and closed days', () => {
  it('adds a painter’s holiday and a studio closed day, and shows them', async () => {
    sw.clock.set('2026-03-02T09:00:00.000Z');
    const holiday = await painter.post(`${base}/capacity/days-off`, { userId: painterId, kind: 'holiday', from: '2026-04-06', to: '2026-04-10', note: 'Walking in the hills' });
    expect(holiday.status).toBe(201);
    expect(holiday.body).toMatchObject({ userId: painterId, kind: 'holiday', from: '2026-04-06', to: '2026-04-10', note: 'Walking in the hills' });
    const closed = await owner.post(`${base}/capacity/days-off`, { userId: null, kind: 'closed', from: '2026-05-01', to: '2026-05-01', note: 'Labour Day' });
    expect(closed.status).toBe(201);
    const view = (await owner.get(`${base}/capacity`)).body;
    expect(view.closedDays.map((d: { from: string; note: string }) => [d.from, d.note])).toEqual([['2026-05-01', 'Labour Day']]);
    expect(view.painters.find((x: { userId: number }) => x.userId === painterId).daysOff.map((d: { from: string; to: string }) => [d.from, d.to])).toEqual([['2026-04-06', '2026-04-10']]);
  });

  it('hides entries that are over', async () => {
    await owner.post(`${base}/capacity/days-off`, { userId: ownerId, kind: 'day_off', from: '2026-02-02', to: '2026-02-03' });
    const view = (await owner.get(`${base}/capacity`)).body;
    expect(view.painters.find((x: { userId: number }) => x.userId === ownerId).daysOff).toEqual([]);
  });

  it('checks the dates and who may add what', async () => {
    const post = (who: Caller, body: unknown) => who.post(`${base}/capacity/days-off`, body);
    expect((await post(owner, { userId: painterId, kind: 'day_off', from: '2026-04-10', to: '2026-04-09' })).body.error.fields.to).toMatch(/before the first/);
    expect((await post(owner, { userId: painterId, kind: 'day_off', from: '2026-01-01', to: '2027-06-01' })).body.error.fields.to).toMatch(/a year/);
    expect((await post(owner, { userId: painterId, kind: 'closed', from: '2026-04-10', to: '2026-04-10' })).status).toBe(400);
    expect((await post(owner, { userId: null, kind: 'holiday', from: '2026-04-10', to: '2026-04-10' })).status).toBe(400);
    expect((await post(painter, { userId: null, kind: 'closed', from: '2026-04-10', to: '2026-04-10' })).status).toBe(403);
    expect((await post(painter, { userId: ownerId, kind: 'day_off', from: '2026-04-10', to: '2026-04-10' })).status).toBe(403);
    expect((await post(client, { userId: painterId, kind: 'day_off', from: '2026-04-10', to: '2026-04-10' })).status).toBe(403);
  });

  it('lets a painter remove only their own days off; an owner any', async () => {
    const mine = await painter.post(`${base}/capacity/days-off`, { userId: painterId, kind: 'day_off', from: '2026-06-01', to: '2026-06-01' });
    const owners = await owner.post(`${base}/capacity/days-off`, { userId: ownerId, kind: 'day_off', from: '2026-06-02', to: '2026-06-02' });
    expect((await painter.delete(`${base}/capacity/days-off/${owners.body.id}`)).status).toBe(403);
    expect((await painter.delete(`${base}/capacity/days-off/${mine.body.id}`)).status).toBe(204);
    expect((await painter.delete(`${base}/capacity/days-off/${mine.body.id}`)).status).toBe(404);
    expect((await owner.delete(`${base}/capacity/days-off/${owners.body.id}`)).status).toBe(204);
  });
});
