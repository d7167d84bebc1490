import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/config';
import { Caller, startTestApp, type TestApp } from '../support/app';

let sw: TestApp;
let studioId: number;
const signIn = async (email: string) => {
  const c = new Caller(sw.app);
  const res = await c.post('/api/auth/login', { email, password: DEMO_PASSWORD });
  expect(res.status).toBe(200);
  return c;
};

beforeAll(async () => {
  sw = await startTestApp({ demo: true });
  studioId = (await sw.db('studios').where({ slug: 'marrowgate' }).first('id')).id;
});
afterAll(() => sw.stop());

describe('the demo scenario', () => {
  it('holds commissions in many states with figures part-way through their stages', async () => {
    const owner = await signIn('owner@demo.test');
    const list = (await owner.get(`/api/studios/${studioId}/commissions`)).body;
    const statuses = new Set(list.items.map((c: { status: string }) => c.status));
    for (const s of ['enquiry', 'quoted', 'booked', 'on_bench', 'ready_to_ship', 'on_hold', 'closed', 'cancelled']) expect(statuses, s).toContain(s);
    const bench = list.items.find((c: { status: string }) => c.status === 'on_bench');
    expect(bench.progress.share).toBeGreaterThan(0);
    expect(bench.progress.share).toBeLessThan(1);
    const detail = (await owner.get(`/api/studios/${studioId}/commissions/${bench.id}`)).body;
    expect(detail.loggedHours).toBeGreaterThan(0);
    const done = detail.figures.flatMap((f: { stages: { status: string; loggedHours: number; doneAt: string }[] }) => f.stages.filter((s) => s.status === 'done'));
    expect(done.length).toBeGreaterThan(0);
    for (const s of done) {
      expect(s.loggedHours).toBeGreaterThan(0);
      expect(s.doneAt <= sw.clock.now().toISOString()).toBe(true);
    }
    const activity = (await owner.get(`/api/studios/${studioId}/commissions/${bench.id}/activity`)).body;
    expect(activity.length).toBeGreaterThan(5);
    expect(activity.every((e: { at: string }) => e.at <= sw.clock.now().toISOString())).toBe(true);
  });

  it("the demo painter's timer runs and the board shows their figures, one still drying", async () => {
    const painter = await signIn('painter@demo.test');
    const timer = (await painter.get(`/api/studios/${studioId}/timer`)).body.running;
    expect(timer).toMatchObject({ figure: { name: 'Bog-lantern goblins' }, stage: { name: 'Basecoat' }, endedAt: null });
    const me = (await painter.get('/api/auth/me')).body.user.id;
    const board = (await painter.get(`/api/studios/${studioId}/board?painterId=${me}`)).body;
    const cards = board.columns.flatMap((c: { cards: unknown[] }) => c.cards);
    expect(cards.length).toBeGreaterThan(2);
    const all = (await painter.get(`/api/studios/${studioId}/board`)).body.columns.flatMap((c: { cards: { stage: { waitUntil: string | null } | null }[] }) => c.cards);
    expect(all.some((c: { stage: { waitUntil: string | null } | null }) => c.stage?.waitUntil && c.stage.waitUntil > sw.clock.now().toISOString())).toBe(true);
  });

  it("every board card agrees with its figure's own view: current stage, its wait, progress", async () => {
    // The board sums and picks in SQL; the commission page builds each figure from all its stages.
    type Stage = { id: number; name: string; status: string; position: number; waitUntil: string | null; hazards: string[] };
    type FigureView = { id: number; name: string; quantity: number; stages: Stage[]; progress: unknown; currentStageId: number | null; painter: unknown };
    type Card = { figureId: number; figureName: string; quantity: number; commission: { id: number }; stage: { id: number; name: string; status: string; hazards: string[]; waitUntil: string | null } | null; progress: unknown; painter: unknown };
    const owner = await signIn('owner@demo.test');
    const cards: Card[] = (await owner.get(`/api/studios/${studioId}/board`)).body.columns.flatMap((c: { cards: Card[] }) => c.cards);
    expect(cards.length).toBeGreaterThan(5);
    const now = sw.clock.now().toISOString();
    const views = new Map<number, FigureView>();
    for (const commissionId of new Set(cards.map((c) => c.commission.id))) {
      for (const f of (await owner.get(`/api/studios/${studioId}/commissions/${commissionId}`)).body.figures as FigureView[]) views.set(f.id, f);
    }
    for (const card of cards) {
      const f = views.get(card.figureId)!;
      expect(card, f.name).toMatchObject({ figureName: f.name, quantity: f.quantity, progress: f.progress, painter: f.painter });
      const current = f.stages.find((s) => s.id === f.currentStageId) ?? null;
      expect(card.stage?.id ?? null, f.name).toBe(current?.id ?? null);
      if (!current) continue;
      const waits = f.stages.filter((s) => s.position < current.position && s.waitUntil && s.waitUntil > now).map((s) => s.waitUntil!);
      expect(card.stage, f.name).toEqual({ id: current.id, name: current.name, status: current.status, hazards: current.hazards, waitUntil: waits.sort().at(-1) ?? null });
    }
  });

  it('each demo client sees only their own commissions', async () => {
    for (const [email, name] of [
      ['client@demo.test', 'Priya Castellane'],
      ['client2@demo.test', 'Otto Brandvold'],
    ]) {
      const c = await signIn(email);
      const items = (await c.get(`/api/studios/${studioId}/commissions`)).body.items;
      expect(items.length).toBeGreaterThan(1);
      expect(items.every((x: { client: { name: string } }) => x.client.name === name)).toBe(true);
    }
  });
});
