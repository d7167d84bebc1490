import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mailTo, startTestApp, twoStudios, type TestApp } from '../support/app';
import { images, insertCommission, secondClient, upload } from '../support/fixtures';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let other: Awaited<ReturnType<typeof secondClient>>;
let commissionId: number;
let otherCommissionId: number;
let url: string;
let shared: { id: number; urls: Record<string, string> };
let unshared: { id: number; urls: Record<string, string> };

const lastMailId = async () => ((await sw.db('captured_mail').max({ id: 'id' }).first())?.id as number) ?? 0;
const newMail = async (to: string, since: number) => (await mailTo(sw, to)).filter((m) => m.id > since);

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  other = await secondClient(sw, s.a.owner, s.a.studioId, 'client2-a@studio.test');
  commissionId = await insertCommission(sw, s.a.studioId, s.a.clientId, { title: 'Bog knights' });
  otherCommissionId = await insertCommission(sw, s.a.studioId, other.clientId, { title: 'Someone else' });
  url = `/api/studios/${s.a.studioId}/commissions/${commissionId}/photos`;
  await sw.jobs.deliverMail();
});
afterAll(() => sw.stop());

describe('what a client sees', () => {
  it('sharing photos at upload tells the client by e-mail; unshared ones do not', async () => {
    let since = await lastMailId();
    const a = await upload(s.a.painter, url, [{ data: await images.twoTone(120, 80), name: 'wip.jpg' }], { kind: 'progress', shared: 'false' });
    expect(a.status).toBe(201);
    unshared = a.body[0];
    expect(await newMail('client-a@studio.test', since)).toHaveLength(0);

    since = await lastMailId();
    const b = await upload(s.a.painter, url, [{ data: await images.twoTone(120, 80), name: 'a.jpg' }, { data: await images.twoTone(90, 80), name: 'b.jpg' }], { kind: 'progress', shared: 'true', caption: 'Basecoats' });
    expect(b.status).toBe(201);
    shared = b.body[0];
    const mails = await newMail('client-a@studio.test', since);
    expect(mails).toHaveLength(1);
    expect(mails[0].subject).toBe('Studio a: new photos of "Bog knights"');
    expect(mails[0].text).toContain('Painter a shared 2 new photos of "Bog knights" with you.');
    expect(mails[0].text).toContain(`http://sablework.test/studio/${s.a.studioId}/commissions/${commissionId}`);
    expect(await newMail('client2-a@studio.test', since)).toHaveLength(0);
    expect(await newMail('owner-a@studio.test', since)).toHaveLength(0);
  });

  it('the client lists and opens only shared photos; an unshared one is 404', async () => {
    const list = await s.a.client.get(url).expect(200);
    expect(list.body.map((p: { id: number }) => p.id)).not.toContain(unshared.id);
    expect(list.body.map((p: { id: number }) => p.id)).toContain(shared.id);
    expect(list.body.every((p: { shared: boolean }) => p.shared)).toBe(true);
    expect((await s.a.client.get(shared.urls.large)).status).toBe(200);
    expect((await s.a.client.get(shared.urls.original)).status).toBe(200);
    for (const size of ['thumb', 'medium', 'large', 'original']) expect((await s.a.client.get(unshared.urls[size])).status, size).toBe(404);
    // The studio sees both.
    const studioList = await s.a.owner.get(url).expect(200);
    expect(studioList.body.map((p: { id: number }) => p.id)).toEqual(expect.arrayContaining([shared.id, unshared.id]));
  });

  it("another client of the studio gets 404 for the commission's photos, shared or not", async () => {
    expect((await other.caller.get(url)).status).toBe(404);
    expect((await other.caller.get(shared.urls.thumb)).status).toBe(404);
    expect((await other.caller.get(unshared.urls.thumb)).status).toBe(404);
    expect((await s.b.client.get(shared.urls.thumb)).status).toBe(404);
    expect((await s.b.owner.get(shared.urls.thumb)).status).toBe(404);
    const small = [{ data: await images.twoTone(40, 30), name: 's.jpg' }];
    expect((await upload(other.caller, url, small, { kind: 'reference' })).status).toBe(404);
  });

  it('sharing later tells the client, unsharing hides it again', async () => {
    const since = await lastMailId();
    const on = await s.a.owner.patch(`/api/studios/${s.a.studioId}/photos/${unshared.id}`, { shared: true });
    expect(on.status).toBe(200);
    expect((await s.a.client.get(unshared.urls.thumb)).status).toBe(200);
    expect(await newMail('client-a@studio.test', since)).toHaveLength(1);
    // Sharing what is already shared sends nothing more.
    await s.a.owner.patch(`/api/studios/${s.a.studioId}/photos/${unshared.id}`, { shared: true });
    expect(await newMail('client-a@studio.test', since)).toHaveLength(1);
    await s.a.owner.patch(`/api/studios/${s.a.studioId}/photos/${unshared.id}`, { shared: false });
    const res = await s.a.client.get(unshared.urls.thumb).set('If-None-Match', '"anything"');
    expect(res.status).toBe(404);
  });

  it('a client may add reference photos to their own commission only, and sees them unshared', async () => {
    const small = [{ data: await images.twoTone(50, 40), name: 'ref.jpg' }];
    const ref = await upload(s.a.client, url, small, { kind: 'reference', caption: 'Colours like this moth' });
    expect(ref.status).toBe(201);
    expect(ref.body[0]).toMatchObject({ kind: 'reference', uploadedBy: { name: 'Client a' } });
    expect((await s.a.client.get(ref.body[0].urls.medium)).status).toBe(200);
    expect((await s.a.owner.get(ref.body[0].urls.medium)).status).toBe(200);
    // Even when the studio switches sharing off, the client still sees what they sent.
    await s.a.owner.patch(`/api/studios/${s.a.studioId}/photos/${ref.body[0].id}`, { shared: false });
    expect((await s.a.client.get(ref.body[0].urls.medium)).status).toBe(200);

    const progress = await upload(s.a.client, url, small, { kind: 'progress' });
    expect(progress.status).toBe(403);
    const elsewhere = await upload(s.a.client, `/api/studios/${s.a.studioId}/commissions/${otherCommissionId}/photos`, small, { kind: 'reference' });
    expect(elsewhere.status).toBe(404);
    // A client cannot change or delete photos.
    expect((await s.a.client.patch(`/api/studios/${s.a.studioId}/photos/${ref.body[0].id}`, { caption: 'x' })).status).toBe(403);
    expect((await s.a.client.delete(`/api/studios/${s.a.studioId}/photos/${ref.body[0].id}`)).status).toBe(403);
  });

  it('a client sees no reference photo the studio added unless it is shared', async () => {
    const small = [{ data: await images.twoTone(50, 40), name: 'ref.jpg' }];
    const ref = await upload(s.a.owner, url, small, { kind: 'reference' });
    expect((await s.a.client.get(ref.body[0].urls.thumb)).status).toBe(404);
  });
});
