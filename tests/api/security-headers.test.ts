// Response headers and the session cookie, on every kind of answer (ok, refused, failed, a file), for the three
// ways the app is reached: plain http (local), https behind a proxy (TRUST_PROXY), https address without a proxy.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Caller, signUp, startTestApp, type TestApp } from '../support/app';
import { images, upload } from '../support/fixtures';

let sw: TestApp;
let owner: Caller;
let studioId: number;
let photoUrl: string;
beforeAll(async () => {
  sw = await startTestApp();
  ({ caller: owner, studioId } = await signUp(sw, { email: 'headers@owner.test' }));
  const client = await owner.post(`/api/studios/${studioId}/clients`, { name: 'Header Client' });
  const c = await owner.post(`/api/studios/${studioId}/commissions`, { clientId: client.body.id, title: 'Headers', figures: [{ name: 'One', quantity: 1, sizeClass: '28', tier: 'tabletop' }] });
  const photo = await upload(owner, `/api/studios/${studioId}/commissions/${c.body.id}/photos`, [{ data: await images.twoTone(64, 48), name: 'h.jpg' }], { kind: 'progress' });
  photoUrl = `/api/studios/${studioId}/photos/${photo.body[0].id}/thumb`;
}, 60_000);
afterAll(() => sw.stop());

type Res = { status: number; headers: Record<string, string | string[] | undefined> };
const header = (res: Res, name: string) => {
  const v = res.headers[name];
  return Array.isArray(v) ? v.join(', ') : v;
};
/** The directives of a Content-Security-Policy header, by name. */
const csp = (res: Res) => Object.fromEntries((header(res, 'content-security-policy') ?? '').split(';').map((d) => d.trim().split(/\s+/)).filter((d) => d[0]).map(([k, ...v]) => [k, v]));

describe('security headers', () => {
  const answers: [string, () => Promise<Res>][] = [
    ['a JSON answer', () => owner.get('/api/auth/me')],
    ['an unknown route (404)', () => request(sw.app).get('/api/no-such-route')],
    ['signed out (401)', () => request(sw.app).get('/api/auth/me')],
    ['unreadable JSON (400)', async () => request(sw.app).post('/api/auth/login').set('x-csrf-token', 'x').set('content-type', 'application/json').send('{"a":')],
    ['a refused CSRF token (403)', () => owner.agent.patch('/api/auth/me').send({ name: 'x' })],
    ['a photo', () => owner.get(photoUrl)],
    ['an invoice CSV', () => owner.get(`/api/studios/${studioId}/invoices/export.csv`)],
  ];

  it.each(answers)('%s carries CSP, nosniff, no framing, no referrer and no X-Powered-By', async (_label, get) => {
    const res = await get();
    expect(res.status).toBeLessThan(500);
    const policy = csp(res);
    const effective = (d: string) => policy[d] ?? policy['default-src'];
    if (policy['default-src']?.[0] === "'none'") {
      // a stored file (photo) is served under a policy of its own: nothing may run, in a sandbox
      expect(policy.sandbox).toBeDefined();
    } else {
      expect(policy['default-src']).toEqual(["'self'"]);
      expect(policy['frame-ancestors']).toEqual(["'none'"]);
      expect(policy['base-uri']).toEqual(["'self'"]);
      expect(policy['form-action']).toEqual(["'self'"]);
    }
    expect([["'self'"], ["'none'"]]).toContainEqual(effective('script-src')); // no inline script, no eval
    expect(effective('object-src')).toEqual(["'none'"]);
    expect(header(res, 'x-content-type-options')).toBe('nosniff');
    expect(header(res, 'x-frame-options')).toBe('DENY');
    expect(header(res, 'referrer-policy')).toBe('no-referrer');
    expect(header(res, 'x-powered-by')).toBeUndefined();
    expect(header(res, 'server')).toBeUndefined();
    expect(header(res, 'access-control-allow-origin')).toBeUndefined();
    // ASVS 14.4.1: text answers name their character set
    const type = header(res, 'content-type') ?? '';
    if (/json|text|csv/.test(type)) expect(type).toMatch(/charset=utf-8/i);
  });

  it('API answers are not kept by browsers or proxies: no-store, except photos, which are private', async () => {
    for (const url of ['/api/auth/me', `/api/studios/${studioId}`, `/api/studios/${studioId}/clients`, `/api/studios/${studioId}/commissions`, `/api/studios/${studioId}/invoices/export.csv`]) {
      expect(header(await owner.get(url), 'cache-control'), url).toBe('no-store');
    }
    expect(header(await request(sw.app).get('/api/auth/me'), 'cache-control')).toBe('no-store');
    const photo = header(await owner.get(photoUrl), 'cache-control') ?? '';
    expect(photo).toMatch(/private|no-store/);
    expect(photo).not.toMatch(/public/);
  });

  it('no cross-origin access: another origin gets no Access-Control-Allow-Origin, not even on a preflight', async () => {
    const preflight = await request(sw.app).options('/api/auth/me').set('Origin', 'https://elsewhere.test').set('Access-Control-Request-Method', 'PATCH');
    expect(header(preflight, 'access-control-allow-origin')).toBeUndefined();
    expect(header(preflight, 'access-control-allow-credentials')).toBeUndefined();
    const simple = await owner.get('/api/auth/me').set('Origin', 'https://elsewhere.test');
    expect(header(simple, 'access-control-allow-origin')).toBeUndefined();
  });

  it('no HSTS on a plain-http address (local use)', async () => {
    expect(header(await request(sw.app).get('/api/health'), 'strict-transport-security')).toBeUndefined();
  });

  it('an unexpected failure is a generic 500 with a request id: no stack, no SQL, no table names', async () => {
    const broken = await startTestApp();
    try {
      const { caller, studioId: s } = await signUp(broken, { email: 'broken@owner.test' });
      await broken.db.schema.dropTable('recipe_step_paints');
      const res = await caller.get(`/api/studios/${s}/paints`);
      expect(res.status).toBe(500);
      expect(res.body.error.code).toBe('internal');
      expect(res.body.error.requestId).toBe(res.headers['x-request-id']);
      expect(res.body.error.message).toContain(res.body.error.requestId);
      expect(JSON.stringify(res.body)).not.toMatch(/recipe_step_paints|select|sqlite|at .*\.ts|Error:/i);
    } finally {
      await broken.stop();
    }
  });
});

