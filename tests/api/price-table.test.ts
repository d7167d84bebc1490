import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { defaultPriceTable } from '../../shared/schemas/price-table';
import { startTestApp, twoStudios, type TestApp } from '../support/app';
import { testTable, type Side } from './money-flow';

let sw: TestApp;
let a: Side;
let b: Side;
const url = (s: Side, path: string) => `/api/studios/${s.studioId}${path}`;

beforeAll(async () => {
  sw = await startTestApp();
  ({ a, b } = await twoStudios(sw));
});
afterAll(() => sw.stop());

describe('the price table', () => {
  it("starts as the defaults in the studio's currency until the owner saves one", async () => {
    const res = await a.owner.get(url(a, '/price-table'));
    expect(res.status).toBe(200);
    expect(res.body).toEqual(defaultPriceTable('EUR'));
    expect(Object.keys(res.body.stageHours)).toContain('28');
  });

  it('is the owner’s only: painters and clients get 403, other studios 404', async () => {
    expect((await a.painter.get(url(a, '/price-table'))).status).toBe(403);
    expect((await a.client.get(url(a, '/price-table'))).status).toBe(403);
    expect((await b.owner.get(url(a, '/price-table'))).status).toBe(404);
    expect((await a.painter.put(url(a, '/price-table'), testTable())).status).toBe(403);
  });

  it('is validated by the shared schema, with each problem at its path', async () => {
    const t = testTable() as unknown as { stageHours: Record<string, Record<string, Record<string, number>>>; learningRate: number; currency: string };
    delete t.stageHours['28'].tabletop.prime;
    t.learningRate = 0.3;
    const res = await a.owner.put(url(a, '/price-table'), t);
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(expect.arrayContaining(['stageHours.28.tabletop.prime', 'learningRate']));
    expect((await a.owner.put(url(a, '/price-table'), { ...testTable(), currency: 'XYZ' })).body.error.fields).toHaveProperty('currency');
    expect((await a.owner.put(url(a, '/price-table'), { ...testTable(), hourlyRate: 30.5 })).status).toBe(400);
    // nothing was saved
    expect((await a.owner.get(url(a, '/price-table'))).body.hourlyRate).toBe(defaultPriceTable('EUR').hourlyRate);
  });

  it('is saved whole and read back; each studio keeps its own', async () => {
    const t = testTable();
    const put = await a.owner.put(url(a, '/price-table'), t);
    expect(put.status).toBe(200);
    expect(put.body).toEqual(t);
    expect((await a.owner.get(url(a, '/price-table'))).body).toEqual(t);
    expect((await b.owner.get(url(b, '/price-table'))).body).toEqual(defaultPriceTable('EUR'));
  });

  it('gives members "from" prices: one 28 mm figure of each tier, no hours shown', async () => {
    await a.owner.put(url(a, '/price-table'), testTable());
    for (const who of [a.owner, a.painter, a.client]) {
      const res = await who.get(url(a, '/price-table/public-summary'));
      expect(res.status).toBe(200);
      expect(res.body.currency).toBe('EUR');
      // Tabletop at 2 h × €30.00 = €60.00 (testTable); the others from the default hours at €30.00/h
      expect(res.body.tiers[0]).toEqual({ key: 'tabletop', label: 'Tabletop', fromMinor: 6000 });
      expect(res.body.tiers.map((t: { key: string }) => t.key)).toEqual(['tabletop', 'enhanced', 'display']);
      expect(JSON.stringify(res.body)).not.toMatch(/hour|minute/i);
    }
    const t = testTable();
    const enhancedMinutes = Object.values(t.stageHours['28'].enhanced).reduce((s, h) => s + Math.round(h * 60), 0);
    const summary = (await a.client.get(url(a, '/price-table/public-summary'))).body;
    expect(summary.tiers[1].fromMinor).toBe(Math.round((3000 * enhancedMinutes) / 60));
    expect((await b.client.get(url(a, '/price-table/public-summary'))).status).toBe(404);
  });
});
