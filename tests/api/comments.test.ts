import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mailTo, startTestApp, twoStudios, type TestApp } from '../support/app';
import { insertCommission, insertFigure, secondClient, secondPainter, userId } from '../support/fixtures';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let commissionId: number;
let url: string;
let other: Awaited<ReturnType<typeof secondClient>>;

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  commissionId = await insertCommission(sw, s.a.studioId, s.a.clientId, { title: 'Marsh trolls' });
  // painter-a is assigned to a figure of this commission; the second painter is not.
  await insertFigure(sw, s.a.studioId, commissionId, await userId(sw, 'painter-a@studio.test'));
  await secondPainter(sw, s.a.owner, s.a.studioId, 'painter2-a@studio.test');
  other = await secondClient(sw, s.a.owner, s.a.studioId, 'client2-a@studio.test');
  url = `/api/studios/${s.a.studioId}/commissions/${commissionId}/comments`;
  await sw.jobs.deliverMail();
});
afterAll(() => sw.stop());

const newMail = async (to: string, since: number) => (await mailTo(sw, to)).filter((m) => m.id > since);
const lastMailId = async () => ((await sw.db('captured_mail').max({ id: 'id' }).first())?.id as number) ?? 0;

describe('comment thread', () => {
  it("a client's comment reaches the owner and the assigned painter, not the other painter nor the client", async () => {
    const since = await lastMailId();
    const res = await s.a.client.post(url, { body: 'Could the cloaks be a little more <b>mossy</b>?' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ body: 'Could the cloaks be a little more <b>mossy</b>?', user: { name: 'Client a', role: 'client' }, createdAt: '2026-03-02T09:00:00.000Z' });

    const owner = await newMail('owner-a@studio.test', since);
    expect(owner).toHaveLength(1);
    expect(owner[0].subject).toBe('New comment on "Marsh trolls"');
    expect(owner[0].text).toContain('Client a wrote:');
    expect(owner[0].text).toContain(`http://sablework.test/studio/${s.a.studioId}/commissions/${commissionId}`);
    // The person's text is escaped in the HTML part.
    expect(owner[0].html).toContain('&lt;b&gt;mossy&lt;/b&gt;');
    expect(owner[0].html).not.toContain('<b>mossy</b>');
    expect(await newMail('painter-a@studio.test', since)).toHaveLength(1);
    expect(await newMail('painter2-a@studio.test', since)).toHaveLength(0);
    expect(await newMail('client-a@studio.test', since)).toHaveLength(0);
  });

  it("the studio's comment reaches the client only", async () => {
    const since = await lastMailId();
    sw.clock.advance(60_000);
    const res = await s.a.painter.post(url, { body: 'Yes — more moss it is.' });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ name: 'Painter a', role: 'painter' });
    const client = await newMail('client-a@studio.test', since);
    expect(client).toHaveLength(1);
    expect(client[0].text).toContain('Yes — more moss it is.');
    expect(await newMail('owner-a@studio.test', since)).toHaveLength(0);
    expect(await newMail('client2-a@studio.test', since)).toHaveLength(0);
  });

  it('lists the thread oldest first for the studio and the client', async () => {
    for (const c of [s.a.owner, s.a.painter, s.a.client]) {
      const list = await c.get(url).expect(200);
      expect(list.body.map((x: { body: string }) => x.body)).toEqual(['Could the cloaks be a little more <b>mossy</b>?', 'Yes — more moss it is.']);
    }
    const log = await sw.db('activity').where({ commission_id: commissionId, action: 'comment.added' });
    expect(log).toHaveLength(2);
  });

  it("another client of the studio, and other studios, get 404", async () => {
    expect((await other.caller.get(url)).status).toBe(404);
    expect((await other.caller.post(url, { body: 'Let me in' })).status).toBe(404);
    expect((await s.b.owner.get(url)).status).toBe(404);
    expect((await s.b.client.post(url, { body: 'hi' })).status).toBe(404);
    expect((await s.a.client.post(url, { body: '   ' })).status).toBe(400);
  });

  it('people who switched notices off get none', async () => {
    expect((await s.a.owner.patch('/api/auth/me', { emailNotices: false })).status).toBe(200);
    const since = await lastMailId();
    await s.a.client.post(url, { body: 'One more thing.' });
    expect(await newMail('owner-a@studio.test', since)).toHaveLength(0);
    expect(await newMail('painter-a@studio.test', since)).toHaveLength(1);
    await s.a.owner.patch('/api/auth/me', { emailNotices: true });
  });
});
