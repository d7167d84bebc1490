import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/config';
import { Caller, startTestApp, type TestApp } from '../support/app';

let sw: TestApp;
let studioId: number;
let owner: Caller;

beforeAll(async () => {
  sw = await startTestApp({ demo: true });
  studioId = (await sw.db('studios').where({ slug: 'marrowgate' }).first('id')).id;
  owner = new Caller(sw.app);
  expect((await owner.post('/api/auth/login', { email: 'owner@demo.test', password: DEMO_PASSWORD })).status).toBe(200);
});
afterAll(() => sw.stop());

describe('the demo scenario’s enquiries and models', () => {
  it('has the studio’s public page on at /s/marrowgate with its tiers', async () => {
    const page = await new Caller(sw.app).get('/api/public/studios/marrowgate').expect(200);
    expect(page.body.name).toBe('Marrowgate Paintworks');
    expect(page.body.tiers.length).toBeGreaterThan(0);
    expect(page.body.turnaround).not.toBeNull();
  });

  it('has new enquiries from invented people, one with a reference photo, and one declined', async () => {
    const list = await owner.get(`/api/studios/${studioId}/enquiries`).expect(200);
    expect(list.body.newCount).toBe(3);
    expect(list.body.items.every((e: { email: string }) => e.email.endsWith('@demo.test'))).toBe(true);
    expect(list.body.items.filter((e: { status: string }) => e.status === 'declined')).toHaveLength(1);
    const withPhoto = list.body.items.find((e: { photoCount: number }) => e.photoCount > 0);
    const detail = await owner.get(`/api/studios/${studioId}/enquiries/${withPhoto.id}`).expect(200);
    await owner.get(detail.body.photos[0].urls.thumb).expect(200);
  });

  it('records the warband’s models as received with one missing and one damaged', async () => {
    const c = await sw.db('commissions').where({ studio_id: studioId, title: 'Bog-lantern goblin warband' }).first('id');
    const m = await owner.get(`/api/studios/${studioId}/commissions/${c.id}/models-in`).expect(200);
    expect(m.body).toMatchObject({ recorded: true, missing: 1, damaged: 1, complete: false });
  });
});
