import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { secondClient, userId } from '../support/fixtures';
import { idOf, startTestApp, twoStudios, type Caller, type TestApp } from '../support/app';

// Each role's home page from one small studio. Studio A is in Berlin (UTC+1 in early March 2026); its
// painter works 09:00–15:00 (08:00Z–14:00Z) Monday to Friday: 30 h a week. Now: Monday 2 March, 08:00 local.
// Queue: A (paint 8 h, varnish 2 h + 24 h cure, due 4 March), B (paint 4 h, due 3 March: it will be late),
// Late (booked, due 1 March, already past, one open stage of 1 h).

let sw: TestApp;
let owner: Caller;
let painter: Caller;
let client: Caller;
let studioId: number;
let clientId: number;
let painterId: number;
let base: string;
const ids: Record<string, number> = {};

const now = () => sw.clock.now().toISOString();
const insert = async (table: string, row: Record<string, unknown>) => idOf((await sw.db(table).insert(row).returning('id'))[0]);

async function commission(title: string, stages: [key: string, minutes: number, wait?: number][], over: Record<string, unknown> = {}) {
  const t = now();
  const c = await insert('commissions', { studio_id: studioId, client_id: clientId, title, status: 'booked', created_at: t, updated_at: t, ...over });
  const f = await insert('figures', { studio_id: studioId, commission_id: c, name: `${title} figure`, quantity: 2, size_class: '28', tier: 'tabletop', painter_id: painterId, created_at: t, updated_at: t });
  const stageIds: number[] = [];
  for (const [position, [key, minutes, wait]] of stages.entries()) {
    stageIds.push(await insert('stages', { studio_id: studioId, commission_id: c, figure_id: f, template_key: key, name: key, position, estimate_minutes: minutes, wait_minutes: wait ?? 0, updated_at: t }));
  }
  return { id: c, stageIds };
}

beforeAll(async () => {
  sw = await startTestApp();
  const { a } = await twoStudios(sw);
  ({ owner, painter, client, studioId, clientId } = a);
  painterId = await userId(sw, 'painter-a@studio.test');
  base = `/api/studios/${studioId}`;
  const days = Object.fromEntries([1, 2, 3, 4, 5].map((d) => [String(d), [{ start: '09:00', end: '15:00' }]]));
  await owner.put(`${base}/capacity/painters/${painterId}/hours`, { hours: days });
  sw.clock.set('2026-03-02T07:00:00.000Z');
  const a1 = await commission('A', [['paint', 480], ['varnish', 120, 1440]], { due_date: '2026-03-04' });
  const b = await commission('B', [['paint', 240]], { due_date: '2026-03-03' });
  const late = await commission('Late', [['basing', 60]], { due_date: '2026-03-01' });
  await commission('Enquiry', [['paint', 60]], { status: 'enquiry' });
  const other = await secondClient(sw, owner, studioId, 'other-client@studio.test');
  const theirs = await commission('Theirs', [['paint', 60]], { client_id: other.clientId, status: 'quoted' });
  Object.assign(ids, { A: a1.id, B: b.id, Late: late.id, Theirs: theirs.id, aPaint: a1.stageIds[0], otherClient: other.clientId });
  // Queue order A, B, Late.
  expect((await owner.put(`${base}/schedule/queue`, { commissionIds: [a1.id, b.id, late.id] })).status).toBe(200);
  // Two invoices still open: one due 20 Feb (overdue), one due 20 March.
  const t = now();
  for (const [total, paid, due] of [
    [11900, 0, '2026-02-20'],
    [5000, 2000, '2026-03-20'],
  ] as const) {
    await insert('invoices', {
      studio_id: studioId,
      commission_id: a1.id,
      client_id: clientId,
      kind: 'custom',
      status: paid ? 'partly_paid' : 'open',
      number: `2026-${total}`,
      currency: 'EUR',
      lines_json: '[]',
      tax_inclusive: false,
      tax_label: 'VAT',
      subtotal: total,
      tax: 0,
      total,
      paid,
      due_date: due,
      created_at: t,
      updated_at: t,
    });
  }
});
afterAll(() => sw.stop());

