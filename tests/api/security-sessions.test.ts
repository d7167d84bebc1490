// Sessions, sign-in throttling, reset links and passwords, attacked from outside: a planted session id, a cookie
// kept after sign-out, reset links reused, late, of another person or of another kind, guessing from one address
// or from many, passwords longer than bcrypt reads.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RESET_LIMITS, THROTTLE_LIMITS } from '../../server/features/auth/auth.service';
import { Caller, PASSWORD, linkIn, mailTo, signInAs, signUp, startTestApp, type TestApp } from '../support/app';

let sw: TestApp;
beforeAll(async () => {
  // Behind a proxy, so tests choose the caller's address with X-Forwarded-For (the throttle counts per address).
  sw = await startTestApp({ trustProxy: true });
});
afterAll(() => sw.stop());

type Res = { headers: Record<string, unknown>; body?: unknown; text?: string };
/** The `sablework.sid=…` pair a response sets, if any. */
const cookieOf = (res: Res) => ((res.headers['set-cookie'] as string[] | undefined) ?? []).find((c) => c.startsWith('sablework.sid='))?.split(';')[0];
/** The session id inside the signed cookie value (`s:<id>.<signature>`). */
const sidIn = (cookie: string) => decodeURIComponent(cookie.slice('sablework.sid='.length)).replace(/^s:/, '').split('.')[0];
/** Who the server thinks a bare cookie belongs to: the e-mail, or the status when nobody. */
async function whoHas(cookie: string) {
  const res = await request(sw.app).get('/api/auth/me').set('Cookie', cookie);
  return res.status === 200 ? (res.body.user.email as string) : res.status;
}
async function resetLink(email: string) {
  expect((await new Caller(sw.app).post('/api/auth/password-reset', { email })).status).toBe(202);
  const mails = await mailTo(sw, email);
  return linkIn(mails.filter((m) => m.subject.includes('new Sablework password')).at(-1)!.text, '/reset-password/');
}
/** A caller that first picks up an anonymous session (as a planted cookie would be), returning that cookie. */
async function withPlantedSession() {
  const c = new Caller(sw.app);
  const planted = cookieOf(await c.agent.get('/api/auth/csrf'))!;
  expect(planted).toBeTruthy();
  return { c, planted };
}

