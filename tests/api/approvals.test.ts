import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mailTo, startTestApp, twoStudios, type TestApp } from '../support/app';
import { insertCommission, insertFigure, secondClient, userId } from '../support/fixtures';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let other: Awaited<ReturnType<typeof secondClient>>;
let commissionId: number;
let base: string;

const lastMailId = async () => ((await sw.db('captured_mail').max({ id: 'id' }).first())?.id as number) ?? 0;
const newMail = async (to: string, since: number) => (await mailTo(sw, to)).filter((m) => m.id > since);

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  other = await secondClient(sw, s.a.owner, s.a.studioId, 'client2-a@studio.test');
  commissionId = await insertCommission(sw, s.a.studioId, s.a.clientId, { title: 'Fen riders', status: 'on_bench' });
  await insertFigure(sw, s.a.studioId, commissionId, await userId(sw, 'painter-a@studio.test'));
  base = `/api/studios/${s.a.studioId}`;
  await sw.jobs.deliverMail();
});
afterAll(() => sw.stop());

describe('approvals', () => {
  let schemeId: number;

  it('the studio asks for approval of the scheme; the client is told by e-mail', async () => {
    const since = await lastMailId();
    const res = await s.a.painter.post(`${base}/commissions/${commissionId}/approvals`, { subject: 'scheme', note: 'Greens and bone, as discussed.' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ subject: 'scheme', status: 'requested', requestNote: 'Greens and bone, as discussed.', requestedBy: { name: 'Painter a' }, requestedAt: '2026-03-02T09:00:00.000Z', decidedBy: null, decidedAt: null });
    schemeId = res.body.id;
    const mails = await newMail('client-a@studio.test', since);
    expect(mails).toHaveLength(1);
    expect(mails[0].subject).toBe('Studio a asks for your approval: colour scheme of "Fen riders"');
    expect(mails[0].text).toContain('Greens and bone, as discussed.');
    expect(await newMail('client2-a@studio.test', since)).toHaveLength(0);
    // One open request per subject.
    const again = await s.a.owner.post(`${base}/commissions/${commissionId}/approvals`, { subject: 'scheme' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('approval_open');
  });

  it('only the commission’s own client decides; others get 403 or 404', async () => {
    expect((await s.a.owner.post(`${base}/approvals/${schemeId}/approve`, {})).status).toBe(403);
    expect((await s.a.painter.post(`${base}/approvals/${schemeId}/approve`, {})).status).toBe(403);
    expect((await other.caller.post(`${base}/approvals/${schemeId}/approve`, {})).status).toBe(404);
    expect((await other.caller.get(`${base}/commissions/${commissionId}/approvals`)).status).toBe(404);
    expect((await s.b.client.post(`${base}/approvals/${schemeId}/approve`, {})).status).toBe(404);
    expect((await s.a.client.post(`${base}/commissions/${commissionId}/approvals`, { subject: 'scheme' })).status).toBe(403);
  });

  it('asking for changes needs a comment and is recorded with time and person; the studio is told', async () => {
    const empty = await s.a.client.post(`${base}/approvals/${schemeId}/request-changes`, {});
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.comment).toBeDefined();
    sw.clock.advance(3600_000);
    const since = await lastMailId();
    const res = await s.a.client.post(`${base}/approvals/${schemeId}/request-changes`, { comment: 'Warmer bone on the shields, please.' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ status: 'changes', decidedBy: { name: 'Client a' }, decidedAt: '2026-03-02T10:00:00.000Z', comment: 'Warmer bone on the shields, please.' });
    const owner = await newMail('owner-a@studio.test', since);
    expect(owner).toHaveLength(1);
    expect(owner[0].subject).toBe('Changes asked to the colour scheme: "Fen riders"');
    expect(owner[0].text).toContain('Warmer bone on the shields, please.');
    expect(await newMail('painter-a@studio.test', since)).toHaveLength(1);
    expect(await newMail('client-a@studio.test', since)).toHaveLength(0);
    // Decided once only.
    const twice = await s.a.client.post(`${base}/approvals/${schemeId}/approve`, {});
    expect(twice.status).toBe(409);
    expect(twice.body.error.code).toBe('approval_decided');
  });

  it('a new request after changes can be approved; the log records both', async () => {
    const req = await s.a.owner.post(`${base}/commissions/${commissionId}/approvals`, { subject: 'scheme', note: 'Warmer bone now.' });
    expect(req.status).toBe(201);
    const since = await lastMailId();
    const ok = await s.a.client.post(`${base}/approvals/${req.body.id}/approve`, { comment: 'Lovely.' });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ status: 'approved', comment: 'Lovely.', decidedBy: { name: 'Client a' } });
    const owner = await newMail('owner-a@studio.test', since);
    expect(owner.map((m) => m.subject)).toEqual(['Colour scheme approved: "Fen riders"']);
    const list = await s.a.client.get(`${base}/commissions/${commissionId}/approvals`).expect(200);
    expect(list.body.map((a: { status: string }) => a.status)).toEqual(['changes', 'approved']);
    const log = await sw.db('activity').where({ commission_id: commissionId }).orderBy('id').pluck('action');
    expect(log).toEqual(['approval.requested', 'approval.changes_requested', 'approval.requested', 'approval.approved']);
    // The commission is still on the bench: only the finished work moves it on.
    expect((await sw.db('commissions').where({ id: commissionId }).first()).status).toBe('on_bench');
  });

  it('approving the finished work moves the commission to ready to ship', async () => {
    const req = await s.a.owner.post(`${base}/commissions/${commissionId}/approvals`, { subject: 'finished' });
    const ok = await s.a.client.post(`${base}/approvals/${req.body.id}/approve`, {});
    expect(ok.status).toBe(200);
    expect((await sw.db('commissions').where({ id: commissionId }).first()).status).toBe('ready_to_ship');
    const moved = await sw.db('activity').where({ commission_id: commissionId, action: 'commission.status' }).first();
    expect(JSON.parse(moved.detail)).toMatchObject({ from: 'on_bench', to: 'ready_to_ship' });
    const activity = await s.a.owner.get(`${base}/commissions/${commissionId}/activity`).expect(200);
    // Newest first: the move follows the approval, both by the client.
    expect(activity.body.slice(0, 2).map((e: { action: string; user: { name: string } }) => [e.action, e.user.name])).toEqual([
      ['commission.status', 'Client a'],
      ['approval.approved', 'Client a'],
    ]);
  });

  it('a closed or cancelled commission takes no more requests', async () => {
    const closed = await insertCommission(sw, s.a.studioId, s.a.clientId, { status: 'cancelled' });
    const res = await s.a.owner.post(`${base}/commissions/${closed}/approvals`, { subject: 'scheme' });
    expect(res.status).toBe(409);
    expect((await s.a.owner.post(`${base}/commissions/${commissionId}/approvals`, { subject: 'nonsense' })).status).toBe(400);
  });
});