describe('the owner’s home', () => {
  it('counts commissions by status', async () => {
    const d = (await owner.get(`${base}/dashboard`)).body;
    expect(d.role).toBe('owner');
    const counts = Object.fromEntries(d.byStatus.map((s: { status: string; count: number }) => [s.status, s.count]));
    expect(counts).toEqual({ booked: 3, enquiry: 1, quoted: 1 });
  });

  it('sets booked hours against capacity for the next eight ISO weeks', async () => {
    const d = (await owner.get(`${base}/dashboard`)).body;
    expect(d.utilisation).toHaveLength(8);
    // Week 10 (2–8 March): 30 h of capacity; A 10 h + B 4 h + Late 1 h = 15 h booked, share 0.5.
    expect(d.utilisation[0]).toEqual({ year: 2026, week: 10, label: 'W10', start: '2026-03-02', capacityHours: 30, bookedHours: 15, share: 0.5 });
    expect(d.utilisation[1]).toMatchObject({ week: 11, capacityHours: 30, bookedHours: 0, share: 0 });
  });

  it('lists stages of commissions past their due date, and the commissions most at risk', async () => {
    const d = (await owner.get(`${base}/dashboard`)).body;
    expect(d.overdueStages.total).toBe(1);
    expect(d.overdueStages.items[0]).toMatchObject({ stageName: 'basing', commission: { id: ids.Late, dueDate: '2026-03-01' }, daysOverdue: 1, painter: { id: painterId } });
    // Late: ready Wed 4 March (after A's varnish Tue 10–12Z and B), due 1 March: −3 days. B: ready Wed 4 March
    // (Tue 12–14Z + Wed 08–10Z), due 3 March: −1. A: ready Wed 4 March, due 4 March: 0.
    expect(d.atRisk.map((c: { title: string; slackDays: number; late: boolean }) => [c.title, c.slackDays, c.late])).toEqual([
      ['Late', -3, true],
      ['B', -1, true],
      ['A', 0, false],
    ]);
  });

  it('shows unpaid and overdue invoices and revenue by month', async () => {
    const d = (await owner.get(`${base}/dashboard`)).body;
    expect(d.currency).toBe('EUR');
    // Due: 11900 (overdue since 20 Feb) + (5000 − 2000) = 14900.
    expect(d.invoices.unpaid).toEqual({ count: 2, amount: 14900 });
    expect(d.invoices.overdue).toEqual({ count: 1, amount: 11900 });
    expect(d.invoices.items.map((i: { due: number; overdue: boolean }) => [i.due, i.overdue])).toEqual([
      [11900, true],
      [3000, false],
    ]);
    expect(d.revenue).toHaveLength(12);
    expect(d.revenue[11]).toEqual({ month: '2026-03', paid: 0, net: 0 });
    expect(d.myBench).toBeNull();
  });
});

describe('the painter’s home', () => {
  it('lists my stages for today and this week, with my hours', async () => {
    const d = (await painter.get(`${base}/dashboard`)).body;
    expect(d.role).toBe('painter');
    expect(d.week).toEqual({ year: 2026, week: 10, start: '2026-03-02', end: '2026-03-08' });
    // Today (Monday): A's paint 08–14Z, 6 h.
    expect(d.todayStages.map((s: { stageName: string; commission: { title: string }; hours: number; start: string; end: string }) => [s.commission.title, s.stageName, s.hours, s.start, s.end])).toEqual([
      ['A', 'paint', 6, '2026-03-02T08:00:00.000Z', '2026-03-02T14:00:00.000Z'],
    ]);
    // This week: A paint 8 h (Mon + Tue 08–10Z), varnish 2 h (Tue 10–12Z), B 4 h (Tue 12–14Z + Wed 08–10Z), Late 1 h (Wed 10–11Z).
    expect(d.weekStages.map((s: { commission: { title: string }; stageName: string; hours: number }) => [s.commission.title, s.stageName, s.hours])).toEqual([
      ['A', 'paint', 8],
      ['A', 'varnish', 2],
      ['B', 'paint', 4],
      ['Late', 'basing', 1],
    ]);
    expect(d.weekHours).toEqual({ capacity: 30, planned: 15 });
    expect(d.timer).toBeNull();
  });

  it('shows my running timer', async () => {
    expect((await painter.post(`${base}/stages/${ids.aPaint}/timer`)).status).toBe(201);
    const d = (await painter.get(`${base}/dashboard`)).body;
    expect(d.timer).toMatchObject({ startedAt: '2026-03-02T07:00:00.000Z', stage: { id: ids.aPaint, name: 'paint' }, commission: { id: ids.A, title: 'A' } });
    // Not the owner's timer.
    expect((await owner.get(`${base}/dashboard`)).body.myBench).toBeNull();
    await painter.post(`${base}/timer/stop`);
  });
});

describe('the client’s home', () => {
  it('lists only my commissions with their projected delivery', async () => {
    const d = (await client.get(`${base}/dashboard`)).body;
    expect(d.role).toBe('client');
    expect(d.commissions.map((c: { title: string; projectedDate: string | null; late: boolean; dueDate: string | null }) => [c.title, c.dueDate, c.projectedDate, c.late]).sort()).toEqual(
      [
        ['A', '2026-03-04', '2026-03-04', false],
        ['B', '2026-03-03', '2026-03-04', true],
        ['Enquiry', null, null, false],
        ['Late', '2026-03-01', '2026-03-04', true],
      ].sort(),
    );
    expect(JSON.stringify(d)).not.toContain('Theirs');
    expect(JSON.stringify(d)).not.toContain('invoices');
  });
});