describe('session fixation', () => {
  beforeAll(() => signUp(sw, { email: 'fixed@sessions.test' }));

  it('sign-in: the session id from before is not signed in afterwards; the new id is', async () => {
    const { c, planted } = await withPlantedSession();
    const login = await c.post('/api/auth/login', { email: 'fixed@sessions.test', password: PASSWORD });
    expect(login.status).toBe(200);
    const fresh = cookieOf(login)!;
    expect(sidIn(fresh)).not.toBe(sidIn(planted));
    expect(await whoHas(planted)).toBe(401);
    expect(await whoHas(fresh)).toBe('fixed@sessions.test');
  });

  it('sign-up: a new session id, the old one stays anonymous', async () => {
    const { c, planted } = await withPlantedSession();
    const res = await c.post('/api/auth/signup', { name: 'New', email: 'new@sessions.test', password: PASSWORD, studioName: 'Fresh Studio', currency: 'EUR', timezone: 'UTC' });
    expect(res.status).toBe(201);
    expect(sidIn(cookieOf(res)!)).not.toBe(sidIn(planted));
    expect(await whoHas(planted)).toBe(401);
    expect(await whoHas(cookieOf(res)!)).toBe('new@sessions.test');
  });

  it('invitation accept: a new session id, the old one stays anonymous', async () => {
    const owner = await signInAs(sw, 'new@sessions.test');
    const studioId = (await owner.get('/api/auth/me')).body.memberships[0].studioId;
    expect((await owner.post(`/api/studios/${studioId}/invitations`, { email: 'invited@sessions.test', role: 'painter' })).status).toBe(201);
    const token = linkIn((await mailTo(sw, 'invited@sessions.test'))[0].text, '/invite/');
    const { c, planted } = await withPlantedSession();
    const res = await c.post(`/api/invitations/${token}/accept`, { name: 'Invited', password: PASSWORD });
    expect(res.status).toBe(200);
    expect(sidIn(cookieOf(res)!)).not.toBe(sidIn(planted));
    expect(await whoHas(planted)).toBe(401);
    expect(await whoHas(cookieOf(res)!)).toBe('invited@sessions.test');
  });

  it('password reset: a new session id, the old one stays anonymous', async () => {
    const token = await resetLink('fixed@sessions.test');
    const { c, planted } = await withPlantedSession();
    const res = await c.post('/api/auth/password-reset/confirm', { token, password: 'a fresh long secret' });
    expect(res.status).toBe(200);
    expect(sidIn(cookieOf(res)!)).not.toBe(sidIn(planted));
    expect(await whoHas(planted)).toBe(401);
    expect(await whoHas(cookieOf(res)!)).toBe('fixed@sessions.test');
  });

  it('an old session id is dead after sign-out, and so is its CSRF token', async () => {
    const c = new Caller(sw.app);
    const login = await c.post('/api/auth/login', { email: 'new@sessions.test', password: PASSWORD });
    const cookie = cookieOf(login)!;
    const token = await c.csrf();
    expect(await whoHas(cookie)).toBe('new@sessions.test');
    expect((await c.post('/api/auth/logout')).status).toBe(204);
    expect(await whoHas(cookie)).toBe(401);
    // replaying the old cookie with its token cannot act either
    const replay = await request(sw.app).patch('/api/auth/me').set('Cookie', cookie).set('x-csrf-token', token).send({ name: 'Ghost' });
    expect([401, 403]).toContain(replay.status);
    expect((await sw.db('users').where({ email: 'new@sessions.test' }).first('name')).name).toBe('New');
  });

  it('the session id is only ever in the cookie, never in a body or a URL', async () => {
    const c = new Caller(sw.app);
    const responses = [await c.agent.get('/api/auth/csrf')];
    responses.push(await c.post('/api/auth/login', { email: 'new@sessions.test', password: PASSWORD }));
    const sid = sidIn(cookieOf(responses[1])!);
    responses.push(await c.get('/api/auth/me'), await c.get('/api/auth/csrf'));
    for (const res of responses) {
      expect(JSON.stringify(res.body ?? '')).not.toContain(sid);
      expect(String(res.headers.location ?? '')).not.toContain(sid);
    }
  });

  it("a visitor's session lasts an hour; signing in starts one of 14 days", async () => {
    const c = new Caller(sw.app);
    const lifetime = (res: Res) => {
      const cookie = ((res.headers['set-cookie'] as string[] | undefined) ?? []).find((x) => x.startsWith('sablework.sid='))!;
      return (Date.parse(cookie.match(/Expires=([^;]+)/)![1]) - Date.parse(String(res.headers.date))) / 1000;
    };
    const visitor = await c.agent.get('/api/auth/csrf');
    expect(Math.abs(lifetime(visitor) - 3600)).toBeLessThan(5);
    // still an hour on the next request (the session is renewed by use, for its own length)
    expect(Math.abs(lifetime(await c.agent.get('/api/auth/csrf')) - 3600)).toBeLessThan(5);
    const login = await c.post('/api/auth/login', { email: 'new@sessions.test', password: PASSWORD });
    expect(Math.abs(lifetime(login) - 14 * 24 * 3600)).toBeLessThan(5);
    // and the hour-long visitor session is gone with the sign-in
    expect(await sw.db('sessions').where({ sid: sidIn(cookieOf(visitor)!) }).first()).toBeUndefined();
  });

  it('session ids are 192-bit random strings, never repeated', async () => {
    const ids = new Set<string>();
    for (let i = 0; i < 25; i++) ids.add(sidIn(cookieOf(await request(sw.app).get('/api/auth/csrf'))!));
    expect(ids.size).toBe(25);
    // 24 random bytes in base64url (express-session's uid-safe): 32 characters
    for (const id of ids) expect(id).toMatch(/^[A-Za-z0-9_-]{32}$/);
  });
});

