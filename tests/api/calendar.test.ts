import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { userId } from '../support/fixtures';
import { Caller, idOf, startTestApp, twoStudios, type TestApp } from '../support/app';

// The iCalendar feed of due and projected dates behind a secret per-person address.
// Painter of studio A works 09:00–15:00 Mon–Fri in Berlin (08:00Z–14:00Z in early March 2026).

let sw: TestApp;
let owner: Caller;
let painter: Caller;
let client: Caller;
let stranger: Caller;
let studioId: number;
let base: string;

type VEvent = Record<string, { params: string; value: string }>;

/** Reads an iCalendar text (RFC 5545): unfolds continuation lines, splits into VEVENTs; throws if malformed. */
function parseIcs(text: string): { calendar: Record<string, string>; events: VEvent[] } {
  if (!text.includes('\r\n')) throw new Error('iCalendar lines end with CRLF');
  const lines = text.replace(/\r\n[ \t]/g, '').split('\r\n').filter(Boolean);
  if (lines[0] !== 'BEGIN:VCALENDAR' || lines[lines.length - 1] !== 'END:VCALENDAR') throw new Error('not a VCALENDAR');
  const calendar: Record<string, string> = {};
  const events: VEvent[] = [];
  let current: VEvent | null = null;
  for (const line of lines.slice(1, -1)) {
    const m = /^([A-Z-]+)((?:;[^:]*)?):(.*)$/.exec(line);
    if (!m) throw new Error(`unreadable line: ${line}`);
    const [, name, params, value] = m;
    if (name === 'BEGIN' && value === 'VEVENT') current = {};
    else if (name === 'END' && value === 'VEVENT') {
      if (!current) throw new Error('END without BEGIN');
      events.push(current);
      current = null;
    } else if (current) current[name] = { params, value };
    else calendar[name] = value;
  }
  if (current) throw new Error('unclosed VEVENT');
  return { calendar, events };
}

async function commission(title: string, painterId: number | null, minutes: number, due: string | null, clientId: number) {
  const now = sw.clock.now().toISOString();
  const c = idOf((await sw.db('commissions').insert({ studio_id: studioId, client_id: clientId, title, status: 'booked', due_date: due, created_at: now, updated_at: now }).returning('id'))[0]);
  const f = idOf(
    (await sw.db('figures').insert({ studio_id: studioId, commission_id: c, name: 'Figure', quantity: 1, size_class: '28', tier: 'tabletop', painter_id: painterId, created_at: now, updated_at: now }).returning('id'))[0],
  );
  await sw.db('stages').insert({ studio_id: studioId, commission_id: c, figure_id: f, template_key: 'paint', name: 'Paint', position: 0, estimate_minutes: minutes, updated_at: now });
  return c;
}

const path = (url: string) => new URL(url).pathname;

beforeAll(async () => {
  sw = await startTestApp();
  const { a, b } = await twoStudios(sw);
  ({ owner, painter, client, studioId } = a);
  stranger = b.owner;
  base = `/api/studios/${studioId}`;
  const painterId = await userId(sw, 'painter-a@studio.test');
  const ownerId = await userId(sw, 'owner-a@studio.test');
  const days = Object.fromEntries([1, 2, 3, 4, 5].map((d) => [String(d), [{ start: '09:00', end: '15:00' }]]));
  await owner.put(`${base}/capacity/painters/${painterId}/hours`, { hours: days });
  await owner.put(`${base}/capacity/painters/${ownerId}/hours`, { hours: { '1': [{ start: '10:00', end: '12:00' }] } });
  sw.clock.set('2026-03-02T07:00:00.000Z'); // Monday 08:00 Berlin
  // Painter: "Lantern goblins" 10 h → Mon 08–14Z + Tue 08–12Z, ready Tue 3 March; due Fri 6 March.
  await commission('Lantern goblins, batch 1', painterId, 600, '2026-03-06', a.clientId);
  // Owner: "Heron knight" 5 h, Mondays 10–12 local only → Mon 2, Mon 9 (2 h each), Mon 16 (1 h): ready 16 March,
  // due 10 March: late.
  await commission('Heron knight', ownerId, 300, '2026-03-10', a.clientId);
});
afterAll(() => sw.stop());

