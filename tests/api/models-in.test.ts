import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mailTo, startTestApp, twoStudios, type TestApp } from '../support/app';
import { images, insertCommission, upload } from '../support/fixtures';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let url: string;
let commissionId: number;
let figureIds: number[];

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  const c = await s.a.owner.post(`/api/studios/${s.a.studioId}/commissions`, {
    clientId: s.a.clientId,
    title: 'Cavern skirmish band',
    figures: [
      { name: 'Cave spider', quantity: 4, sizeClass: '40', tier: 'tabletop' },
      { name: 'Lantern bearer', quantity: 1, sizeClass: '28', tier: 'tabletop' },
    ],
  });
  commissionId = c.body.id;
  figureIds = c.body.figures.map((f: { id: number }) => f.id);
  url = `/api/studios/${s.a.studioId}/commissions/${commissionId}/models-in`;
});
afterAll(() => sw.stop());

describe('models in', () => {
  it('starts unrecorded, listing every figure of the commission with nothing arrived', async () => {
    const res = await s.a.owner.get(url).expect(200);
    expect(res.body).toMatchObject({ recorded: false, supplier: 'client_ships', complete: false, missing: 5, damaged: 0 });
    expect(res.body.figures.map((f: { name: string; quantity: number; received: number }) => [f.name, f.quantity, f.received])).toEqual([
      ['Cave spider', 4, 0],
      ['Lantern bearer', 1, 0],
    ]);
  });

  it('records the parcel and checks what arrived against the figure list; a painter may record it too', async () => {
    const res = await s.a.painter.put(url, {
      supplier: 'client_ships',
      expectedOn: '2026-03-05',
      receivedOn: '2026-03-06',
      carrier: 'Invented Parcel Co',
      tracking: 'IPC-77123',
      note: 'Box crushed at one corner.',
      figures: [
        { figureId: figureIds[0], received: 3, damaged: true, note: 'one leg snapped off' },
        { figureId: figureIds[1], received: 1 },
      ],
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ recorded: true, receivedOn: '2026-03-06', tracking: 'IPC-77123', complete: false, missing: 1, damaged: 1 });
    expect(res.body.noticeDraft).toContain('Not in the parcel: Cave spider (1 of 4).');
    expect(res.body.noticeDraft).toMatch(/arrived on Friday,? 6 March 2026/);
    expect(res.body.noticeDraft).toContain('Damaged on arrival: Cave spider (one leg snapped off).');
    const log = await s.a.owner.get(`/api/studios/${s.a.studioId}/commissions/${commissionId}/activity`).expect(200);
    expect(log.body.map((e: { summary: string }) => e.summary)).toContain('Painter a recorded the models received: 4 of 5 arrived, 1 figure damaged.');
  });

  it('refuses more models than the list holds, and figures of another commission', async () => {
    const other = await insertCommission(sw, s.a.studioId, s.a.clientId);
    const [f] = await sw.db('figures').insert({ studio_id: s.a.studioId, commission_id: other, name: 'Stray', quantity: 1, size_class: '28', tier: 'tabletop', created_at: 'x', updated_at: 'x' }).returning('id');
    const strayId = typeof f === 'object' ? f.id : f;
    const res = await s.a.owner.put(url, { supplier: 'retailer', retailer: 'A made-up hobby shop', figures: [{ figureId: figureIds[0], received: 5 }, { figureId: strayId, received: 1 }] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ 'figures.0.received': 'The commission lists 4; record extra models in the note.', 'figures.1.figureId': 'That figure is not part of this commission.' });
    const bad = await s.a.owner.put(url, { supplier: 'somebody', tracking: 'x'.repeat(81) });
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['supplier', 'tracking']);
  });

  it('takes condition photos through the photos feature (kind "condition")', async () => {
    const res = await upload(s.a.owner, `/api/studios/${s.a.studioId}/commissions/${commissionId}/photos`, [{ data: await images.twoTone(200, 150), name: 'snapped-leg.jpg' }], { kind: 'condition', caption: 'Cave spider, leg off', shared: 'true' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body[0]).toMatchObject({ kind: 'condition', caption: 'Cave spider, leg off', shared: true });
  });

  it('sends the owner’s note about what is missing or damaged to the client by e-mail', async () => {
    const message = 'Hello,\n\nOne cave spider is not in the box, and another lost a leg on the way. Shall we pin it?';
    const res = await s.a.owner.post(`${url}/notice`, { message });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.noticeSentAt).toBe(sw.clock.now().toISOString());
    const mails = await mailTo(sw, 'client-a@studio.test');
    const note = mails.find((m) => m.subject === 'Studio a: your models for "Cavern skirmish band"');
    expect(note?.text).toContain('One cave spider is not in the box, and another lost a leg on the way. Shall we pin it?');
    expect((await s.a.painter.post(`${url}/notice`, { message })).status).toBe(403);
    expect((await s.a.owner.post(`${url}/notice`, { message: '' })).status).toBe(400);
  });

  it('is for the studio only: the client gets 403, another studio 404', async () => {
    expect((await s.a.client.get(url)).status).toBe(403);
    expect((await s.b.owner.get(url)).status).toBe(404);
    expect((await s.a.owner.get(`/api/studios/${s.a.studioId}/commissions/999999/models-in`)).status).toBe(404);
  });
});