describe('password reset tokens', () => {
  beforeAll(async () => {
    await signUp(sw, { email: 'reset@sessions.test' });
    await signUp(sw, { email: 'bystander@sessions.test' });
  });

  it('works once: used again, even at the same moment, it is refused', async () => {
    const token = await resetLink('reset@sessions.test');
    const [one, two] = await Promise.all([
      new Caller(sw.app).post('/api/auth/password-reset/confirm', { token, password: 'first of two secrets' }),
      new Caller(sw.app).post('/api/auth/password-reset/confirm', { token, password: 'second of two secrets' }),
    ]);
    expect([one.status, two.status].sort()).toEqual([200, 410]);
    const again = await new Caller(sw.app).post('/api/auth/password-reset/confirm', { token, password: 'third try at this' });
    expect(again.status).toBe(410);
    const winner = one.status === 200 ? 'first of two secrets' : 'second of two secrets';
    await signInAs(sw, 'reset@sessions.test', winner);
    // back to the suite's password for the tests below
    const back = await resetLink('reset@sessions.test');
    expect((await new Caller(sw.app).post('/api/auth/password-reset/confirm', { token: back, password: PASSWORD })).status).toBe(200);
  });

  it('lasts one hour by the clock: at 59 minutes it works, at 60 it is refused', async () => {
    const early = await resetLink('reset@sessions.test');
    const late = await resetLink('reset@sessions.test');
    sw.clock.advance(59 * 60_000);
    expect((await new Caller(sw.app).post('/api/auth/password-reset/confirm', { token: early, password: PASSWORD })).status).toBe(200);
    const lateAgain = await resetLink('reset@sessions.test');
    sw.clock.advance(60 * 60_000);
    const refused = await new Caller(sw.app).post('/api/auth/password-reset/confirm', { token: lateAgain, password: 'too late for this one' });
    expect(refused.status).toBe(410);
    expect(refused.body.error.message).toMatch(/expired/);
    // `late` died with the reset that used `early` (one reset ends the person's other links)
    expect((await new Caller(sw.app).post('/api/auth/password-reset/confirm', { token: late, password: 'too late for this one' })).status).toBe(410);
    await signInAs(sw, 'reset@sessions.test');
  });

  it("a link changes only its own account's password, whoever is signed in when it is used", async () => {
    const token = await resetLink('reset@sessions.test');
    const bystander = await signInAs(sw, 'bystander@sessions.test');
    const res = await bystander.post('/api/auth/password-reset/confirm', { token, password: 'only for the reset account' });
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe('reset@sessions.test');
    await signInAs(sw, 'reset@sessions.test', 'only for the reset account');
    await signInAs(sw, 'bystander@sessions.test');
    await expect(signInAs(sw, 'bystander@sessions.test', 'only for the reset account')).rejects.toThrow(/401/);
    const back = await resetLink('reset@sessions.test');
    expect((await new Caller(sw.app).post('/api/auth/password-reset/confirm', { token: back, password: PASSWORD })).status).toBe(200);
  });

  it('an invitation token is no reset token, and a reset token no invitation', async () => {
    const owner = await signInAs(sw, 'bystander@sessions.test');
    const studioId = (await owner.get('/api/auth/me')).body.memberships[0].studioId;
    await owner.post(`/api/studios/${studioId}/invitations`, { email: 'reset@sessions.test', role: 'painter' });
    const invitation = linkIn((await mailTo(sw, 'reset@sessions.test')).filter((m) => m.text.includes('/invite/')).at(-1)!.text, '/invite/');
    expect((await new Caller(sw.app).post('/api/auth/password-reset/confirm', { token: invitation, password: 'not through an invitation' })).status).toBe(410);
    const reset = await resetLink('reset@sessions.test');
    expect((await new Caller(sw.app).get(`/api/invitations/${reset}`)).status).toBe(404);
    expect((await new Caller(sw.app).post(`/api/invitations/${reset}/accept`, { password: PASSWORD })).status).toBe(404);
    await signInAs(sw, 'reset@sessions.test');
  });

  it("ends the person's other sessions on every device, and nobody else's", async () => {
    const laptop = await signInAs(sw, 'reset@sessions.test');
    const phone = await signInAs(sw, 'reset@sessions.test');
    const other = await signInAs(sw, 'bystander@sessions.test');
    const token = await resetLink('reset@sessions.test');
    const here = new Caller(sw.app);
    expect((await here.post('/api/auth/password-reset/confirm', { token, password: PASSWORD })).status).toBe(200);
    expect((await laptop.get('/api/auth/me')).status).toBe(401);
    expect((await phone.get('/api/auth/me')).status).toBe(401);
    expect((await here.get('/api/auth/me')).body.user.email).toBe('reset@sessions.test');
    expect((await other.get('/api/auth/me')).body.user.email).toBe('bystander@sessions.test');
    // signing in again works as usual
    expect((await (await signInAs(sw, 'reset@sessions.test')).get('/api/auth/me')).status).toBe(200);
  });

  it('tells the person by e-mail that the password was changed', async () => {
    const token = await resetLink('reset@sessions.test');
    const before = (await mailTo(sw, 'reset@sessions.test')).length;
    expect((await new Caller(sw.app).post('/api/auth/password-reset/confirm', { token, password: PASSWORD })).status).toBe(200);
    const after = await mailTo(sw, 'reset@sessions.test');
    expect(after).toHaveLength(before + 1);
    expect(after.at(-1)!.subject).toBe('Your Sablework password was changed');
    expect(after.at(-1)!.text).not.toContain(PASSWORD);
  });
});