describe('calendar feed', () => {
  let ownerUrl: string;

  it('starts without a feed; creating one answers the secret address once', async () => {
    expect((await owner.get(`${base}/calendar-feed`)).body).toEqual({ active: false, createdAt: null, lastUsedAt: null });
    const res = await owner.post(`${base}/calendar-feed`);
    expect(res.status).toBe(201);
    expect(res.body.active).toBe(true);
    expect(res.body.url).toMatch(/^http:\/\/sablework\.test\/api\/calendar\/[A-Za-z0-9_-]{43}\.ics$/);
    ownerUrl = res.body.url;
    const again = await owner.get(`${base}/calendar-feed`);
    expect(again.body.active).toBe(true);
    expect(again.body.url).toBeUndefined();
    // Only the hash is stored.
    const token = ownerUrl.match(/calendar\/(.+)\.ics$/)![1];
    const stored = await sw.db('calendar_feeds').select('token_hash');
    expect(stored.some((r) => r.token_hash === token)).toBe(false);
    expect(stored.every((r) => /^[0-9a-f]{64}$/.test(r.token_hash))).toBe(true);
  });

  it('serves a calendar that parses, with due and projected dates as all-day events', async () => {
    const res = await new Caller(sw.app).get(path(ownerUrl));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/calendar/);
    const ics = parseIcs(res.text);
    expect(ics.calendar.VERSION).toBe('2.0');
    expect(ics.calendar['X-WR-CALNAME']).toBe('Studio a · Sablework');
    const events = ics.events.map((e) => [e.SUMMARY.value, e.DTSTART.params, e.DTSTART.value, e.DTEND.value]).sort();
    expect(events).toEqual(
      [
        ['Due: Heron knight', ';VALUE=DATE', '20260310', '20260311'],
        ['Due: Lantern goblins\\, batch 1', ';VALUE=DATE', '20260306', '20260307'],
        ['Ready to ship (forecast): Heron knight (after its due date)', ';VALUE=DATE', '20260316', '20260317'],
        ['Ready to ship (forecast): Lantern goblins\\, batch 1', ';VALUE=DATE', '20260303', '20260304'],
      ].sort(),
    );
    expect(ics.events.every((e) => /^sablework-\d+-\d+-(due|ready)@sablework$/.test(e.UID.value))).toBe(true);
    expect(new Set(ics.events.map((e) => e.UID.value)).size).toBe(4);
    // The stamp comes from the app's clock.
    expect(ics.events[0].DTSTAMP.value).toBe('20260302T070000Z');
    expect((await owner.get(`${base}/calendar-feed`)).body.lastUsedAt).toBe('2026-03-02T07:00:00.000Z');
  });

  it('tags the calendar so a calendar app asking again gets 304 while it is unchanged, and the new text once it changes', async () => {
    const first = await new Caller(sw.app).get(path(ownerUrl));
    const etag = first.headers.etag;
    expect(etag).toMatch(/^"[A-Za-z0-9_-]{27}"$/);
    const again = await new Caller(sw.app).get(path(ownerUrl)).set('If-None-Match', etag);
    expect(again.status).toBe(304);
    expect(again.text ?? '').toBe('');
    expect((await new Caller(sw.app).get(path(ownerUrl)).set('If-None-Match', '"another"')).status).toBe(200);
    // A new due date changes the calendar, so the old tag no longer matches.
    const commission = (await owner.get(`${base}/commissions`)).body.items.find((c: { title: string }) => c.title === 'Heron knight');
    expect((await owner.patch(`${base}/commissions/${commission.id}`, { dueDate: '2026-03-12' })).status).toBe(200);
    const changed = await new Caller(sw.app).get(path(ownerUrl)).set('If-None-Match', etag);
    expect(changed.status).toBe(200);
    expect(changed.headers.etag).not.toBe(etag);
    expect(changed.text).toContain('20260312');
    // JSON answers carry no tag of their own (they are no-store).
    expect((await owner.get(`${base}/commissions`)).headers.etag).toBeUndefined();
  });

  it('gives a painter only the commissions on their bench', async () => {
    const res = await painter.post(`${base}/calendar-feed`);
    expect(res.status).toBe(201);
    const ics = parseIcs((await new Caller(sw.app).get(path(res.body.url))).text);
    expect(ics.events.map((e) => e.SUMMARY.value).sort()).toEqual(['Due: Lantern goblins\\, batch 1', 'Ready to ship (forecast): Lantern goblins\\, batch 1']);
  });

  it('works only with the right token: a wrong one, an old one after rotating, or one turned off is 404', async () => {
    const anon = new Caller(sw.app);
    expect((await anon.get(`/api/calendar/${'A'.repeat(43)}.ics`)).status).toBe(404);
    expect((await anon.get('/api/calendar/short.ics')).status).toBe(404);
    const tweaked = path(ownerUrl).replace(/(.)\.ics$/, (_, ch: string) => `${ch === 'a' ? 'b' : 'a'}.ics`);
    expect((await anon.get(tweaked)).status).toBe(404);
    const rotated = await owner.post(`${base}/calendar-feed`);
    expect(rotated.body.url).not.toBe(ownerUrl);
    expect((await anon.get(path(ownerUrl))).status).toBe(404);
    expect((await anon.get(path(rotated.body.url))).status).toBe(200);
    expect((await owner.delete(`${base}/calendar-feed`)).status).toBe(204);
    expect((await anon.get(path(rotated.body.url))).status).toBe(404);
    expect((await owner.get(`${base}/calendar-feed`)).body.active).toBe(false);
  });

  it('stops working when the person leaves the studio; clients and strangers cannot make one', async () => {
    const res = await painter.post(`${base}/calendar-feed`);
    const painterId = await userId(sw, 'painter-a@studio.test');
    expect((await owner.delete(`${base}/members/${painterId}`)).status).toBe(204);
    expect((await new Caller(sw.app).get(path(res.body.url))).status).toBe(404);
    expect((await client.post(`${base}/calendar-feed`)).status).toBe(403);
    expect((await stranger.post(`${base}/calendar-feed`)).status).toBe(404);
  });
});
