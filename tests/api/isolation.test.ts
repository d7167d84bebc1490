import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, twoStudios, type TestApp } from '../support/app';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
});
afterAll(() => sw.stop());

describe('isolation between studios', () => {
  it("a studio's records answer 404 through another studio's path", async () => {
    const { a, b } = s;
    expect((await b.owner.get(`/api/studios/${b.studioId}/clients/${a.clientId}`)).status).toBe(404);
    expect((await b.owner.patch(`/api/studios/${b.studioId}/clients/${a.clientId}`, { name: 'Stolen' })).status).toBe(404);
    expect((await b.owner.post(`/api/studios/${b.studioId}/clients/${a.clientId}/invite`)).status).toBe(404);
    const row = await sw.db('clients').where({ id: a.clientId }).first();
    expect(row.name).toBe('Client a');
  });

  it("lists only the caller's own studio", async () => {
    const list = await s.b.owner.get(`/api/studios/${s.b.studioId}/clients`).expect(200);
    expect(list.body.items.map((c: { name: string }) => c.name)).toEqual(['Client b']);
    expect(list.body.total).toBe(1);
    const members = await s.b.owner.get(`/api/studios/${s.b.studioId}/members`).expect(200);
    expect(members.body.map((m: { email: string }) => m.email).sort()).toEqual(['owner-b@studio.test', 'painter-b@studio.test']);
  });

  it('members of one studio get 404 for another studio, whatever their role', async () => {
    for (const c of [s.a.owner, s.a.painter, s.a.client]) {
      expect((await c.get(`/api/studios/${s.b.studioId}`)).status).toBe(404);
      expect((await c.get(`/api/studios/${s.b.studioId}/clients`)).status).toBe(404);
    }
  });

  it('ids that are not numbers, or do not exist, are 404 and never 500', async () => {
    for (const url of [`/api/studios/abc`, `/api/studios/0/clients`, `/api/studios/${s.a.studioId}/clients/1e3x`, `/api/studios/${s.a.studioId}/clients/99999999`, `/api/studios/9007199254740993`]) {
      expect((await s.a.owner.get(url)).status, url).toBe(404);
    }
  });

  it('a painter cannot invite, edit the studio or create clients', async () => {
    expect((await s.a.painter.post(`/api/studios/${s.a.studioId}/invitations`, { email: 'x@y.test', role: 'painter' })).status).toBe(403);
    expect((await s.a.painter.patch(`/api/studios/${s.a.studioId}`, { name: 'Mine now' })).status).toBe(403);
    expect((await s.a.painter.post(`/api/studios/${s.a.studioId}/clients`, { name: 'Nope' })).status).toBe(403);
  });

  it('the last owner cannot be removed', async () => {
    const me = await s.a.owner.get('/api/auth/me');
    const res = await s.a.owner.delete(`/api/studios/${s.a.studioId}/members/${me.body.user.id}`);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('last_owner');
  });
});
