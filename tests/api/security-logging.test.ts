// What the log says about security events (sign-ins, refusals) and what it must never say (passwords, cookies,
// CSRF tokens, tokens in URLs, e-mail addresses of failed sign-ins). The app's log lines are collected here.
import crypto from 'node:crypto';
import { Writable } from 'node:stream';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { THROTTLE_LIMITS } from '../../server/features/auth/auth.service';
import { Caller, PASSWORD, startTestApp, twoStudios, type TestApp } from '../support/app';
import { FAKE_TOKEN } from '../support/route-fixtures';

type Line = Record<string, unknown> & { msg?: string; event?: string; code?: string };
const raw: string[] = [];
const lines: Line[] = [];
const sink = new Writable({
  write(chunk, _enc, done) {
    for (const l of String(chunk).split('\n').filter(Boolean)) {
      raw.push(l);
      lines.push(JSON.parse(l) as Line);
    }
    done();
  },
});

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
/** Everything secret the test has seen, that no log line may hold. */
const secrets = new Set<string>([PASSWORD, FAKE_TOKEN]);
beforeAll(async () => {
  sw = await startTestApp({ logLevel: 'info', logDestination: sink, trustProxy: true });
  s = await twoStudios(sw);
}, 60_000);
afterAll(() => sw.stop());

const hashOf = (email: string) => crypto.createHash('sha256').update(email).digest('hex').slice(0, 16);
const since = (n: number) => lines.slice(n);
/** A caller whose session id and CSRF token join the secrets. */
async function watched(c: Caller) {
  const res = await c.agent.get('/api/auth/csrf');
  secrets.add(res.body.token);
  for (const ck of (res.headers['set-cookie'] as unknown as string[] | undefined) ?? []) secrets.add(decodeURIComponent(ck.split(';')[0].split('=')[1]).replace(/^s:/, '').split('.')[0]);
  return c;
}
const postFrom = async (ip: string, url: string, body: object) => {
  const r = await new Caller(sw.app).agent.get('/api/auth/csrf').set('X-Forwarded-For', ip);
  secrets.add(r.body.token);
  return request(sw.app).post(url).set('Cookie', (r.headers['set-cookie'] as unknown as string[])[0].split(';')[0]).set('x-csrf-token', r.body.token).set('X-Forwarded-For', ip).send(body);
};

describe('security events in the log', () => {
  it('a failed sign-in: the account as a short hash, the address and the route; no password, no e-mail address', async () => {
    const n = lines.length;
    expect((await postFrom('203.0.113.5', '/api/auth/login', { email: 'Owner-A@studio.test', password: 'a wrong guess here' })).status).toBe(401);
    const line = since(n).find((l) => l.event === 'security.refused');
    expect(line).toMatchObject({ code: 'invalid_credentials', status: 401, account: hashOf('owner-a@studio.test'), ip: '203.0.113.5', route: '/api/auth/login', method: 'POST' });
    const text = raw.slice(n).join('\n');
    expect(text).not.toMatch(/owner-a@studio\.test/i);
    expect(text).not.toContain('a wrong guess here');
  });

  it('sign-in, sign-out and a reset request are logged with the person and the address', async () => {
    const n = lines.length;
    const ownerId = (await sw.db('users').where({ email: 'owner-a@studio.test' }).first('id')).id;
    const login = await postFrom('203.0.113.6', '/api/auth/login', { email: 'owner-a@studio.test', password: PASSWORD });
    expect(login.status).toBe(200);
    expect(since(n).find((l) => l.event === 'security.signed-in')).toMatchObject({ how: 'password', userId: ownerId, ip: '203.0.113.6' });
    const c = await watched(await (async () => {
      const x = new Caller(sw.app);
      await x.post('/api/auth/login', { email: 'owner-a@studio.test', password: PASSWORD });
      return x;
    })());
    expect((await c.post('/api/auth/logout')).status).toBe(204);
    expect(since(n).find((l) => l.event === 'security.signed-out')).toMatchObject({ userId: ownerId });
    expect((await postFrom('203.0.113.7', '/api/auth/password-reset', { email: 'owner-a@studio.test' })).status).toBe(202);
    expect(since(n).find((l) => l.event === 'security.reset-requested')).toMatchObject({ account: hashOf('owner-a@studio.test'), ip: '203.0.113.7' });
    expect(raw.slice(n).join('\n')).not.toMatch(/owner-a@studio\.test/i);
  });

  it('throttled sign-ins, CSRF refusals, a role that may not and a member of another studio are logged', async () => {
    const n = lines.length;
    for (let i = 0; i <= THROTTLE_LIMITS.pair; i++) await postFrom('203.0.113.8', '/api/auth/login', { email: 'painter-a@studio.test', password: 'not it at all' });
    expect(since(n).find((l) => l.code === 'throttled')).toMatchObject({ event: 'security.refused', status: 429, account: hashOf('painter-a@studio.test') });

    const painter = await watched(s.a.painter);
    expect((await painter.agent.patch('/api/auth/me').send({ name: 'x' })).status).toBe(403);
    const painterId = (await sw.db('users').where({ email: 'painter-a@studio.test' }).first('id')).id;
    expect(since(n).find((l) => l.code === 'csrf')).toMatchObject({ status: 403, route: '/api/auth/me', userId: painterId });

    expect((await painter.get(`/api/studios/${s.a.studioId}/members`)).status).toBe(403);
    expect(since(n).find((l) => l.code === 'forbidden')).toMatchObject({ status: 403, route: '/api/studios/:studioId/members', userId: painterId });

    expect((await s.b.owner.get(`/api/studios/${s.a.studioId}/clients`)).status).toBe(404);
    const bOwner = (await sw.db('users').where({ email: 'owner-b@studio.test' }).first('id')).id;
    expect(since(n).find((l) => l.refusal === 'not-a-member')).toMatchObject({ code: 'not_found', status: 404, route: '/api/studios/:studioId/clients', userId: bOwner });
  });

  it('never logs cookies, CSRF tokens, session ids, passwords or tokens in URLs, not even with an unexpected failure', async () => {
    const owner = await watched(s.a.owner);
    // a token in the URL of a refused call (no CSRF token sent)
    expect((await owner.agent.post(`/api/invitations/${FAKE_TOKEN}/accept`).send({ password: PASSWORD })).status).toBe(403);
    expect(raw.some((l) => l.includes('/api/invitations/:token/accept'))).toBe(true);
    // an unexpected failure logs the error with the request, sent here with the cookie and a CSRF token
    const n = lines.length;
    await sw.db.schema.dropTable('recipe_step_paints');
    const token = await owner.csrf();
    secrets.add(token);
    const failed = await owner.agent.get(`/api/studios/${s.a.studioId}/paints`).set('x-csrf-token', token);
    expect(failed.status).toBe(500);
    const error = since(n).find((l) => l.msg === 'unexpected error');
    expect(error).toBeTruthy();
    expect(JSON.stringify(error)).toContain(`/api/studios/${s.a.studioId}/paints`);
    expect(raw.length).toBeGreaterThan(10);
    for (const secret of secrets) expect(raw.filter((l) => l.includes(secret)), `a log line holds ${secret.slice(0, 6)}…`).toEqual([]);
  });
});