describe('sign-in throttling', () => {
  beforeAll(async () => {
    for (const who of ['pair', 'account', 'spray-victim', 'sprayer']) await signUp(sw, { email: `${who}@throttle.test` });
  });
  /** A POST from a fresh visitor at the given network address (X-Forwarded-For, the app trusts one proxy). */
  const postFrom = (ip: string, url: string, body: object) => new Caller(sw.app).agent.get('/api/auth/csrf').set('X-Forwarded-For', ip).then(async (r) => {
    const cookie = cookieOf(r)!;
    return request(sw.app).post(url).set('Cookie', cookie).set('x-csrf-token', r.body.token).set('X-Forwarded-For', ip).send(body);
  });
  const login = (email: string, password: string, ip: string) => postFrom(ip, '/api/auth/login', { email, password });
  const retryAfter = (res: { headers: Record<string, unknown> }) => Number(res.headers['retry-after']);

  it(`per e-mail and address: ${THROTTLE_LIMITS.pair} wrong passwords, then 429 with Retry-After even for the right one; another address may still sign in`, async () => {
    for (let i = 0; i < THROTTLE_LIMITS.pair; i++) expect((await login('pair@throttle.test', 'wrong password', '198.51.100.1')).status).toBe(401);
    const blocked = await login('pair@throttle.test', PASSWORD, '198.51.100.1');
    expect(blocked.status).toBe(429);
    expect(retryAfter(blocked)).toBeGreaterThan(0);
    expect(retryAfter(blocked)).toBeLessThanOrEqual(15 * 60);
    expect((await login('pair@throttle.test', PASSWORD, '198.51.100.2')).status).toBe(200);
    sw.clock.advance(5 * 60_000);
    const later = await login('pair@throttle.test', PASSWORD, '198.51.100.1');
    expect(later.status).toBe(429);
    expect(retryAfter(later)).toBeLessThanOrEqual(retryAfter(blocked) - 5 * 60 + 1);
    sw.clock.advance(10 * 60_000 + 1000);
    expect((await login('pair@throttle.test', PASSWORD, '198.51.100.1')).status).toBe(200);
  });

  it(`per account: guesses from many addresses stop at ${THROTTLE_LIMITS.account} in 15 minutes (at most ${THROTTLE_LIMITS.account * 4} an hour, under ASVS 2.2.1's 100)`, async () => {
    // two guesses from each of many addresses: none of them meets the per-address limits
    for (let i = 0; i < THROTTLE_LIMITS.account; i++) expect((await login('account@throttle.test', 'wrong password', `203.0.113.${Math.floor(i / 2) + 1}`)).status).toBe(401);
    const next = await login('account@throttle.test', 'wrong password', '203.0.113.200');
    expect(next.status).toBe(429);
    expect(retryAfter(next)).toBeGreaterThan(0);
    expect((await login('account@throttle.test', PASSWORD, '203.0.113.201')).status).toBe(429);
    // other accounts are not held up
    expect((await login('pair@throttle.test', PASSWORD, '203.0.113.202')).status).toBe(200);
    sw.clock.advance(15 * 60_000 + 1000);
    expect((await login('account@throttle.test', PASSWORD, '203.0.113.201')).status).toBe(200);
  });

  it(`per address: one address trying many accounts stops after ${THROTTLE_LIMITS.address} failures, and signing in to its own account does not reset the count`, async () => {
    const ip = '192.0.2.77';
    for (let i = 0; i < THROTTLE_LIMITS.address; i++) {
      // a different (unknown) account each time, so neither the pair nor the account limit is met
      expect((await login(`guess-${i}@throttle.test`, 'wrong password', ip)).status).toBe(401);
      if (i === 20) expect((await login('sprayer@throttle.test', PASSWORD, ip)).status).toBe(200);
    }
    const blocked = await login('spray-victim@throttle.test', 'wrong password', ip);
    expect(blocked.status).toBe(429);
    expect(retryAfter(blocked)).toBeGreaterThan(0);
    expect((await login('spray-victim@throttle.test', PASSWORD, '192.0.2.78')).status).toBe(200);
    sw.clock.advance(15 * 60_000 + 1000);
    expect((await login('spray-victim@throttle.test', PASSWORD, ip)).status).toBe(200);
  }, 120_000);
});

