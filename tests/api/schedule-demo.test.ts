import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/config';
import { Caller, startTestApp, type TestApp } from '../support/app';

// The demo's calendar and books: enough for every screen of issue 6 to have something to show.
let sw: TestApp;
let base: string;
const signIn = async (email: string) => {
  const c = new Caller(sw.app);
  expect((await c.post('/api/auth/login', { email, password: DEMO_PASSWORD })).status).toBe(200);
  return c;
};

beforeAll(async () => {
  sw = await startTestApp({ demo: true });
  base = `/api/studios/${(await sw.db('studios').where({ slug: 'marrowgate' }).first('id')).id}`;
});
afterAll(() => sw.stop());

describe('the demo calendar and books', () => {
  it('gives both painters working hours, days off ahead and a closed day', async () => {
    const owner = await signIn('owner@demo.test');
    const cap = (await owner.get(`${base}/capacity`)).body;
    expect(cap.painters.map((p: { weeklyHours: number }) => p.weeklyHours)).toEqual([30, 32]);
    expect(cap.painters.flatMap((p: { daysOff: unknown[] }) => p.daysOff).length).toBeGreaterThanOrEqual(2);
    expect(cap.closedDays).toHaveLength(1);
  });

  it('has a queue that fills the next weeks, with one commission late and none unscheduled', async () => {
    const owner = await signIn('owner@demo.test');
    const s = (await owner.get(`${base}/schedule`)).body;
    expect(s.commissions.length).toBeGreaterThanOrEqual(5);
    expect(s.commissions.every((c: { unscheduled: string | null }) => c.unscheduled === null)).toBe(true);
    expect(s.commissions.some((c: { late: boolean }) => c.late)).toBe(true);
    expect(s.commissions.some((c: { late: boolean }) => !c.late)).toBe(true);
    const d = (await owner.get(`${base}/dashboard`)).body;
    for (const w of d.utilisation.slice(1, 4)) expect(w.share).toBeGreaterThan(0.5);
    expect(d.revenue.filter((m: { paid: number }) => m.paid > 0).length).toBeGreaterThanOrEqual(6);
    expect(d.atRisk).toHaveLength(5);
  });

  it('has logged time on done stages, medians with counts, suggestions and a fitted learning rate', async () => {
    const owner = await signIn('owner@demo.test');
    const a = (await owner.get(`${base}/reports/actuals`)).body;
    expect(a.doneStages).toBeGreaterThan(100);
    expect(a.cells.some((c: { count: number }) => c.count >= 3)).toBe(true);
    expect(a.suggestions.length).toBeGreaterThan(0);
    // The demo's own batches were logged on a curve of about 0.85.
    expect(a.learningRate.fitted.rate).toBeGreaterThan(0.8);
    expect(a.learningRate.fitted.rate).toBeLessThan(0.95);
    const e = (await owner.get(`${base}/reports/earnings`)).body;
    expect(e.totals.net).toBeGreaterThan(0);
    expect(e.totals.net).toBeLessThan(e.totals.paid);
    expect(e.commissions.filter((c: { hourlyGross: number | null }) => c.hourlyGross !== null).length).toBeGreaterThan(5);
  });

  it('plans the painter’s week and shows the client when their commissions should be ready', async () => {
    const painter = (await (await signIn('painter@demo.test')).get(`${base}/dashboard`)).body;
    expect(painter.weekStages.length + painter.todayStages.length).toBeGreaterThan(0);
    expect(painter.timer).not.toBeNull();
    const client = (await (await signIn('client@demo.test')).get(`${base}/dashboard`)).body;
    expect(client.commissions.some((c: { projectedDate: string | null }) => c.projectedDate !== null)).toBe(true);
  });
});
