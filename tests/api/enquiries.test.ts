import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Caller, linkIn, mailTo, PASSWORD, signUp, startTestApp, twoStudios, type TestApp } from '../support/app';
import { images, secondClient } from '../support/fixtures';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let slug: string;
let base: string;
let ip = 0;

/** A visitor's enquiry through the public form (its own address each time, behind the trusted proxy). */
async function enquire(email: string, over: Record<string, string> = {}, photos = 0) {
  const c = new Caller(sw.app);
  const token = await c.csrf();
  let req = c.agent.post(`/api/public/studios/${slug}/enquiries`).set('x-csrf-token', token).set('x-forwarded-for', `198.51.100.${++ip}`);
  const fields = {
    name: 'Corvin Ashdale',
    email,
    figures: JSON.stringify([
      { name: 'Plague rat swarm', quantity: 10, sizeClass: '25' },
      { name: 'Rat ogre', quantity: 1, sizeClass: '50' },
    ]),
    tier: 'display',
    extras: JSON.stringify(['freehand']),
    dueDate: '2026-09-01',
    budget: '480',
    notes: 'Sickly greens and rust.',
    consent: 'true',
    ...over,
  };
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  for (let i = 0; i < photos; i++) req = req.attach('photos', await images.twoTone(120, 90), { filename: `ref${i}.jpg`, contentType: 'image/jpeg' });
  const res = await req;
  if (res.status !== 201) throw new Error(`enquiry failed: ${res.status} ${JSON.stringify(res.body)}`);
  const row = await sw.db('enquiries').where({ email: email.toLowerCase() }).orderBy('id', 'desc').first('id');
  return row.id as number;
}

beforeAll(async () => {
  sw = await startTestApp({ trustProxy: true });
  s = await twoStudios(sw);
  base = `/api/studios/${s.a.studioId}`;
  const page = await s.a.owner.put(`${base}/public-page`, { enabled: true, turnaroundSource: 'text' });
  slug = page.body.slug;
});
afterAll(() => sw.stop());

describe('accepting an enquiry', () => {
  it('creates the client, the commission in the enquiry state with its figures and photos, and invites the client', async () => {
    const id = await enquire('corvin@visitor.test', {}, 2);
    const clientsBefore = await sw.db('clients').where({ studio_id: s.a.studioId }).count({ n: '*' }).first();
    const res = await s.a.owner.post(`${base}/enquiries/${id}/accept`, {});
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.client).toMatchObject({ name: 'Corvin Ashdale', matched: false });
    expect(res.body.invitation.sent).toBe(true);
    expect(res.body.enquiry).toMatchObject({ status: 'accepted', commissionId: res.body.commissionId, clientId: res.body.client.id, decidedBy: { name: 'Test Person' } });
    expect(await sw.db('clients').where({ studio_id: s.a.studioId }).count({ n: '*' }).first()).toEqual({ n: Number(clientsBefore!.n) + 1 });

    const c = await s.a.owner.get(`${base}/commissions/${res.body.commissionId}`).expect(200);
    expect(c.body).toMatchObject({ status: 'enquiry', title: 'Plague rat swarm and 1 more figure', dueDate: '2026-09-01', client: { id: res.body.client.id } });
    expect(c.body.figures.map((f: { name: string; quantity: number; sizeClass: string; tier: string }) => [f.name, f.quantity, f.sizeClass, f.tier])).toEqual([
      ['Plague rat swarm', 10, '25', 'display'],
      ['Rat ogre', 1, '50', 'display'],
    ]);
    expect(c.body.brief).toContain('Wished extras: Freehand.');
    expect(c.body.brief).toContain('Budget: 480.00 EUR.');
    expect(c.body.brief).toContain('Sickly greens and rust.');
    const photos = await s.a.owner.get(`${base}/commissions/${res.body.commissionId}/photos`).expect(200);
    expect(photos.body.map((p: { kind: string; shared: boolean }) => [p.kind, p.shared])).toEqual([
      ['reference', true],
      ['reference', true],
    ]);
    await s.a.owner.get(photos.body[0].urls.thumb).expect(200);

    // The invitation is in the outbox; following it, the new client sees their commission.
    const mails = await mailTo(sw, 'corvin@visitor.test');
    const invite = mails.find((m) => m.subject.includes('invites you'));
    expect(invite).toBeDefined();
    const client = new Caller(sw.app);
    const accepted = await client.post(`/api/invitations/${linkIn(invite!.text, '/invite/')}/accept`, { name: 'Corvin Ashdale', password: PASSWORD });
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);
    const mine = await client.get(`${base}/commissions`).expect(200);
    expect(mine.body.items.map((x: { id: number }) => x.id)).toEqual([res.body.commissionId]);
  });

  it('matches an existing client by e-mail whatever its case, so there is exactly one client, and says when no invitation is needed', async () => {
    // An older record saved with capitals, and an account already linked to it.
    const existing = await secondClient(sw, s.a.owner, s.a.studioId, 'morwen@visitor.test');
    await sw.db('clients').where({ id: existing.clientId }).update({ email: 'Morwen@Visitor.TEST' });
    const id = await enquire('MORWEN@visitor.test', { name: 'Morwen Vale' });
    const view = await s.a.owner.get(`${base}/enquiries/${id}`).expect(200);
    expect(view.body.existingClient).toEqual({ id: existing.clientId, name: 'Second Client', hasAccount: true });

    const res = await s.a.owner.post(`${base}/enquiries/${id}/accept`, { title: 'Rat-catchers' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.client).toEqual({ id: existing.clientId, name: 'Second Client', matched: true });
    expect(res.body.invitation).toEqual({ sent: false, note: 'Second Client already has an account, so no invitation was sent; they see the commission when they sign in.' });
    const same = await sw.db('clients').where({ studio_id: s.a.studioId }).whereRaw('lower(email) = ?', ['morwen@visitor.test']);
    expect(same).toHaveLength(1);
    const mine = await existing.caller.get(`${base}/commissions`).expect(200);
    expect(mine.body.items.map((x: { title: string }) => x.title)).toContain('Rat-catchers');
    // A second enquiry from the same person joins the same client again.
    const again = await enquire('morwen@visitor.test', { name: 'Morwen Vale' });
    const second = await s.a.owner.post(`${base}/enquiries/${again}/accept`, { invite: false });
    expect(second.body.client.id).toBe(existing.clientId);
    expect(await sw.db('clients').where({ studio_id: s.a.studioId }).whereRaw('lower(email) = ?', ['morwen@visitor.test'])).toHaveLength(1);
  });

  it('can be done once: a second accept or a decline afterwards is 409 and makes nothing', async () => {
    const id = await enquire('twice@visitor.test');
    expect((await s.a.owner.post(`${base}/enquiries/${id}/accept`, {})).status).toBe(201);
    const commissions = await sw.db('commissions').where({ studio_id: s.a.studioId }).count({ n: '*' }).first();
    const again = await s.a.owner.post(`${base}/enquiries/${id}/accept`, {});
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('already_decided');
    expect((await s.a.owner.post(`${base}/enquiries/${id}/decline`, { message: 'No.' })).status).toBe(409);
    expect(await sw.db('commissions').where({ studio_id: s.a.studioId }).count({ n: '*' }).first()).toEqual(commissions);
  });

  it('falls back to the studio’s first tier when the wished one was removed since', async () => {
    const id = await enquire('tiers@visitor.test', { tier: 'enhanced' });
    await s.a.owner.put(`${base}/lists`, { tiers: [{ key: 'tabletop', label: 'Tabletop' }, { key: 'display', label: 'Display' }], extras: [{ key: 'freehand', label: 'Freehand' }] });
    const res = await s.a.owner.post(`${base}/enquiries/${id}/accept`, {});
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const c = await s.a.owner.get(`${base}/commissions/${res.body.commissionId}`).expect(200);
    expect(c.body.figures.map((f: { tier: string }) => f.tier)).toEqual(['tabletop', 'tabletop']);
  });
});

