import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Caller, PASSWORD, linkIn, mailTo, signInAs, signUp, startTestApp, type TestApp } from '../support/app';

let sw: TestApp;
beforeAll(async () => {
  sw = await startTestApp();
});
afterAll(() => sw.stop());

const sidOf = (res: { headers: Record<string, unknown> }) => {
  const cookies = (res.headers['set-cookie'] as string[] | undefined) ?? [];
  return cookies.find((c) => c.startsWith('sablework.sid='))?.split(';')[0];
};

describe('sign-up', () => {
  it('makes the person owner of a new studio and signs them in', async () => {
    const { caller, studioId } = await signUp(sw, { email: 'Founder@Example.test', studioName: 'Gloam & Gild' });
    const me = await caller.get('/api/auth/me').expect(200);
    expect(me.body.user.email).toBe('founder@example.test');
    expect(me.body.memberships).toEqual([{ studioId, studioName: 'Gloam & Gild', role: 'owner' }]);
    const studio = await caller.get(`/api/studios/${studioId}`).expect(200);
    expect(studio.body).toMatchObject({ name: 'Gloam & Gild', slug: 'gloam-gild', currency: 'EUR', timezone: 'Europe/Berlin', role: 'owner' });
  });

  it('answers 400 with a message per field for bad input', async () => {
    const c = new Caller(sw.app);
    const res = await c.post('/api/auth/signup', { name: '', email: 'nope', password: 'short', studioName: 'X', currency: 'EURO', timezone: 'Mars/Olympus' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['currency', 'email', 'name', 'password', 'studioName', 'timezone']);
    expect(res.body.error.fields.password).toMatch(/12 characters/);
  });

  it('refuses a second account for the same address, ignoring case', async () => {
    const c = new Caller(sw.app);
    const res = await c.post('/api/auth/signup', { name: 'Again', email: 'FOUNDER@example.TEST', password: PASSWORD, studioName: 'Other', currency: 'USD', timezone: 'UTC' });
    expect(res.status).toBe(409);
  });
});

describe('sign-in', () => {
  beforeAll(() => signUp(sw, { email: 'signin@example.test' }));

  it('accepts the right password, ignoring the case of the address', async () => {
    const c = await signInAs(sw, 'SignIn@Example.test');
    expect((await c.get('/api/auth/me')).body.user.email).toBe('signin@example.test');
  });

  it('refuses a wrong password and an unknown address with the same answer', async () => {
    const wrong = await new Caller(sw.app).post('/api/auth/login', { email: 'signin@example.test', password: 'not the password' });
    const unknown = await new Caller(sw.app).post('/api/auth/login', { email: 'nobody@example.test', password: 'not the password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
  });

  it('changes the session id at sign-in (no session fixation)', async () => {
    const c = new Caller(sw.app);
    const before = sidOf(await c.agent.get('/api/auth/csrf'));
    expect(before).toBeTruthy();
    const login = await c.post('/api/auth/login', { email: 'signin@example.test', password: PASSWORD });
    expect(login.status).toBe(200);
    const after = sidOf(login);
    expect(after).toBeTruthy();
    expect(after).not.toBe(before);
  });

  it('throttles after 10 failures per address and e-mail in 15 minutes, with Retry-After', async () => {
    await signUp(sw, { email: 'throttle@example.test' });
    const c = new Caller(sw.app);
    for (let i = 0; i < 10; i++) expect((await c.post('/api/auth/login', { email: 'throttle@example.test', password: 'wrong-wrong' })).status).toBe(401);
    const blocked = await c.post('/api/auth/login', { email: 'throttle@example.test', password: PASSWORD });
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    expect(Number(blocked.headers['retry-after'])).toBeLessThanOrEqual(15 * 60);
    sw.clock.advance(15 * 60_000 + 1000);
    expect((await c.post('/api/auth/login', { email: 'throttle@example.test', password: PASSWORD })).status).toBe(200);
  });

  it('logout destroys the session', async () => {
    const c = await signInAs(sw, 'signin@example.test');
    expect((await c.post('/api/auth/logout')).status).toBe(204);
    expect((await c.get('/api/auth/me')).status).toBe(401);
  });
});

describe('CSRF', () => {
  it('refuses unsafe requests without the token, and with a wrong one', async () => {
    const c = await signInAs(sw, 'signin@example.test');
    const none = await c.agent.patch('/api/auth/me').send({ name: 'X' });
    expect(none.status).toBe(403);
    expect(none.body.error.code).toBe('csrf');
    const wrong = await c.agent.patch('/api/auth/me').set('x-csrf-token', 'forged-token-value').send({ name: 'X' });
    expect(wrong.status).toBe(403);
    expect((await c.patch('/api/auth/me', { name: 'Renamed' })).body.user.name).toBe('Renamed');
  });

  it('gives anonymous visitors a token for public forms', async () => {
    const res = await new Caller(sw.app).get('/api/auth/csrf').expect(200);
    expect(res.body.token).toMatch(/^[A-Za-z0-9_-]{20,}$/);
  });
});

describe('invitations', () => {
  it('a painter invitation works once, from the captured mail', async () => {
    const owner = await signUp(sw, { email: 'inviter@example.test', studioName: 'Inviting Studio' });
    const inv = await owner.caller.post(`/api/studios/${owner.studioId}/invitations`, { email: 'New.Painter@Example.test', role: 'painter' });
    expect(inv.status).toBe(201);
    const [mail] = await mailTo(sw, 'new.painter@example.test');
    expect(mail.subject).toContain('Inviting Studio');
    expect(mail.html).toContain('/invite/');
    const token = linkIn(mail.text, '/invite/');

    const preview = await new Caller(sw.app).get(`/api/invitations/${token}`).expect(200);
    expect(preview.body).toMatchObject({ studioName: 'Inviting Studio', email: 'new.painter@example.test', role: 'painter', accountExists: false });

    const painter = new Caller(sw.app);
    const accepted = await painter.post(`/api/invitations/${token}/accept`, { name: 'Nell Painter', password: PASSWORD });
    expect(accepted.status).toBe(200);
    expect(accepted.body.memberships).toEqual([{ studioId: owner.studioId, studioName: 'Inviting Studio', role: 'painter' }]);

    const again = await new Caller(sw.app).post(`/api/invitations/${token}/accept`, { name: 'Someone Else', password: PASSWORD });
    expect(again.status).toBe(410);
    expect((await new Caller(sw.app).get(`/api/invitations/${token}`)).status).toBe(410);
  });

  it('expires after 7 days', async () => {
    const owner = await signUp(sw, { email: 'expiry-owner@example.test' });
    await owner.caller.post(`/api/studios/${owner.studioId}/invitations`, { email: 'late@example.test', role: 'painter' });
    const token = linkIn((await mailTo(sw, 'late@example.test'))[0].text, '/invite/');
    sw.clock.advance(7 * 24 * 3600_000 + 1000);
    const res = await new Caller(sw.app).post(`/api/invitations/${token}/accept`, { name: 'Late', password: PASSWORD });
    expect(res.status).toBe(410);
    expect(res.body.error.message).toMatch(/expired/);
  });

  it('adds a second studio to an existing account (a client of two studios has one account, two records)', async () => {
    const s1 = await signUp(sw, { email: 'first-studio@example.test', studioName: 'First' });
    const s2 = await signUp(sw, { email: 'second-studio@example.test', studioName: 'Second' });
    const ids: number[] = [];
    for (const s of [s1, s2]) {
      const client = await s.caller.post(`/api/studios/${s.studioId}/clients`, { name: 'Shared Client', email: 'Shared.Client@example.test' });
      expect(client.status).toBe(201);
      ids.push(client.body.id);
      expect((await s.caller.post(`/api/studios/${s.studioId}/clients/${client.body.id}/invite`)).status).toBe(201);
    }
    const mails = await mailTo(sw, 'shared.client@example.test');
    expect(mails).toHaveLength(2);
    const person = new Caller(sw.app);
    expect((await person.post(`/api/invitations/${linkIn(mails[0].text, '/invite/')}/accept`, { name: 'Shared Client', password: PASSWORD })).status).toBe(200);
    const second = linkIn(mails[1].text, '/invite/');
    expect((await new Caller(sw.app).get(`/api/invitations/${second}`)).body.accountExists).toBe(true);
    const wrong = await new Caller(sw.app).post(`/api/invitations/${second}/accept`, { password: 'not the right one' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields.password).toBeTruthy();
    const ok = await new Caller(sw.app).post(`/api/invitations/${second}/accept`, { password: PASSWORD });
    expect(ok.status).toBe(200);
    expect(ok.body.memberships.map((m: { role: string }) => m.role)).toEqual(['client', 'client']);
    const users = await sw.db('users').where({ email: 'shared.client@example.test' });
    expect(users).toHaveLength(1);
    const records = await sw.db('clients').whereIn('id', ids);
    expect(records.map((r) => r.user_id)).toEqual([users[0].id, users[0].id]);
  });
});

describe('password reset', () => {
  it('gives the same answer for known and unknown addresses, and only mails the known one', async () => {
    await signUp(sw, { email: 'forgetful@example.test' });
    const known = await new Caller(sw.app).post('/api/auth/password-reset', { email: 'FORGETFUL@example.test' });
    const unknown = await new Caller(sw.app).post('/api/auth/password-reset', { email: 'ghost@example.test' });
    expect(known.status).toBe(202);
    expect(unknown.status).toBe(202);
    expect(known.body).toEqual(unknown.body);
    expect(await mailTo(sw, 'ghost@example.test')).toHaveLength(0);
    const [mail] = await mailTo(sw, 'forgetful@example.test');
    const token = linkIn(mail.text, '/reset-password/');

    const c = new Caller(sw.app);
    const done = await c.post('/api/auth/password-reset/confirm', { token, password: 'a brand new secret' });
    expect(done.status).toBe(200);
    expect((await c.get('/api/auth/me')).status).toBe(200);
    expect((await new Caller(sw.app).post('/api/auth/password-reset/confirm', { token, password: 'yet another secret' })).status).toBe(410);
    await signInAs(sw, 'forgetful@example.test', 'a brand new secret');
    await expect(signInAs(sw, 'forgetful@example.test', PASSWORD)).rejects.toThrow(/401/);
  });

  it('expires after one hour', async () => {
    await signUp(sw, { email: 'slow@example.test' });
    await new Caller(sw.app).post('/api/auth/password-reset', { email: 'slow@example.test' });
    const token = linkIn((await mailTo(sw, 'slow@example.test'))[0].text, '/reset-password/');
    sw.clock.advance(3600_000 + 1000);
    const res = await new Caller(sw.app).post('/api/auth/password-reset/confirm', { token, password: 'too late for this' });
    expect(res.status).toBe(410);
  });
});

describe('API conventions', () => {
  it('malformed JSON is 400, an oversized body is 413, an unknown route is 404 JSON', async () => {
    const c = new Caller(sw.app);
    const token = await c.csrf();
    const bad = await c.agent.post('/api/auth/login').set('x-csrf-token', token).set('content-type', 'application/json').send('{"email": ');
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('invalid');
    const big = await c.agent.post('/api/auth/login').set('x-csrf-token', token).send({ email: 'a@b.test', password: 'x'.repeat(1_100_000) });
    expect(big.status).toBe(413);
    const missing = await c.get('/api/no-such-thing');
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('not_found');
  });

  it('sends security headers', async () => {
    const res = await new Caller(sw.app).get('/api/health');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-frame-options']).toBeTruthy();
    expect(res.headers['x-powered-by']).toBeUndefined();
  });

  it('sets the session cookie httpOnly and SameSite=Lax', async () => {
    const res = await new Caller(sw.app).get('/api/auth/csrf');
    const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('sablework.sid='))!;
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
  });
});
