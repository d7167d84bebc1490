// A signed-in read does not write its session row every time: express-session touches every unchanged
// session, and the store lets that write through only once the stored expiry lags a minute behind.
// Date alone is faked (timers stay real, so supertest still runs), so "a minute later" is exact.
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { TOUCH_EVERY_MS } from '../../server/lib/session-store';
import { signInAs, signUp, startTestApp, withQueries, type TestApp } from '../support/app';

let sw: TestApp;
beforeAll(async () => {
  sw = await startTestApp();
  await signUp(sw, { email: 'toucher@sessions.test' });
});
afterAll(() => sw.stop());
afterEach(() => vi.useRealTimers());

/** The session writes (insert, update or delete of `sessions`) a block of requests makes. */
async function sessionWrites(fn: () => Promise<unknown>) {
  const { sql } = await withQueries(sw.db, fn);
  return sql.filter((s) => /^\s*(insert|update|delete)\b[^;]*\bsessions\b/i.test(s));
}

const storedExpiry = async () => (await sw.db('sessions').select('expired')).map((r) => new Date(r.expired as string).getTime());

describe('session touch', () => {
  it('reads right after sign-in write nothing; a minute later one read moves the expiry on, the next again nothing', async () => {
    vi.useFakeTimers({ toFake: ['Date'], now: new Date('2026-12-02T10:00:00Z') });
    await sw.db('sessions').del();
    const me = await signInAs(sw, 'toucher@sessions.test');
    const [signedIn] = await storedExpiry();

    const quiet = await sessionWrites(async () => {
      for (let i = 0; i < 5; i++) expect((await me.get('/api/auth/me')).status).toBe(200);
    });
    expect(quiet).toEqual([]);

    vi.setSystemTime(Date.now() + TOUCH_EVERY_MS - 1_000);
    expect(await sessionWrites(() => me.get('/api/auth/me'))).toEqual([]);

    vi.setSystemTime(Date.now() + 2_000);
    const touched = await sessionWrites(() => me.get('/api/auth/me'));
    expect(touched).toHaveLength(1);
    const [later] = await storedExpiry();
    expect(later - signedIn).toBeGreaterThanOrEqual(TOUCH_EVERY_MS);

    expect(await sessionWrites(() => me.get('/api/auth/me'))).toEqual([]);
  });

  it('the cookie still rolls on every answer, so an active browser keeps its 14 days', async () => {
    const me = await signInAs(sw, 'toucher@sessions.test');
    const res = await me.get('/api/auth/me');
    const cookie = (res.headers['set-cookie'] as unknown as string[] | undefined)?.find((c) => c.startsWith('sablework.sid='));
    expect(cookie).toMatch(/Expires=/);
    const expires = Date.parse(/Expires=([^;]+)/.exec(cookie!)![1]);
    expect(expires - Date.now()).toBeGreaterThan(14 * 24 * 3600_000 - 60_000);
  });

  it('a session signed out ends at once, whatever the store remembers', async () => {
    const me = await signInAs(sw, 'toucher@sessions.test');
    expect((await me.get('/api/auth/me')).status).toBe(200);
    expect((await me.post('/api/auth/logout')).status).toBeLessThan(300);
    expect((await me.get('/api/auth/me')).status).toBe(401);
  });

  it('a session whose stored row expired is not brought back by a touch', async () => {
    const me = await signInAs(sw, 'toucher@sessions.test');
    expect((await me.get('/api/auth/me')).status).toBe(200);
    await sw.db('sessions').update({ expired: new Date(Date.now() - 1_000).toISOString() });
    expect((await me.get('/api/auth/me')).status).toBe(401);
  });
});