describe('password reset requests', () => {
  const askFrom = (ip: string, email: string) =>
    new Caller(sw.app).agent.get('/api/auth/csrf').set('X-Forwarded-For', ip).then((r) =>
      request(sw.app).post('/api/auth/password-reset').set('Cookie', cookieOf(r)!).set('x-csrf-token', r.body.token).set('X-Forwarded-For', ip).send({ email }),
    );
  const resetMails = async (email: string) => (await mailTo(sw, email)).filter((m) => m.subject.includes('new Sablework password')).length;

  it(`mail one address at most ${RESET_LIMITS.mailsPerAccount} times an hour, whoever asks, and answer the same every time`, async () => {
    await signUp(sw, { email: 'inbox@reset.test' });
    const unknown = await askFrom('198.51.100.50', 'nobody@reset.test');
    for (let i = 0; i < RESET_LIMITS.mailsPerAccount + 3; i++) {
      const res = await askFrom(`198.51.100.${60 + i}`, 'inbox@reset.test');
      expect(res.status).toBe(unknown.status);
      expect(res.body).toEqual(unknown.body);
    }
    expect(await resetMails('inbox@reset.test')).toBe(RESET_LIMITS.mailsPerAccount);
    sw.clock.advance(60 * 60_000 + 1000);
    expect((await askFrom('198.51.100.99', 'inbox@reset.test')).status).toBe(202);
    expect(await resetMails('inbox@reset.test')).toBe(RESET_LIMITS.mailsPerAccount + 1);
  });

  it(`one network address may ask ${RESET_LIMITS.requestsPerAddress} times an hour, then 429 with Retry-After`, async () => {
    for (let i = 0; i < RESET_LIMITS.requestsPerAddress; i++) expect((await askFrom('192.0.2.200', `someone-${i}@reset.test`)).status).toBe(202);
    const blocked = await askFrom('192.0.2.200', 'inbox@reset.test');
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    expect(Number(blocked.headers['retry-after'])).toBeLessThanOrEqual(3600);
    expect((await askFrom('192.0.2.201', 'someone-0@reset.test')).status).toBe(202);
  });
});

describe('sign-in throttling, through an invitation', () => {
  it("accepting an invitation with an existing account's password is throttled like signing in", async () => {
    const { caller: owner, studioId } = await signUp(sw, { email: 'inviter@throttle.test' });
    await signUp(sw, { email: 'invitee@throttle.test' });
    expect((await owner.post(`/api/studios/${studioId}/invitations`, { email: 'invitee@throttle.test', role: 'painter' })).status).toBe(201);
    const token = linkIn((await mailTo(sw, 'invitee@throttle.test')).at(-1)!.text, '/invite/');
    const accept = (password: string, ip: string) =>
      new Caller(sw.app).agent.get('/api/auth/csrf').set('X-Forwarded-For', ip).then((r) =>
        request(sw.app).post(`/api/invitations/${token}/accept`).set('Cookie', cookieOf(r)!).set('x-csrf-token', r.body.token).set('X-Forwarded-For', ip).send({ password }),
      );
    for (let i = 0; i < THROTTLE_LIMITS.pair; i++) {
      const wrong = await accept('not the password', '198.51.100.9');
      expect(wrong.status).toBe(400);
      expect(wrong.body.error.fields.password).toMatch(/not the password/);
    }
    const blocked = await accept(PASSWORD, '198.51.100.9');
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    expect(Number((await sw.db('memberships').where({ studio_id: studioId }).count({ n: '*' }).first())!.n)).toBe(1);
    const joined = await accept(PASSWORD, '198.51.100.10');
    expect(joined.status).toBe(200);
    expect(joined.body.studioId).toBe(studioId);
  });
});