describe('cookies', () => {
  const sessionCookieOf = (res: Res) => ((res.headers['set-cookie'] as string[] | undefined) ?? []).find((c) => /^(__Host-)?sablework\.sid=/.test(c));

  it('on plain http: HttpOnly, SameSite=Lax, the whole path, no Domain, not Secure (local use)', async () => {
    const cookie = sessionCookieOf(await request(sw.app).get('/api/auth/csrf'))!;
    expect(cookie).toMatch(/^sablework\.sid=/);
    expect(cookie).toMatch(/; HttpOnly/);
    expect(cookie).toMatch(/; SameSite=Lax/);
    expect(cookie).toMatch(/; Path=\/(;|$)/);
    expect(cookie).not.toMatch(/Domain=/i);
    expect(cookie).not.toMatch(/; Secure/);
  });

  it('behind an https proxy: a __Host- cookie, Secure, HttpOnly, SameSite=Lax; HSTS of a year with subdomains; none over plain http', async () => {
    const proxied = await startTestApp({ trustProxy: true, publicUrl: 'https://studio.example.test' });
    try {
      const res = await request(proxied.app).get('/api/auth/csrf').set('X-Forwarded-Proto', 'https');
      const cookie = sessionCookieOf(res)!;
      expect(cookie).toMatch(/^__Host-sablework\.sid=/);
      expect(cookie).toMatch(/; Secure/);
      expect(cookie).toMatch(/; HttpOnly/);
      expect(cookie).toMatch(/; SameSite=Lax/);
      expect(cookie).toMatch(/; Path=\/(;|$)/);
      expect(cookie).not.toMatch(/Domain=/i);
      const hsts = header(res, 'strict-transport-security') ?? '';
      expect(Number(hsts.match(/max-age=(\d+)/)?.[1])).toBeGreaterThanOrEqual(365 * 24 * 3600);
      expect(hsts).toMatch(/includeSubDomains/);
      // a request the proxy passed on as plain http gets no session cookie at all
      expect(sessionCookieOf(await request(proxied.app).get('/api/auth/csrf').set('X-Forwarded-Proto', 'http'))).toBeUndefined();
      // signing out clears the same cookie, with the attributes a __Host- cookie needs
      // supertest speaks plain http to the app, so its cookie jar would hold back a Secure cookie: carried by hand
      let jar = '';
      const https = async (r: request.Test) => {
        const res = await r.set('X-Forwarded-Proto', 'https').set('Cookie', jar);
        jar = sessionCookieOf(res)?.split(';')[0] ?? jar;
        return res;
      };
      const app = request(proxied.app);
      const signup = { name: 'Proxied', email: 'proxied@owner.test', password: 'correct horse battery', studioName: 'Proxied', currency: 'EUR', timezone: 'UTC' };
      const first = (await https(app.get('/api/auth/csrf'))).body.token;
      expect((await https(app.post('/api/auth/signup').set('x-csrf-token', first).send(signup))).status).toBe(201);
      const token = (await https(app.get('/api/auth/csrf'))).body.token;
      expect((await https(app.get('/api/auth/me'))).status).toBe(200);
      const out = await https(app.post('/api/auth/logout').set('x-csrf-token', token).send({}));
      expect(out.status).toBe(204);
      const cleared = sessionCookieOf(out)!;
      expect(cleared).toMatch(/^__Host-sablework\.sid=;/);
      expect(cleared).toMatch(/; Secure/);
      expect(cleared).toMatch(/; Path=\//);
    } finally {
      await proxied.stop();
    }
  });

  it('an https address without a proxy: a plain-http request never gets a session cookie without Secure', async () => {
    const direct = await startTestApp({ publicUrl: 'https://studio.example.test' });
    try {
      const res = await request(direct.app).get('/api/auth/csrf');
      expect(sessionCookieOf(res)).toBeUndefined();
      expect(header(res, 'strict-transport-security')).toMatch(/max-age=\d+/);
    } finally {
      await direct.stop();
    }
  });
});