describe('declining an enquiry', () => {
  it('offers a polite draft, sends the owner’s edited text and files the enquiry as declined', async () => {
    const id = await enquire('nope@visitor.test', { name: 'Hedda Morrow' });
    const view = await s.a.owner.get(`${base}/enquiries/${id}`).expect(200);
    expect(view.body.declineDraft).toMatch(/^Hello Hedda Morrow,/);
    expect(view.body.declineDraft).toContain('Studio a');
    const message = 'Hello Hedda,\n\nOur queue is full until winter; we would be glad to hear from you then.\n\nWilma';
    const res = await s.a.owner.post(`${base}/enquiries/${id}/decline`, { message });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ status: 'declined', declineMessage: message, commissionId: null });
    const mails = await mailTo(sw, 'nope@visitor.test');
    const decline = mails.find((m) => m.subject === 'Studio a: about your enquiry');
    expect(decline?.text).toContain('Our queue is full until winter; we would be glad to hear from you then.');
    expect((await s.a.owner.post(`${base}/enquiries/${id}/accept`, {})).status).toBe(409);
    expect((await s.a.owner.post(`${base}/enquiries/${id}/decline`, {})).status).toBe(400);
  });
});

describe('the inbox', () => {
  it('lists the studio’s own enquiries, newest first, filtered by status; another studio sees none of them', async () => {
    const fresh = await enquire('inbox@visitor.test', { name: 'Newest Person' });
    const all = await s.a.owner.get(`${base}/enquiries`).expect(200);
    expect(all.body.items[0]).toMatchObject({ id: fresh, name: 'Newest Person', status: 'new', figureCount: 2, modelCount: 11 });
    expect(all.body.newCount).toBeGreaterThanOrEqual(1);
    const declined = await s.a.owner.get(`${base}/enquiries?status=declined`).expect(200);
    expect(declined.body.items.every((e: { status: string }) => e.status === 'declined')).toBe(true);
    expect(declined.body.total).toBe(1);

    const other = await signUp(sw, { email: 'elsewhere@studio.test', studioName: 'Elsewhere' });
    const theirs = await other.caller.get(`/api/studios/${other.studioId}/enquiries`).expect(200);
    expect(theirs.body.total).toBe(0);
    expect((await other.caller.get(`/api/studios/${other.studioId}/enquiries/${fresh}`)).status).toBe(404);
    expect((await s.b.owner.get(`${base}/enquiries/${fresh}`)).status).toBe(404);
    expect((await s.a.painter.get(`${base}/enquiries`)).status).toBe(403);
  });
});
