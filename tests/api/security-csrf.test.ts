// CSRF on every unsafe route the router has (generated from sw.routes()): without the session's token, or with a
// token of another session, the call is refused with 403 before it reaches the route. The payment webhook is the
// one documented exemption (server/app.ts CSRF_EXEMPT): the payment service signs its events instead.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Caller, PASSWORD, startTestApp, twoStudios, type TestApp } from '../support/app';
import { fill, studioRecords, type RouteIds, type StudioMembers } from '../support/route-fixtures';
import { changes, snapshot } from '../support/security';

const WEBHOOK = 'POST /api/webhooks/payments';

let sw: TestApp;
let A: StudioMembers;
let ids: RouteIds;
let unsafe: { method: string; path: string; url: string }[];

beforeAll(async () => {
  sw = await startTestApp();
  ({ a: A } = await twoStudios(sw));
  ids = await studioRecords(sw, A, 'a');
  unsafe = sw
    .routes()
    .filter((r) => r.method !== 'GET')
    .map((r) => ({ method: r.method, path: r.path, url: fill(r.path, ids) }));
}, 180_000);
afterAll(() => sw.stop());

const send = (agent: ReturnType<typeof request.agent> | ReturnType<typeof request>, method: string, url: string, token?: string) => {
  const req = (agent as ReturnType<typeof request>)[method.toLowerCase() as 'post'](url);
  return (token === undefined ? req : req.set('x-csrf-token', token)).send({});
};
const refusedAsCsrf = (res: { status: number; body: { error?: { code?: string } } }) => res.status === 403 && res.body.error?.code === 'csrf';

describe('CSRF on every unsafe route', () => {
  it('the only unsafe route that takes no token is the payment webhook', async () => {
    const taking: string[] = [];
    for (const r of unsafe) if (!refusedAsCsrf(await send(request(sw.app), r.method, r.url))) taking.push(`${r.method} ${r.path}`);
    expect(unsafe.length).toBeGreaterThan(1);
    expect(taking).toEqual([WEBHOOK]);
  });

  it("a signed-in owner's call without the token, with a forged one or with another session's token is 403, and changes nothing", async () => {
    const before = await snapshot(sw);
    const owner = A.owner.agent;
    const otherSession = await new Caller(sw.app).csrf(); // an anonymous visitor's token
    const painter = await A.painter.csrf(); // another signed-in person's token
    const failures: string[] = [];
    for (const r of unsafe) {
      if (`${r.method} ${r.path}` === WEBHOOK) continue;
      for (const [label, token] of [['none', undefined], ['forged', 'x'.repeat(32)], ['empty', ''], ["another visitor's", otherSession], ["the painter's", painter]] as const) {
        const res = await send(owner, r.method, r.url, token);
        if (!refusedAsCsrf(res)) failures.push(`${r.method} ${r.path} with ${label} token → ${res.status}`);
      }
    }
    expect(failures).toEqual([]);
    expect(changes(before, await snapshot(sw))).toEqual({});
    // and the owner's own token still works (the refusals above were the token's doing)
    expect((await A.owner.patch('/api/auth/me', { name: 'Test Person' })).status).toBe(200);
  }, 300_000);

  it('the token counts only in its header, not as a query parameter or a body field', async () => {
    const token = await A.owner.csrf();
    for (const res of [
      await A.owner.agent.patch(`/api/auth/me?_csrf=${token}&csrf=${token}`).send({ name: 'Via query' }),
      await A.owner.agent.patch('/api/auth/me').send({ name: 'Via body', _csrf: token, csrf: token, 'x-csrf-token': token }),
    ]) expect(refusedAsCsrf(res)).toBe(true);
    expect((await A.owner.get('/api/auth/me')).body.user.name).not.toMatch(/^Via/);
  });

  it('the token of the session before sign-in no longer works after it', async () => {
    const c = new Caller(sw.app);
    const before = await c.csrf();
    const login = await c.agent.post('/api/auth/login').set('x-csrf-token', before).send({ email: 'owner-a@studio.test', password: PASSWORD });
    expect(login.status).toBe(200);
    expect(refusedAsCsrf(await c.agent.patch('/api/auth/me').set('x-csrf-token', before).send({ name: 'Stale' }))).toBe(true);
    const after = await c.csrf();
    expect(after).not.toBe(before);
    expect((await c.agent.patch('/api/auth/me').set('x-csrf-token', after).send({ name: 'Test Person' })).status).toBe(200);
  });

  it('the payment webhook goes by its signature instead: unsigned or wrongly signed 400, correctly signed 200, no token either way', async () => {
    const payload = JSON.stringify({ id: 'evt_csrf_exempt', object: 'event', type: 'customer.created', created: Math.floor(sw.clock.now().getTime() / 1000), data: { object: { id: 'cus_1', object: 'customer' } } });
    const post = (signature?: string) => {
      const req = request(sw.app).post('/api/webhooks/payments').set('content-type', 'application/json');
      return (signature ? req.set('stripe-signature', signature) : req).send(payload);
    };
    const sign = (secret: string) => sw.payments.stripe.webhooks.generateTestHeaderString({ payload, secret, timestamp: Math.floor(sw.clock.now().getTime() / 1000) });
    expect((await post()).status).toBe(400);
    expect((await post(sign('whsec_not_the_one'))).status).toBe(400);
    const ok = await post(sign(sw.paymentsFake!.webhookSecret));
    expect(ok.status).toBe(200);
  });
});