describe('account enumeration', () => {
  it('a wrong password and an unknown address take about as long (bcrypt at the accounts\' own cost both ways)', async () => {
    // cost 12, as in production: the unknown address used to be compared against a cost-10 hash, four times faster
    const timed = await startTestApp({ bcryptRounds: 12 });
    try {
      await signUp(timed, { email: 'timed@enum.test' });
      const once = async (email: string) => {
        const c = new Caller(timed.app);
        await c.csrf();
        const t = performance.now();
        const res = await c.post('/api/auth/login', { email, password: 'not the password at all' });
        expect(res.status).toBe(401);
        return performance.now() - t;
      };
      await once('nobody@enum.test'); // the first unknown address makes the comparison hash
      const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)];
      const known: number[] = [];
      const unknown: number[] = [];
      for (let i = 0; i < 5; i++) {
        known.push(await once('timed@enum.test'));
        unknown.push(await once(`nobody-${i}@enum.test`));
      }
      const ratio = median(known) / median(unknown);
      expect(ratio).toBeGreaterThan(0.5);
      expect(ratio).toBeLessThan(2);
    } finally {
      await timed.stop();
    }
  }, 120_000);
});

describe('passwords', () => {
  const base = { name: 'Long Secret', studioName: 'Long Studio', currency: 'EUR', timezone: 'UTC' };

  it('a new password has at least 12 characters: at sign-up, at a reset and when an invitation makes an account', async () => {
    const short = 'eleven char'; // 11
    const signup = await new Caller(sw.app).post('/api/auth/signup', { ...base, email: 'short@passwords.test', password: short });
    expect(signup.status).toBe(400);
    expect(signup.body.error.fields.password).toMatch(/12 characters/);
    expect((await new Caller(sw.app).post('/api/auth/signup', { ...base, email: 'short@passwords.test', password: `${short}s` })).status).toBe(201);
    const token = await resetLink('short@passwords.test');
    expect((await new Caller(sw.app).post('/api/auth/password-reset/confirm', { token, password: short })).status).toBe(400);
    const owner = await signInAs(sw, 'short@passwords.test', `${short}s`);
    const studioId = (await owner.get('/api/auth/me')).body.memberships[0].studioId;
    await owner.post(`/api/studios/${studioId}/invitations`, { email: 'newcomer@passwords.test', role: 'painter' });
    const invite = linkIn((await mailTo(sw, 'newcomer@passwords.test'))[0].text, '/invite/');
    const accepted = await new Caller(sw.app).post(`/api/invitations/${invite}/accept`, { name: 'Newcomer', password: short });
    expect(accepted.status).toBe(400);
    expect(accepted.body.error.fields.password).toMatch(/12 characters/);
  });

  it('does not truncate: a password that differs only after the 72nd byte is refused', async () => {
    const head = 'all the same for a good long while, '.repeat(3); // 108 bytes
    const c = new Caller(sw.app);
    expect((await c.post('/api/auth/signup', { ...base, email: 'long@passwords.test', password: `${head}then one ending` })).status).toBe(201);
    expect((await new Caller(sw.app).post('/api/auth/login', { email: 'long@passwords.test', password: `${head}then another ending` })).status).toBe(401);
    expect((await new Caller(sw.app).post('/api/auth/login', { email: 'long@passwords.test', password: `${head}then one ending` })).status).toBe(200);
  });

  it('accepts a 64-character password with spaces and non-Latin letters, and only that one', async () => {
    const password = 'ねこ と いぬ が すき '.repeat(5).slice(0, 64);
    expect([...password]).toHaveLength(64);
    expect(Buffer.byteLength(password)).toBeGreaterThan(72);
    expect((await new Caller(sw.app).post('/api/auth/signup', { ...base, email: 'kana@passwords.test', password })).status).toBe(201);
    expect((await new Caller(sw.app).post('/api/auth/login', { email: 'kana@passwords.test', password })).status).toBe(200);
    expect((await new Caller(sw.app).post('/api/auth/login', { email: 'kana@passwords.test', password: `${password.slice(0, 63)}x` })).status).toBe(401);
  });
});

describe('changing one’s password (ASVS 2.1.5, 2.1.6)', () => {
  const NEW = 'a brand new long secret';
  beforeAll(async () => {
    await signUp(sw, { email: 'changer@passwords.test' });
    await signUp(sw, { email: 'onlooker@passwords.test' });
  });

  it('needs the current password: a wrong one is a field error, and neither password changes', async () => {
    const c = await signInAs(sw, 'changer@passwords.test');
    const res = await c.post('/api/auth/password', { currentPassword: 'not the password at all', newPassword: NEW });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.currentPassword).toMatch(/current password/);
    expect((await new Caller(sw.app).post('/api/auth/login', { email: 'changer@passwords.test', password: NEW })).status).toBe(401);
    expect((await c.get('/api/auth/me')).status).toBe(200);
  });

  it('keeps the usual rules for the new one: 12 characters at least, not the current one again', async () => {
    const c = await signInAs(sw, 'changer@passwords.test');
    const short = await c.post('/api/auth/password', { currentPassword: PASSWORD, newPassword: 'eleven char' });
    expect(short.status).toBe(400);
    expect(short.body.error.fields.newPassword).toMatch(/12 characters/);
    const same = await c.post('/api/auth/password', { currentPassword: PASSWORD, newPassword: PASSWORD });
    expect(same.status).toBe(400);
    expect(same.body.error.fields.newPassword).toMatch(/other than the current/);
    expect((await new Caller(sw.app).post('/api/auth/password', { currentPassword: PASSWORD, newPassword: NEW })).status).toBe(401);
  });

  it('changes it: this session goes on under a new id, every other session ends, the old password stops working, and an e-mail says so', async () => {
    const other = await signInAs(sw, 'changer@passwords.test');
    const bystander = await signInAs(sw, 'onlooker@passwords.test');
    const c = await signInAs(sw, 'changer@passwords.test');
    const before = (await mailTo(sw, 'changer@passwords.test')).length;
    const oldCookie = cookieOf(await c.agent.get('/api/auth/csrf'))!;
    expect(oldCookie).toBeTruthy();
    const res = await c.post('/api/auth/password', { currentPassword: PASSWORD, newPassword: NEW });
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe('changer@passwords.test');
    const fresh = cookieOf(res)!;
    expect(sidIn(fresh)).not.toBe(sidIn(oldCookie));
    expect(await whoHas(fresh)).toBe('changer@passwords.test');
    expect(await whoHas(oldCookie)).toBe(401);
    expect((await other.get('/api/auth/me')).status).toBe(401);
    expect((await bystander.get('/api/auth/me')).status).toBe(200);
    // the session goes on writing (a fresh CSRF token for the new session)
    expect((await c.patch('/api/auth/me', { name: 'Changed Person' })).status).toBe(200);
    expect((await new Caller(sw.app).post('/api/auth/login', { email: 'changer@passwords.test', password: PASSWORD })).status).toBe(401);
    expect((await new Caller(sw.app).post('/api/auth/login', { email: 'changer@passwords.test', password: NEW })).status).toBe(200);
    await sw.jobs.deliverMail();
    const mails = await mailTo(sw, 'changer@passwords.test');
    expect(mails).toHaveLength(before + 1);
    expect(mails.at(-1)!.subject).toBe('Your Sablework password was changed');
    expect(mails.at(-1)!.text).not.toContain(NEW);
  });

  it(`wrong current passwords count against the account: after ${THROTTLE_LIMITS.account} the answer is 429 with Retry-After, even for the right one`, async () => {
    await signUp(sw, { email: 'guessed@passwords.test' });
    const thief = await signInAs(sw, 'guessed@passwords.test');
    for (let i = 0; i < THROTTLE_LIMITS.account; i++) expect((await thief.post('/api/auth/password', { currentPassword: `guess number ${i}`, newPassword: NEW })).status).toBe(400);
    const blocked = await thief.post('/api/auth/password', { currentPassword: PASSWORD, newPassword: NEW });
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    expect((await new Caller(sw.app).post('/api/auth/login', { email: 'guessed@passwords.test', password: NEW })).status).not.toBe(200);
  });
});
